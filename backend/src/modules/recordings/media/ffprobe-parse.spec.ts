import { describe, expect, it } from 'vitest';
import { MediaProbeError, normaliseRotation, parsePacketTimes, parseProbe, parseRate } from './ffprobe-parse';

/** Packet CSV for n frames at a constant rate, in the decode order B-frames give (I P B B …). */
function cfrPacketCsv(n: number, fps: number, gop: number): string {
  const lines: string[] = [];
  for (let k = 0; k < n; k++) {
    const flags = k % gop === 0 ? 'K_' : '__';
    lines.push(`${(k / fps).toFixed(6)},${flags}`);
  }
  // Swap neighbours to mimic decode order; parsePacketTimes must sort by pts.
  for (let k = 1; k + 1 < lines.length; k += 3) [lines[k], lines[k + 1]] = [lines[k + 1], lines[k]];
  return lines.join('\n') + '\n';
}

function streamJson(overrides: Record<string, unknown> = {}, format: Record<string, unknown> = {}): string {
  return JSON.stringify({
    streams: [
      { index: 0, codec_type: 'audio', codec_name: 'aac' },
      {
        index: 1,
        codec_type: 'video',
        codec_name: 'h264',
        width: 1920,
        height: 1080,
        pix_fmt: 'yuv420p',
        r_frame_rate: '30/1',
        avg_frame_rate: '30/1',
        time_base: '1/90000',
        duration: '10.000000',
        nb_frames: '300',
        disposition: { attached_pic: 0 },
        ...overrides,
      },
    ],
    format: { format_name: 'mov,mp4,m4a,3gp,3g2,mj2', duration: '10.010000', ...format },
  });
}

describe('parseRate', () => {
  it('reads ffprobe rate fractions', () => {
    expect(parseRate('30/1')).toBe(30);
    expect(parseRate('30000/1001')).toBeCloseTo(29.97003, 5);
    expect(parseRate('25')).toBe(25);
    expect(parseRate('0/0')).toBeNull();
    expect(parseRate('N/A')).toBeNull();
    expect(parseRate('30/0')).toBeNull();
    expect(parseRate(undefined)).toBeNull();
  });
});

describe('normaliseRotation', () => {
  it('maps any angle to the nearest quarter turn', () => {
    expect(normaliseRotation(0)).toBe(0);
    expect(normaliseRotation(-90)).toBe(270);
    expect(normaliseRotation(90)).toBe(90);
    expect(normaliseRotation(-180)).toBe(180);
    expect(normaliseRotation(450)).toBe(90);
    expect(normaliseRotation(-270.0001)).toBe(90);
    expect(normaliseRotation(Number.NaN)).toBe(0);
  });
});

describe('parsePacketTimes', () => {
  it('sorts decode-order packets by pts and collects keyframes', () => {
    const p = parsePacketTimes(cfrPacketCsv(90, 30, 30));
    expect(p.times).toHaveLength(90);
    expect(p.times[2]).toBe(0.066667);
    for (let i = 1; i < p.times.length; i++) expect(p.times[i]).toBeGreaterThan(p.times[i - 1]);
    expect(p.keyframeTimes).toEqual([0, 1, 2]);
    expect(p.ignoredPackets).toBe(0);
  });

  it('skips N/A, edit-list-discarded and repeated packets and blank lines', () => {
    const p = parsePacketTimes('N/A,__\n-0.066667,_D\n0.000000,K_\n\n0.033333,__\r\n0.033333,__\n0.066667,K_C\n');
    expect(p.times).toEqual([0, 0.033333, 0.066667]);
    expect(p.keyframeTimes).toEqual([0, 0.066667]);
    expect(p.ignoredPackets).toBe(3);
  });

  it('refuses lines that are not pts_time,flags', () => {
    expect(() => parsePacketTimes('0.000000,K_\nframe=12\n')).toThrow(MediaProbeError);
    expect(() => parsePacketTimes('0.000000,K_\nframe=12\n')).toThrow(/line 2 is not "pts_time,flags"/);
    expect(() => parsePacketTimes('1e3,K_')).toThrow(/line 1/);
  });
});

describe('parseProbe', () => {
  const packets = parsePacketTimes(cfrPacketCsv(300, 30, 300));

  it('reads a constant-rate camera file', () => {
    const probe = parseProbe(streamJson({}, { tags: { creation_time: '2025-03-14T09:30:00.000000Z' } }), packets);
    expect(probe).toEqual({
      durationSec: 10,
      width: 1920,
      height: 1080,
      displayWidth: 1920,
      displayHeight: 1080,
      rotation: 0,
      codec: 'h264',
      pixelFormat: 'yuv420p',
      nominalFps: 30,
      averageFps: 30,
      variableFrameRate: false,
      frameCount: 300,
      keyframeCount: 1,
      maxKeyframeInterval: 10,
      creationTime: '2025-03-14T09:30:00.000Z',
      container: 'mov,mp4,m4a,3gp,3g2,mj2',
    });
  });

  it('takes rotation from the display matrix (counter-clockwise in ffprobe) and swaps the displayed size', () => {
    const portrait = parseProbe(streamJson({ side_data_list: [{ side_data_type: 'Display Matrix', rotation: -90 }] }), packets);
    expect(portrait.rotation).toBe(90);
    expect([portrait.width, portrait.height, portrait.displayWidth, portrait.displayHeight]).toEqual([1920, 1080, 1080, 1920]);
    const other = parseProbe(streamJson({ side_data_list: [{ rotation: 90 }] }), packets);
    expect(other.rotation).toBe(270);
    expect(parseProbe(streamJson({ side_data_list: [{ rotation: '-180' }] }), packets).rotation).toBe(180);
  });

  it('falls back on the clockwise rotate tag of older files', () => {
    const p = parseProbe(streamJson({ tags: { rotate: '90' } }), packets);
    expect(p.rotation).toBe(90);
    expect(p.displayWidth).toBe(1080);
  });

  it('uses the container duration when the stream has none (WebM) and computes missing rates from the frames', () => {
    const webm = JSON.stringify({
      streams: [{ codec_type: 'video', codec_name: 'vp9', width: 1280, height: 720, pix_fmt: 'yuv420p', r_frame_rate: '0/0', avg_frame_rate: '0/0' }],
      format: { format_name: 'matroska,webm', duration: '2.000000' },
    });
    const msPackets = parsePacketTimes(Array.from({ length: 60 }, (_, k) => `${(Math.round((k * 1000) / 30) / 1000).toFixed(3)},${k === 0 ? 'K_' : '__'}`).join('\n'));
    const probe = parseProbe(webm, msPackets);
    expect(probe.durationSec).toBe(2);
    expect(probe.averageFps).toBeCloseTo(59 / 1.967, 6);
    expect(probe.nominalFps).toBe(probe.averageFps);
    expect(probe.variableFrameRate).toBe(false);
    expect(probe.container).toBe('matroska,webm');
    expect(probe.maxKeyframeInterval).toBeCloseTo(2, 3);
  });

  it('detects variable frame rate from the packet times, not from the rate fields', () => {
    const lines: string[] = [];
    for (let k = 0; k < 30; k++) lines.push(`${(k / 30).toFixed(6)},${k === 0 ? 'K_' : '__'}`);
    for (let k = 0; k < 15; k++) lines.push(`${(1 + k / 15).toFixed(6)},__`);
    const vfr = parsePacketTimes(lines.join('\n'));
    const probe = parseProbe(streamJson({ avg_frame_rate: '45/2', duration: '2.000000' }), vfr);
    expect(probe.nominalFps).toBe(30);
    expect(probe.averageFps).toBe(22.5);
    expect(probe.variableFrameRate).toBe(true);
    expect(probe.frameCount).toBe(45);
  });

  it('reports the longest keyframe interval including the tail', () => {
    const p = parseProbe(streamJson(), parsePacketTimes(cfrPacketCsv(300, 30, 30)));
    expect(p.keyframeCount).toBe(10);
    expect(p.maxKeyframeInterval).toBe(1);
    const uneven = parsePacketTimes(['0.000000,K_', '0.500000,__', '1.000000,__', '1.500000,K_', '2.000000,__'].join('\n'));
    expect(parseProbe(streamJson({ duration: '2.5' }), uneven).maxKeyframeInterval).toBe(1.5);
  });

  it('ignores placeholder creation dates and skips cover pictures', () => {
    const json = JSON.stringify({
      streams: [
        { codec_type: 'video', codec_name: 'mjpeg', width: 300, height: 300, disposition: { attached_pic: 1 } },
        { codec_type: 'video', codec_name: 'hevc', width: 3840, height: 2160, pix_fmt: 'yuv420p10le', r_frame_rate: '30/1', avg_frame_rate: '30/1', tags: { creation_time: '1904-01-01T00:00:00.000000Z' } },
      ],
      format: { format_name: 'mov,mp4,m4a,3gp,3g2,mj2', duration: '10', tags: { creation_time: '1970-01-01T00:00:00Z' } },
    });
    const p = parseProbe(json, packets);
    expect(p.codec).toBe('hevc');
    expect(p.pixelFormat).toBe('yuv420p10le');
    expect(p.creationTime).toBeNull();
  });

  it('gives clear errors for unusable input', () => {
    expect(() => parseProbe('{not json', packets)).toThrow('ffprobe output is not valid JSON');
    expect(() => parseProbe('[]', packets)).toThrow(/not a JSON object/);
    expect(() => parseProbe(JSON.stringify({ streams: [{ codec_type: 'audio' }], format: {} }), packets)).toThrow(
      'no video stream: the file holds only audio',
    );
    expect(() =>
      parseProbe(JSON.stringify({ streams: [{ codec_type: 'video', width: 1, height: 1, disposition: { attached_pic: 1 } }] }), packets),
    ).toThrow('no video stream: the file holds only cover picture');
    expect(() => parseProbe(JSON.stringify({ streams: [] }), packets)).toThrow('no video stream: the file holds no media streams');
    expect(() => parseProbe(streamJson({ width: 0 }), packets)).toThrow('the video stream has no frame size');
    expect(() => parseProbe(streamJson(), { times: [], keyframeTimes: [], ignoredPackets: 0 })).toThrow('the video stream has no frames');
    expect(() =>
      parseProbe(streamJson({ duration: 'N/A' }, { duration: 'N/A' }), { times: [0], keyframeTimes: [0], ignoredPackets: 0 }),
    ).toThrow('the video has no duration');
  });
});
