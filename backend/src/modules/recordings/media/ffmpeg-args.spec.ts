import path from 'node:path';
import { describe, expect, it } from 'vitest';
import {
  keyframeInterval,
  packetTimesArgs,
  posterArgs,
  probeArgs,
  proxyArgs,
  scaledSize,
  shortSideScaleFilter,
} from './ffmpeg-args';

const work = path.resolve('/srv/dialsheet-scratch/job-1');
const input = path.resolve('/srv/dialsheet-media/original.mp4');
const output = path.join(work, 'proxy.mp4');

/** The value following an option in an argument list. */
function optionValue(args: string[], option: string): string | undefined {
  const i = args.indexOf(option);
  return i >= 0 ? args[i + 1] : undefined;
}

describe('proxyArgs', () => {
  const args = proxyArgs(input, output, { averageFps: 29.97 }, { workDir: work });

  it('encodes H.264 veryfast crf 21 yuv420p with one keyframe per second at the source rate', () => {
    expect(optionValue(args, '-c:v')).toBe('libx264');
    expect(optionValue(args, '-preset')).toBe('veryfast');
    expect(optionValue(args, '-crf')).toBe('21');
    expect(optionValue(args, '-pix_fmt')).toBe('yuv420p');
    expect(optionValue(args, '-g')).toBe('30');
    expect(optionValue(args, '-keyint_min')).toBe('30');
    expect(optionValue(args, '-sc_threshold')).toBe('0');
    expect(optionValue(args, '-force_key_frames')).toBe('expr:gte(t,n_forced)');
    expect(optionValue(proxyArgs(input, output, { averageFps: 59.94 }, { workDir: work }), '-g')).toBe('60');
    expect(optionValue(proxyArgs(input, output, { averageFps: 25 }, { workDir: work }), '-g')).toBe('25');
  });

  it('keeps each source frame and its timestamp, fast-start, no audio, progress on stdout', () => {
    expect(optionValue(args, '-fps_mode')).toBe('passthrough');
    expect(optionValue(args, '-enc_time_base')).toBe('-1');
    expect(optionValue(args, '-movflags')).toBe('+faststart');
    expect(args).toContain('-an');
    expect(optionValue(args, '-progress')).toBe('pipe:1');
    expect(args).toContain('-nostats');
    expect(optionValue(args, '-map')).toBe('0:V:0');
  });

  it('lets ffmpeg auto-rotate and scales the displayed short side down to 720', () => {
    expect(args).not.toContain('-noautorotate');
    expect(args).not.toContain('-autorotate');
    expect(optionValue(args, '-vf')).toBe(shortSideScaleFilter(720));
    const fullHd = proxyArgs(input, output, null, { workDir: work, keepFullHd: true });
    expect(optionValue(fullHd, '-vf')).toBe(shortSideScaleFilter(1080));
  });

  it('falls back to 30 frames per keyframe when the rate is unknown', () => {
    expect(optionValue(proxyArgs(input, output, null, { workDir: work }), '-g')).toBe('30');
    expect(keyframeInterval(0)).toBe(30);
    expect(keyframeInterval(Number.NaN)).toBe(30);
    expect(keyframeInterval(0.4)).toBe(1);
    expect(keyframeInterval(240)).toBe(240);
  });

  it('writes with -y only as the very last option, onto a path inside the work directory', () => {
    expect(args.slice(-2)).toEqual(['-y', output]);
    expect(args.filter((a) => a === '-y')).toHaveLength(1);
    expect(args.indexOf('-i')).toBeLessThan(args.indexOf('-y'));
    expect(optionValue(args, '-i')).toBe(input);
  });

  it('refuses an output outside the work directory and relative or option-like paths', () => {
    expect(() => proxyArgs(input, path.resolve('/srv/other/proxy.mp4'), null, { workDir: work })).toThrow(/inside the server-chosen work directory/);
    expect(() => proxyArgs(input, path.join(work, '..', 'escape.mp4'), null, { workDir: work })).toThrow(/work directory/);
    expect(() => proxyArgs(input, work, null, { workDir: work })).toThrow(/work directory/);
    expect(() => proxyArgs('-i.mp4', output, null, { workDir: work })).toThrow(/input must be an absolute file path/);
    expect(() => proxyArgs('concat:a.mp4|b.mp4', output, null, { workDir: work })).toThrow(/absolute/);
    expect(() => proxyArgs(input, output, null, { workDir: 'relative' })).toThrow(/workDir must be an absolute/);
  });
});

describe('scaledSize (what the scale expression yields)', () => {
  it('reduces a landscape 1080p source to 1280×720 and keeps smaller sources', () => {
    expect(scaledSize(1920, 1080, 720)).toEqual({ width: 1280, height: 720 });
    expect(scaledSize(1280, 720, 720)).toEqual({ width: 1280, height: 720 });
    expect(scaledSize(640, 480, 720)).toEqual({ width: 640, height: 480 });
    expect(scaledSize(3840, 2160, 1080)).toEqual({ width: 1920, height: 1080 });
    expect(scaledSize(1920, 1080, 1080)).toEqual({ width: 1920, height: 1080 });
  });

  it('scales portrait footage by its short side, the width', () => {
    expect(scaledSize(1080, 1920, 720)).toEqual({ width: 720, height: 1280 });
    expect(scaledSize(720, 1280, 720)).toEqual({ width: 720, height: 1280 });
  });

  it('keeps both sides even', () => {
    expect(scaledSize(1440, 1080, 720)).toEqual({ width: 960, height: 720 });
    // 2560×1080 ultra-wide: 720 · 2560/1080 = 1706.67 → 1706 (nearest even).
    expect(scaledSize(2560, 1080, 720)).toEqual({ width: 1706, height: 720 });
    expect(scaledSize(641, 481, 720)).toEqual({ width: 640, height: 480 });
    expect(scaledSize(481, 641, 720)).toEqual({ width: 480, height: 640 });
  });
});

describe('posterArgs', () => {
  it('takes one JPEG frame at the given time with the short side at 360', () => {
    const args = posterArgs(input, path.join(work, 'poster.jpg'), 12.3456789, { workDir: work });
    expect(optionValue(args, '-ss')).toBe('12.345679');
    expect(args.indexOf('-ss')).toBeLessThan(args.indexOf('-i'));
    expect(optionValue(args, '-frames:v')).toBe('1');
    expect(optionValue(args, '-vf')).toBe(shortSideScaleFilter(360));
    expect(optionValue(args, '-c:v')).toBe('mjpeg');
    expect(args.slice(-2)).toEqual(['-y', path.join(work, 'poster.jpg')]);
  });

  it('refuses negative or non-finite times and outside paths', () => {
    expect(() => posterArgs(input, path.join(work, 'p.jpg'), -1, { workDir: work })).toThrow(/≥ 0/);
    expect(() => posterArgs(input, path.join(work, 'p.jpg'), Number.NaN, { workDir: work })).toThrow(/finite number/);
    expect(() => posterArgs(input, path.resolve('/srv/p.jpg'), 1, { workDir: work })).toThrow(/work directory/);
  });
});

describe('probeArgs and packetTimesArgs', () => {
  it('asks ffprobe for JSON with rotation side data, tags and container fields', () => {
    const args = probeArgs(input);
    expect(optionValue(args, '-print_format')).toBe('json');
    const entries = optionValue(args, '-show_entries') ?? '';
    for (const field of ['stream=', 'r_frame_rate', 'avg_frame_rate', 'pix_fmt', 'stream_side_data=rotation', 'stream_tags=rotate,creation_time', 'format=format_name,duration', 'format_tags=creation_time', 'attached_pic']) {
      expect(entries).toContain(field);
    }
    expect(args.at(-1)).toBe(input);
  });

  it('lists packet times and flags as CSV of the first real video stream, without decoding', () => {
    const args = packetTimesArgs(input);
    expect(args).toEqual(['-v', 'error', '-select_streams', 'V:0', '-show_entries', 'packet=pts_time,flags', '-of', 'csv=p=0', input]);
    expect(args).not.toContain('-show_frames');
    expect(() => packetTimesArgs('clip.mp4')).toThrow(/absolute/);
  });
});
