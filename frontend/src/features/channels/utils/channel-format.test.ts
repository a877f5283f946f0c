import { describe, expect, it } from 'vitest';
import { formatAccuracy, formatBounds } from './channel-format';

describe('formatAccuracy', () => {
  it('writes each part of the spec in data-sheet terms', () => {
    expect(formatAccuracy({ percentOfFullScale: 0.5, percentOfReading: 0.2, digits: 2 })).toEqual(['±0.5 % FS', '±0.2 % rdg + 2 digits']);
    expect(formatAccuracy({ percentOfReading: 1 })).toEqual(['±1 % rdg']);
    expect(formatAccuracy({ digits: 1 })).toEqual(['±1 digit']);
    expect(formatAccuracy(null)).toEqual([]);
  });
});

describe('formatBounds', () => {
  it('shows a pair, one bound or nothing', () => {
    expect(formatBounds(-50, 200)).toBe('−50 … 200');
    expect(formatBounds(5, null)).toBe('≥ 5');
    expect(formatBounds(null, 90)).toBe('≤ 90');
    expect(formatBounds(null, null)).toBeNull();
  });
});
