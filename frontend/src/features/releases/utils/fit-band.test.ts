import { describe, expect, it } from 'vitest';
import type { TrendFit } from '@dialsheet/common';
import { fitBand } from './fit-band';

// A hand-worked line: points (0, 1), (1, 3), (2, 2), (3, 4). t̄ = 1.5, ȳ = 2.5, Sxx = 5,
// Sxy = 4 → slope 0.8; residuals −0.3, 0.9, −0.9, 0.3 → SSE = 1.8, s = √(1.8/2) = 0.948683;
// t(0.025, 2) = 4.302653 (Student-t table). Formula: Montgomery & Runger §11-5.2.
const fit = {
  n: 4,
  tMean: 1.5,
  yMean: 2.5,
  sxx: 5,
  slope: 0.8,
  residualSd: Math.sqrt(0.9),
  tQuantile: 4.302653,
} as TrendFit;

describe('fitBand (confidence interval of the mean response)', () => {
  it('gives ŷ and the half-width at the centre, t = t̄', () => {
    const band = fitBand(fit, 1.5);
    expect(band.y).toBeCloseTo(2.5, 12);
    // 4.302653 × 0.948683 × √(1/4) = 2.040928
    expect(band.high - band.y).toBeCloseTo(2.040928, 5);
    expect(band.y - band.low).toBeCloseTo(2.040928, 5);
  });

  it('widens away from the centre', () => {
    const band = fitBand(fit, 3);
    expect(band.y).toBeCloseTo(3.7, 12);
    // 4.302653 × 0.948683 × √(1/4 + 2.25/5) = 3.415125
    expect(band.high - band.y).toBeCloseTo(3.415125, 5);
  });

  it('draws a bare line when no interval is defined (n < 3)', () => {
    const band = fitBand({ ...fit, n: 2 }, 0);
    expect(band.low).toBe(band.y);
    expect(band.high).toBe(band.y);
  });
});
