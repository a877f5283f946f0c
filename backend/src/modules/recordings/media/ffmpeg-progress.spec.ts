import { describe, expect, it } from 'vitest';
import { FfmpegProgressParser, blockOutTime, parseProgressText, progressPercent } from './ffmpeg-progress';

// Shape of ffmpeg 5.1 `-progress pipe:1` output (captured from a real run, values shortened).
const START = [
  'frame=0',
  'fps=0.00',
  'stream_0_0_q=0.0',
  'bitrate=N/A',
  'total_size=N/A',
  'out_time_us=N/A',
  'out_time_ms=-9223372036854775807',
  'out_time=-577014:32:22.775807',
  'dup_frames=0',
  'drop_frames=0',
  'speed=N/A',
  'progress=continue',
].join('\n');
const MIDDLE = [
  'frame=150',
  'fps=75.00',
  'bitrate= 148.1kbits/s',
  'total_size=35178',
  'out_time_us=5000000',
  'out_time_ms=5000000',
  'out_time=00:00:05.000000',
  'speed=2.5x',
  'progress=continue',
].join('\n');
const END = ['frame=300', 'out_time_us=9966667', 'out_time_ms=9966667', 'out_time=00:00:09.966667', 'speed=2.6x', 'progress=end'].join('\n');

describe('FfmpegProgressParser', () => {
  it('turns blocks into percent of the known duration and finishes at 100', () => {
    const updates = parseProgressText(`${START}\n${MIDDLE}\n${END}\n`, 10);
    expect(updates).toHaveLength(3);
    expect(updates[0]).toEqual({ percent: 0, outTimeSec: null, frame: 0, speed: null, done: false });
    expect(updates[1]).toEqual({ percent: 50, outTimeSec: 5, frame: 150, speed: 2.5, done: false });
    expect(updates[2]).toMatchObject({ percent: 100, outTimeSec: 9.966667, frame: 300, done: true });
  });

  it('handles chunks that split lines anywhere', () => {
    const text = `${MIDDLE}\n${END}\n`;
    const parser = new FfmpegProgressParser(10);
    const updates = [];
    for (let i = 0; i < text.length; i += 7) updates.push(...parser.push(Buffer.from(text.slice(i, i + 7))));
    expect(updates.map((u) => u.percent)).toEqual([50, 100]);
  });

  it('clamps to 0–100 and never goes backwards', () => {
    const parser = new FfmpegProgressParser(4);
    expect(parser.push('out_time_us=6000000\nprogress=continue\n')[0].percent).toBe(100);
    const p2 = new FfmpegProgressParser(10);
    expect(p2.push('out_time_us=3000000\nprogress=continue\n')[0].percent).toBe(30);
    expect(p2.push('out_time_us=2000000\nprogress=continue\n')[0].percent).toBe(30);
    expect(progressPercent(-1, 10)).toBe(0);
    expect(progressPercent(1 / 3, 1)).toBe(33.3);
  });

  it('reads out_time_ms as microseconds and out_time as the last resort', () => {
    expect(blockOutTime(new Map([['out_time_ms', '1500000']]))).toBe(1.5);
    expect(blockOutTime(new Map([['out_time_us', 'N/A'], ['out_time', '01:02:03.500000']]))).toBe(3723.5);
    expect(blockOutTime(new Map([['out_time', '-577014:32:22.775807']]))).toBeNull();
    expect(blockOutTime(new Map())).toBeNull();
  });

  it('needs a positive duration', () => {
    expect(() => new FfmpegProgressParser(0)).toThrow(/duration/);
    expect(() => new FfmpegProgressParser(Number.NaN)).toThrow(RangeError);
  });
});
