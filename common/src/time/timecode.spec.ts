import { describe, expect, it } from 'vitest';
import { formatTestTime, parseTimecode } from './timecode';

describe('formatTestTime', () => {
  it('formats minutes, seconds and milliseconds', () => {
    expect(formatTestTime(0)).toBe('00:00.000');
    expect(formatTestTime(5.25)).toBe('00:05.250');
    expect(formatTestTime(65.5)).toBe('01:05.500');
    expect(formatTestTime(3599.999)).toBe('59:59.999');
  });

  it('switches to h:mm:ss.SSS from one hour on', () => {
    expect(formatTestTime(3600)).toBe('1:00:00.000');
    expect(formatTestTime(3723.004)).toBe('1:02:03.004');
    expect(formatTestTime(36000)).toBe('10:00:00.000');
  });

  it('rounds to the millisecond and carries into seconds, minutes and hours', () => {
    expect(formatTestTime(59.9996)).toBe('01:00.000');
    expect(formatTestTime(3599.9996)).toBe('1:00:00.000');
    expect(formatTestTime(1 / 3)).toBe('00:00.333');
    expect(formatTestTime(2 / 30)).toBe('00:00.067');
  });

  it('puts a minus sign on negative times but not on a rounded zero', () => {
    expect(formatTestTime(-2)).toBe('-00:02.000');
    expect(formatTestTime(-3661.5)).toBe('-1:01:01.500');
    expect(formatTestTime(-0.0004)).toBe('00:00.000');
    expect(formatTestTime(-0)).toBe('00:00.000');
  });

  it('refuses non-finite input', () => {
    expect(() => formatTestTime(Number.NaN)).toThrow(RangeError);
    expect(() => formatTestTime(Number.POSITIVE_INFINITY)).toThrow(/finite number/);
  });
});

describe('parseTimecode', () => {
  it('accepts seconds, mm:ss and h:mm:ss with optional fractions', () => {
    expect(parseTimecode('12')).toBe(12);
    expect(parseTimecode('12.5')).toBe(12.5);
    expect(parseTimecode('125.25')).toBe(125.25);
    expect(parseTimecode('01:30')).toBe(90);
    expect(parseTimecode('1:30.250')).toBe(90.25);
    expect(parseTimecode('75:00')).toBe(4500);
    expect(parseTimecode('1:02:03')).toBe(3723);
    expect(parseTimecode('1:02:03.5')).toBe(3723.5);
    expect(parseTimecode('0.000001')).toBe(0.000001);
    expect(parseTimecode('  00:05.250 ')).toBe(5.25);
  });

  it('is exact to the microsecond', () => {
    expect(parseTimecode('1:00:00.1')).toBe(3600.1);
    expect(parseTimecode('00:00.3')).toBe(0.3);
    expect(parseTimecode('10:00:00.000001')).toBe(36000.000001);
  });

  it('accepts a leading minus and round-trips formatTestTime', () => {
    expect(parseTimecode('-00:02.000')).toBe(-2);
    expect(Object.is(parseTimecode('-0'), 0)).toBe(true);
    for (const t of [0, 0.001, 5.25, 59.999, 61, 3599.999, 3600, 3723.004, -2, -3661.5, 86399.5]) {
      expect(parseTimecode(formatTestTime(t))).toBe(t);
    }
  });

  it('rejects malformed text with a clear message', () => {
    expect(() => parseTimecode('')).toThrow(/time is empty/);
    expect(() => parseTimecode('12,5')).toThrow(/use "\." for fractions/);
    expect(() => parseTimecode('1:5')).toThrow(/expected seconds/);
    expect(() => parseTimecode('1:60')).toThrow(/seconds must be below 60/);
    expect(() => parseTimecode('1:60:00')).toThrow(/minutes must be below 60/);
    expect(() => parseTimecode('1:02:03:04')).toThrow(/not a time/);
    expect(() => parseTimecode('12.')).toThrow(/not a time/);
    expect(() => parseTimecode('.5')).toThrow(/not a time/);
    expect(() => parseTimecode('1.2345678')).toThrow(/at most six decimals/);
    expect(() => parseTimecode('1e3')).toThrow(/not a time/);
    expect(() => parseTimecode('+5')).toThrow(/not a time/);
    expect(() => parseTimecode('--5')).toThrow(/not a time/);
    expect(() => parseTimecode('abc')).toThrow(RangeError);
    expect(() => parseTimecode(5 as unknown as string)).toThrow(/must be text/);
  });
});
