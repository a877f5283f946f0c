// Linear trend over a time window by ordinary least squares, y = b0 + b1·t, after Montgomery &
// Runger, Applied Statistics and Probability for Engineers (ch. 11: §11-2 least-squares
// estimates, §11-3 standard errors of the estimators, §11-5.1 confidence intervals on slope and
// intercept, §11-5.2 confidence interval on the mean response, §11-6 prediction interval on a
// new observation; section numbers as in the 5th–7th editions, from memory).
//
// Sums are taken about the means (two passes, with the first pass's rounding corrected in the
// second), so times like 3600 s or large offsets in y do not eat the digits of Sxx; this is what
// reproduces the NIST StRD certified values to 12+ digits. Readings taken every few seconds are
// autocorrelated and quantised to the display digits, so the standard errors here are on the
// optimistic side; judge drift by an absolute slope limit as well (stability.ts).
import type { FitPrediction, TimeWindow, TrendFit, TrendPoint } from '../types/analysis';
import { AnalysisError, assertFiniteNumber } from './errors';
import { twoSidedStudentT } from './student-t';
import { formatNumber } from './uncertainty';

export const DEFAULT_CONFIDENCE = 0.95;

export interface FitOptions {
  /** Of the slope, mean-response and prediction intervals; default 0.95. */
  confidence?: number;
  /** Return the residuals; default true. */
  residuals?: boolean;
  /** How many of the points are unchecked first-pass values (reported back). */
  uncheckedCount?: number;
}

function findBad(values: ArrayLike<number>, name: string): never {
  for (let i = 0; i < values.length; i++) {
    if (!Number.isFinite(values[i])) throw new AnalysisError(`point ${i + 1}: ${name} must be a finite number, got ${String(values[i])}`);
  }
  throw new AnalysisError(`the ${name} values overflow; rescale them`);
}

/** OLS fit of y on t (t in seconds). */
export function fitTrend(t: ArrayLike<number>, y: ArrayLike<number>, options: FitOptions = {}): TrendFit {
  const n = t.length;
  if (y.length !== n) throw new AnalysisError(`times and values differ in number (${n} times, ${y.length} values)`);
  if (n < 3) {
    throw new AnalysisError(
      `a trend fit needs at least 3 points, the window holds ${n}; widen the window (with 2 points no scatter is left to judge the fit by)`,
    );
  }
  const confidence = options.confidence ?? DEFAULT_CONFIDENCE;
  const dof = n - 2;
  const tq = twoSidedStudentT(confidence, dof);

  // Pass 1: provisional means and the time range.
  let st = 0;
  let sy = 0;
  let tMin = Infinity;
  let tMax = -Infinity;
  for (let i = 0; i < n; i++) {
    const ti = t[i];
    st += ti;
    sy += y[i];
    if (ti < tMin) tMin = ti;
    if (ti > tMax) tMax = ti;
  }
  if (!Number.isFinite(st)) findBad(t, 'time');
  if (!Number.isFinite(sy)) findBad(y, 'value');
  const t0 = st / n;
  const y0 = sy / n;

  // Pass 2: centred sums, corrected for the rounding of the provisional means.
  let dtSum = 0;
  let dySum = 0;
  let stt = 0;
  let sty = 0;
  let syy = 0;
  for (let i = 0; i < n; i++) {
    const dt = t[i] - t0;
    const dy = y[i] - y0;
    dtSum += dt;
    dySum += dy;
    stt += dt * dt;
    sty += dt * dy;
    syy += dy * dy;
  }
  const sxx = stt - (dtSum * dtSum) / n;
  const sxy = sty - (dtSum * dySum) / n;
  const syyC = syy - (dySum * dySum) / n;
  const tMean = t0 + dtSum / n;
  const yMean = y0 + dySum / n;
  if (!(sxx > 0) || tMin === tMax) {
    throw new AnalysisError(`all ${n} points have the same time (${formatNumber(tMin)} s); a trend needs points at two or more different times`);
  }
  const slope = sxy / sxx;
  const intercept = yMean - slope * tMean;

  // Pass 3: residuals about the centred line, e = (y − ȳ) − b1·(t − t̄).
  const wantResiduals = options.residuals !== false;
  const residuals: number[] = wantResiduals ? new Array<number>(n) : [];
  let sse = 0;
  for (let i = 0; i < n; i++) {
    const e = y[i] - yMean - slope * (t[i] - tMean);
    sse += e * e;
    if (wantResiduals) residuals[i] = e;
  }
  const s2 = sse / dof;
  const s = Math.sqrt(s2);
  const slopeSe = s / Math.sqrt(sxx);
  const interceptSe = s * Math.sqrt(1 / n + (tMean * tMean) / sxx);
  const half = tq * slopeSe;
  return {
    n,
    uncheckedCount: options.uncheckedCount ?? 0,
    tMin,
    tMax,
    tMean,
    yMean,
    sxx,
    intercept,
    slope,
    slopePerMinute: slope * 60,
    rSquared: syyC > 0 ? 1 - sse / syyC : null,
    residualSd: s,
    interceptSe,
    slopeSe,
    slopeSePerMinute: slopeSe * 60,
    dof,
    confidence,
    tQuantile: tq,
    slopeInterval: { low: slope - half, high: slope + half },
    slopeIntervalPerMinute: { low: (slope - half) * 60, high: (slope + half) * 60 },
    residuals,
  };
}

export interface PredictOptions {
  /** Let t* lie outside the fitted points' time range (the result then carries a warning). */
  allowExtrapolation?: boolean;
}

/**
 * ŷ(t*) with the confidence interval of the mean response, ŷ ± t(α/2, n−2)·s·√(1/n + (t*−t̄)²/Sxx)
 * (§11-5.2), and the prediction interval of one new reading, ŷ ± t(α/2, n−2)·s·√(1 + 1/n +
 * (t*−t̄)²/Sxx) (§11-6). t* outside [first, last fitted time] is refused unless allowed.
 */
export function predictAt(fit: TrendFit, tStar: number, options: PredictOptions = {}): FitPrediction {
  assertFiniteNumber(tStar, 't*');
  const warnings: string[] = [];
  const outside = tStar < fit.tMin || tStar > fit.tMax;
  if (outside) {
    const where =
      tStar < fit.tMin
        ? `${formatNumber(fit.tMin - tStar)} s before the first fitted point`
        : `${formatNumber(tStar - fit.tMax)} s after the last fitted point`;
    if (options.allowExtrapolation !== true) {
      throw new AnalysisError(
        `t* = ${formatNumber(tStar)} s is outside the fitted points (${formatNumber(fit.tMin)}–${formatNumber(fit.tMax)} s), ${where}; choose t* inside the window or confirm extrapolation`,
      );
    }
    warnings.push(`extrapolated: t* = ${formatNumber(tStar)} s is ${where}; the value assumes the trend carries on unchanged`);
  }
  const d = tStar - fit.tMean;
  const value = fit.yMean + fit.slope * d;
  const lever = 1 / fit.n + (d * d) / fit.sxx;
  const meanSe = fit.residualSd * Math.sqrt(lever);
  const predictionSe = fit.residualSd * Math.sqrt(1 + lever);
  const tq = fit.tQuantile;
  return {
    tStar,
    value,
    meanSe,
    meanInterval: { low: value - tq * meanSe, high: value + tq * meanSe },
    predictionSe,
    predictionInterval: { low: value - tq * predictionSe, high: value + tq * predictionSe },
    distanceFromCentre: d,
    extrapolated: outside,
    warnings,
  };
}

/** Checks a window and returns it; from ≤ to, both finite. */
export function assertWindow(window: TimeWindow): TimeWindow {
  if (!window || typeof window !== 'object') throw new AnalysisError('the time window is missing');
  assertFiniteNumber(window.from, 'window start');
  assertFiniteNumber(window.to, 'window end');
  if (window.to < window.from) {
    throw new AnalysisError(`the window ends (${formatNumber(window.to)} s) before it starts (${formatNumber(window.from)} s)`);
  }
  return window;
}

export interface WindowSeries {
  t: Float64Array;
  y: Float64Array;
  uncheckedCount: number;
}

/**
 * Copies the points with from ≤ t ≤ to, in their order, into `t` and `y` (each at least
 * points.length long) in one pass; returns how many were copied and how many are unchecked.
 */
export function copyWindow(
  points: readonly TrendPoint[],
  window: TimeWindow,
  t: Float64Array,
  y: Float64Array,
): { count: number; uncheckedCount: number } {
  const { from, to } = assertWindow(window);
  if (!Array.isArray(points)) throw new AnalysisError('the readings must be a list of {t, y} points');
  let unchecked = 0;
  let j = 0;
  for (let i = 0; i < points.length; i++) {
    const p = points[i];
    const ti = p.t;
    if (ti >= from && ti <= to) {
      const yi = p.y;
      if (!Number.isFinite(yi)) {
        throw new AnalysisError(`the reading at t = ${formatNumber(ti)} s is not a finite number (${String(yi)}); leave flagged readings out`);
      }
      t[j] = ti;
      y[j] = yi;
      if (p.unchecked) unchecked++;
      j++;
    } else if (!Number.isFinite(ti)) {
      throw new AnalysisError(`point ${i + 1} has no valid time (${String(ti)})`);
    }
  }
  return { count: j, uncheckedCount: unchecked };
}

/** The points with from ≤ t ≤ to, in their order, as typed arrays for the fit. */
export function selectWindow(points: readonly TrendPoint[], window: TimeWindow): WindowSeries {
  const n = Array.isArray(points) ? points.length : 0;
  const t = new Float64Array(n);
  const y = new Float64Array(n);
  const { count, uncheckedCount } = copyWindow(points, window, t, y);
  return { t: t.subarray(0, count), y: y.subarray(0, count), uncheckedCount };
}

/** Fit over the points of a window. */
export function fitWindow(points: readonly TrendPoint[], window: TimeWindow, options: Omit<FitOptions, 'uncheckedCount'> = {}): TrendFit {
  const series = selectWindow(points, window);
  if (series.t.length < 3) {
    throw new AnalysisError(
      `a trend fit needs at least 3 points, the window ${formatNumber(window.from)}–${formatNumber(window.to)} s holds ${series.t.length}; widen the window`,
    );
  }
  return fitTrend(series.t, series.y, { ...options, uncheckedCount: series.uncheckedCount });
}
