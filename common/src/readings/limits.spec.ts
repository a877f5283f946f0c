import { describe, expect, it } from 'vitest';
import { checkLimits } from './limits';

const channel = { plausibleMin: 0, plausibleMax: 100, operatingMin: -10, operatingMax: 120 };
const codes = (value: number, limits: Parameters<typeof checkLimits>[1] = channel) =>
  checkLimits(value, limits).map((w) => w.code);

describe('checkLimits', () => {
  it('has nothing to say inside all limits, limits included', () => {
    expect(checkLimits(50, channel)).toEqual([]);
    expect(checkLimits(0, channel)).toEqual([]);
    expect(checkLimits(100, channel)).toEqual([]);
  });

  it('flags values outside the plausible range', () => {
    expect(codes(-0.5)).toEqual(['below-plausible']);
    expect(codes(100.01)).toEqual(['above-plausible']);
  });

  it('flags values outside the operating limits as well as the plausible range', () => {
    expect(codes(-10.5)).toEqual(['below-plausible', 'outside-operating']);
    expect(codes(121)).toEqual(['above-plausible', 'outside-operating']);
    expect(codes(120)).toEqual(['above-plausible']);
  });

  it('writes messages naming the value and the limit', () => {
    expect(checkLimits(-3, channel)[0].message).toBe('-3 is below the plausible minimum of 0; check the frame');
    expect(checkLimits(130, channel)[1].message).toBe(
      "130 is outside the instrument's operating limits (-10 to 120); the reading may not be valid",
    );
    expect(checkLimits(-1, { operatingMin: 0 })[0].message).toContain('(at least 0)');
    expect(checkLimits(9, { operatingMax: 5 })[0].message).toContain('(at most 5)');
  });

  it('skips limits that are absent or null', () => {
    expect(checkLimits(1e9, {})).toEqual([]);
    expect(codes(-1e9, { plausibleMin: null, plausibleMax: 10, operatingMin: undefined })).toEqual([]);
    expect(codes(11, { plausibleMin: null, plausibleMax: 10 })).toEqual(['above-plausible']);
  });

  it('refuses a value that is not a finite number', () => {
    expect(() => checkLimits(Number.NaN, channel)).toThrow(RangeError);
    expect(() => checkLimits(Number.POSITIVE_INFINITY, channel)).toThrow('finite');
  });
});
