import { describe, expect, it } from 'vitest';
import { formatBytes, formatDuration, formatFps, formatRate } from './format';

describe('formatBytes', () => {
  it('uses decimal units with three significant figures', () => {
    expect(formatBytes(999)).toBe('999 bytes');
    expect(formatBytes(18_651_969)).toBe('18.7 MB');
    expect(formatBytes(399_000)).toBe('399 kB');
    expect(formatBytes(8 * 1024 ** 3)).toBe('8.59 GB');
    expect(formatBytes(-1)).toBe('–');
  });
});

describe('formatRate', () => {
  it('gives MB/s with one decimal, two below 1 MB/s', () => {
    expect(formatRate(10_000_000)).toBe('10.0 MB/s');
    expect(formatRate(450_000)).toBe('0.45 MB/s');
  });
});

describe('formatDuration', () => {
  it('rounds up, and reads in seconds, minutes or hours', () => {
    expect(formatDuration(1.2)).toBe('2 s');
    expect(formatDuration(59)).toBe('59 s');
    expect(formatDuration(185)).toBe('3 min 05 s');
    expect(formatDuration(3725)).toBe('1 h 02 min');
    expect(formatDuration(Number.POSITIVE_INFINITY)).toBe('–');
  });
});

describe('formatFps', () => {
  it('keeps the rates cameras use readable', () => {
    expect(formatFps(30)).toBe('30 fps');
    expect(formatFps(30000 / 1001)).toBe('29.97 fps');
    expect(formatFps(24000 / 1001)).toBe('23.976 fps');
  });
});
