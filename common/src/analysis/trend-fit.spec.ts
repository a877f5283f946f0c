import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import norris from '../reference-data/nist-strd-norris.json';
import { AnalysisError } from './errors';
import { fitTrend, fitWindow, predictAt, selectWindow } from './trend-fit';

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

// NIST StRD, Linear Regression, Norris (https://www.itl.nist.gov/div898/strd/lls/data/Norris.shtml):
// 36 pairs and certified values; the brief asks for ≤ 1e-9 relative error on each.
describe('NIST StRD Norris certified values', () => {
  const fit = fitTrend(norris.x, norris.y);
  const c = norris.certified;

  it.each([
    ['b0 (intercept)', () => fit.intercept, c.b0],
    ['b1 (slope)', () => fit.slope, c.b1],
    ['sd(b0)', () => fit.interceptSe, c.b0_sd],
    ['sd(b1)', () => fit.slopeSe, c.b1_sd],
    ['residual sd', () => fit.residualSd, c.residual_sd],
    ['R²', () => fit.rSquared!, c.r_squared],
  ])('%s to 1e-9 relative', (_name, got, certified) => {
    expect(rel(got(), certified)).toBeLessThanOrEqual(1e-9);
  });

  it('reproduces the certified residual sum of squares and degrees of freedom', () => {
    const sse = fit.residuals.reduce((s, e) => s + e * e, 0);
    expect(rel(sse, norris.certified_anova.ss_residual)).toBeLessThan(1e-9);
    expect(fit.dof).toBe(norris.certified_anova.df_residual);
    expect(fit.n).toBe(36);
  });

  it('keeps its digits when the x values are shifted by 1e6 (centred sums)', () => {
    const shifted = fitTrend(
      norris.x.map((x) => x + 1e6),
      norris.y,
    );
    expect(rel(shifted.slope, c.b1)).toBeLessThan(1e-9);
    expect(rel(shifted.residualSd, c.residual_sd)).toBeLessThan(1e-8);
  });
});

// Montgomery & Runger, Applied Statistics and Probability for Engineers, Example 11-1 (oxygen
// purity y, % against hydrocarbon level x, %; n = 20), with Examples 11-4 (CI on the slope),
// 11-6 (CI on the mean response at x0 = 1.00 %) and 11-7 (prediction interval at x0 = 1.00 %).
// Data and the printed results are from memory (3rd–6th editions): ŷ = 74.283 + 14.947x,
// σ̂² = 1.18, 12.181 ≤ β1 ≤ 17.713, 88.48 ≤ μ ≤ 89.98, 86.83 ≤ Y0 ≤ 91.63, all with t(0.025, 18)
// = 2.101. The book rounds its intermediate values, hence the tolerances of 0.01–0.02.
describe('Montgomery & Runger worked example (oxygen purity)', () => {
  const x = [0.99, 1.02, 1.15, 1.29, 1.46, 1.36, 0.87, 1.23, 1.55, 1.4, 1.19, 1.15, 0.98, 1.01, 1.11, 1.2, 1.26, 1.32, 1.43, 0.95];
  const y = [90.01, 89.05, 91.43, 93.74, 96.73, 94.45, 87.59, 91.77, 99.42, 93.65, 93.54, 92.52, 90.56, 89.54, 89.85, 90.39, 93.25, 93.41, 94.98, 87.33];
  const fit = fitTrend(x, y);

  it('gives the printed line, σ̂² and t quantile', () => {
    expect(fit.slope).toBeCloseTo(14.947, 3);
    expect(fit.intercept).toBeCloseTo(74.283, 3);
    expect(fit.residualSd ** 2).toBeCloseTo(1.18, 2);
    expect(fit.sxx).toBeCloseTo(0.68088, 5);
    expect(fit.tQuantile).toBeCloseTo(2.101, 3);
  });

  it('gives the printed confidence interval on the slope', () => {
    expect(fit.slopeInterval.low).toBeCloseTo(12.181, 1);
    expect(fit.slopeInterval.high).toBeCloseTo(17.713, 1);
    expect(Math.abs(fit.slopeInterval.low - 12.181)).toBeLessThan(0.02);
    expect(Math.abs(fit.slopeInterval.high - 17.713)).toBeLessThan(0.02);
  });

  it('gives the printed CI of the mean response and the prediction interval at x0 = 1.00', () => {
    const p = predictAt(fit, 1.0);
    expect(p.value).toBeCloseTo(89.23, 2);
    expect(Math.abs(p.meanInterval.low - 88.48)).toBeLessThan(0.015);
    expect(Math.abs(p.meanInterval.high - 89.98)).toBeLessThan(0.015);
    expect(Math.abs(p.predictionInterval.low - 86.83)).toBeLessThan(0.015);
    expect(Math.abs(p.predictionInterval.high - 91.63)).toBeLessThan(0.015);
    expect(p.extrapolated).toBe(false);
    expect(p.warnings).toEqual([]);
  });

  it('narrows to s·√(1/n) at the centre, and the prediction interval is always wider', () => {
    const p = predictAt(fit, fit.tMean);
    expect(p.meanSe).toBeCloseTo(fit.residualSd / Math.sqrt(20), 12);
    expect(p.predictionSe).toBeCloseTo(fit.residualSd * Math.sqrt(1 + 1 / 20), 12);
    expect(p.distanceFromCentre).toBe(0);
  });
});

describe('guards', () => {
  it('refuses fewer than 3 points, naming the count', () => {
    expect(() => fitTrend([1, 2], [3, 4])).toThrow(AnalysisError);
    expect(() => fitTrend([1, 2], [3, 4])).toThrow(/at least 3 points, the window holds 2/);
  });

  it('refuses points that all share one time (Sxx = 0)', () => {
    expect(() => fitTrend([5, 5, 5, 5], [1, 2, 3, 4])).toThrow(/all 4 points have the same time \(5 s\)/);
  });

  it('names the first point that is not a number', () => {
    expect(() => fitTrend([0, 1, 2, 3], [1, Number.NaN, 2, 3])).toThrow(/point 2: value must be a finite number, got NaN/);
    expect(() => fitTrend([0, 1, 2], [1, 2])).toThrow(/3 times, 2 values/);
  });

  it('refuses t* outside the fitted points unless extrapolation is confirmed, then warns', () => {
    const fit = fitTrend([0, 60, 120, 180], [20, 20.1, 20.1, 20.2]);
    expect(() => predictAt(fit, 200)).toThrow(/t\* = 200 s is outside the fitted points \(0–180 s\), 20 s after the last fitted point; choose t\* inside the window or confirm extrapolation/);
    const p = predictAt(fit, 200, { allowExtrapolation: true });
    expect(p.extrapolated).toBe(true);
    expect(p.warnings[0]).toMatch(/^extrapolated: t\* = 200 s is 20 s after the last fitted point/);
    expect(predictAt(fit, 180).extrapolated).toBe(false);
  });

  it('reports R² as null for a flat, constant series and gives zero-width intervals', () => {
    const fit = fitTrend([0, 3, 6, 9], [21.4, 21.4, 21.4, 21.4]);
    expect(fit.rSquared).toBeNull();
    expect(fit.slope).toBe(0);
    expect(fit.residualSd).toBe(0);
    expect(predictAt(fit, 4.5).meanInterval).toEqual({ low: 21.4, high: 21.4 });
  });

  it('gives slopes per minute', () => {
    const fit = fitTrend([0, 30, 60, 90], [10, 10.5, 11, 11.5]);
    expect(fit.slope).toBeCloseTo(1 / 60, 14);
    expect(fit.slopePerMinute).toBeCloseTo(1, 12);
    expect(fit.rSquared).toBeCloseTo(1, 14);
  });
});

describe('window selection', () => {
  const points = [
    { t: 0, y: 1 },
    { t: 3, y: 2, unchecked: true },
    { t: 6, y: 3 },
    { t: 9, y: 5 },
    { t: 12, y: 4 },
  ];

  it('takes the points with from ≤ t ≤ to, ends included, and counts unchecked ones', () => {
    const w = selectWindow(points, { from: 3, to: 9 });
    expect(Array.from(w.t)).toEqual([3, 6, 9]);
    expect(Array.from(w.y)).toEqual([2, 3, 5]);
    expect(w.uncheckedCount).toBe(1);
    expect(fitWindow(points, { from: 3, to: 9 }).uncheckedCount).toBe(1);
  });

  it('refuses a reversed window and a window with too few points', () => {
    expect(() => selectWindow(points, { from: 9, to: 3 })).toThrow(/ends \(3 s\) before it starts \(9 s\)/);
    expect(() => fitWindow(points, { from: 4, to: 8 })).toThrow(/window 4–8 s holds 1; widen the window/);
  });
});

// Properties (fast-check): a fit does not depend on where time starts, and scales with y.
describe('properties', () => {
  const series = fc
    .integer({ min: 3, max: 40 })
    .chain((n) =>
      fc.record({
        t: fc.uniqueArray(fc.double({ min: -1e4, max: 1e4, noNaN: true }), { minLength: n, maxLength: n }),
        y: fc.array(fc.double({ min: -1e3, max: 1e3, noNaN: true }), { minLength: n, maxLength: n }),
      }),
    )
    .filter(({ t }) => Math.max(...t) - Math.min(...t) > 1);

  it('shifting time changes only the intercept: slope, residuals and ŷ at the shifted t* stay', () => {
    fc.assert(
      fc.property(series, fc.double({ min: -1e5, max: 1e5, noNaN: true }), fc.double({ min: 0, max: 1, noNaN: true }), ({ t, y }, shift, at) => {
        const a = fitTrend(t, y);
        const b = fitTrend(
          t.map((v) => v + shift),
          y,
        );
        const scale = Math.max(1, ...y.map(Math.abs));
        expect(Math.abs(b.slope - a.slope) * (a.tMax - a.tMin)).toBeLessThan(1e-8 * scale);
        expect(Math.abs(b.residualSd - a.residualSd)).toBeLessThan(1e-8 * scale);
        a.residuals.forEach((e, i) => expect(Math.abs(b.residuals[i] - e)).toBeLessThan(1e-8 * scale));
        // Clamped: tMin + 1·(tMax − tMin) can round one ulp past tMax.
        const tStar = Math.min(a.tMax, a.tMin + at * (a.tMax - a.tMin));
        const pa = predictAt(a, tStar);
        const pb = predictAt(b, Math.min(b.tMax, Math.max(b.tMin, tStar + shift)));
        expect(Math.abs(pb.value - pa.value)).toBeLessThan(1e-7 * scale);
        expect(Math.abs(pb.meanSe - pa.meanSe)).toBeLessThan(1e-7 * scale);
      }),
      { numRuns: 200 },
    );
  });

  it('scaling y by c scales b0, b1, s and every interval half-width by |c|', () => {
    fc.assert(
      fc.property(series, fc.double({ min: -1e3, max: 1e3, noNaN: true }).filter((c) => Math.abs(c) > 1e-3), ({ t, y }, c) => {
        const a = fitTrend(t, y);
        const b = fitTrend(
          t,
          y.map((v) => c * v),
        );
        const tol = (x: number) => 1e-9 * Math.max(1, Math.abs(x)) * Math.max(1, ...y.map(Math.abs));
        expect(Math.abs(b.slope - c * a.slope)).toBeLessThan(tol(c) / (a.tMax - a.tMin));
        expect(Math.abs(b.intercept - c * a.intercept)).toBeLessThan(tol(c) * Math.max(1, Math.abs(a.tMean)));
        expect(Math.abs(b.residualSd - Math.abs(c) * a.residualSd)).toBeLessThan(tol(c));
        const pa = predictAt(a, a.tMean);
        const pb = predictAt(b, b.tMean);
        const half = (i: { low: number; high: number }) => (i.high - i.low) / 2;
        expect(Math.abs(half(pb.predictionInterval) - Math.abs(c) * half(pa.predictionInterval))).toBeLessThan(10 * tol(c));
        expect(Math.abs(half(b.slopeInterval) - Math.abs(c) * half(a.slopeInterval))).toBeLessThan(10 * tol(c));
      }),
      { numRuns: 200 },
    );
  });
});
