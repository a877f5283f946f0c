import { describe, expect, it } from 'vitest';
import { StorageNotFoundError } from '../../../storage/storage-driver';
import { DAMAGED, describeProcessingFailure, MISSING_ORIGINAL, NO_VIDEO, UNEXPECTED } from './failure-reasons';
import { MediaProbeError } from './ffprobe-parse';
import { ToolError } from './ffmpeg-runner';

const exit = (tool: 'ffmpeg' | 'ffprobe', stderr: string) => new ToolError(tool, 'exit', 1, stderr, `${tool} exited with code 1`);

describe('describeProcessingFailure', () => {
  it.each([
    ['ffprobe on a cut-off MP4', exit('ffprobe', '[mov,mp4,m4a,3gp,3g2,mj2 @ 0x55] moov atom not found\n/srv/x: Invalid data found when processing input'), DAMAGED],
    ['ffprobe on garbage', exit('ffprobe', '/srv/x: Invalid data found when processing input'), DAMAGED],
    ['ffprobe failing without a known message', exit('ffprobe', 'something odd'), DAMAGED],
    ['ffmpeg hitting a broken stream', exit('ffmpeg', '[h264 @ 0x1] error while decoding MB 3 4, bytestream -7'), DAMAGED],
    ['ffmpeg on a partial file', exit('ffmpeg', '[mov,mp4 @ 0x1] stream 0, offset 0x30: partial file'), DAMAGED],
  ])('%s → damaged or incomplete, not retried', (_label, error, reason) => {
    expect(describeProcessingFailure(error)).toEqual({ reason, permanent: true });
  });

  it('names a codec ffmpeg cannot decode', () => {
    expect(describeProcessingFailure(exit('ffmpeg', 'Decoder (codec prores_raw) not found for input stream #0:0'))).toEqual({
      reason: "This video's codec (prores_raw) cannot be decoded on the server.",
      permanent: true,
    });
  });

  it('explains probe results without a usable video', () => {
    expect(describeProcessingFailure(new MediaProbeError('no video stream: the file holds only audio'))).toEqual({
      reason: `${NO_VIDEO} It holds only audio.`,
      permanent: true,
    });
    expect(describeProcessingFailure(new MediaProbeError('no video stream: the file holds no media streams'))).toEqual({
      reason: NO_VIDEO,
      permanent: true,
    });
    expect(describeProcessingFailure(new MediaProbeError('the video stream has no frames')).reason).toBe(
      'The video could not be read: it contains no frames.',
    );
    expect(describeProcessingFailure(new MediaProbeError('the video has no duration'))).toEqual({ reason: DAMAGED, permanent: true });
  });

  it('treats server-side trouble as worth another attempt, in words without internals', () => {
    const disk = describeProcessingFailure(exit('ffmpeg', 'av_interleaved_write_frame(): No space left on device'));
    expect(disk).toEqual({ reason: expect.stringMatching(/ran out of disk space/), permanent: false });
    const spawn = describeProcessingFailure(new ToolError('ffmpeg', 'spawn', null, '', 'ffmpeg could not be started (/opt/x/ffmpeg): ENOENT'));
    expect(spawn).toEqual({ reason: 'The server cannot run ffmpeg. Tell your administrator.', permanent: false });
    expect(spawn.reason).not.toMatch(/\/opt|ENOENT/);
    expect(describeProcessingFailure(exit('ffmpeg', 'Killed'))).toEqual({ reason: UNEXPECTED, permanent: false });
    expect(describeProcessingFailure(new Error('connect ECONNREFUSED 10.0.0.1:5432'))).toEqual({ reason: UNEXPECTED, permanent: false });
  });

  it('reports a missing original plainly', () => {
    expect(describeProcessingFailure(new StorageNotFoundError('recordings/x/original'))).toEqual({ reason: MISSING_ORIGINAL, permanent: true });
  });
});
