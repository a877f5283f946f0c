// Stability (steady-state) rules: a named set of limits judged over a window that ends at the
// chosen time. Engineers judge drift by absolute limits rather than by whether the slope is
// "significant" (with hundreds of readings a trivial drift is significant, with a few noisy
// ones a real drift hides). The kind of rule: ASHRAE Standard 93 (solar collectors) calls the
// outlet steady when it "varies less than 0.05 °C per minute" (§8.3.3 of the 2010 edition).
import type { StabilityPart, StabilityRule, StabilityVerdict, TrendPoint } from '../types/analysis';
import { AnalysisError, assertFiniteNumber } from './errors';
import { fitTrend, selectWindow } from './trend-fit';
import { formatNumber } from './uncertainty';

function checkLimit(value: number | null | undefined, what: string): value is number {
  if (value === null || value === undefined) return false;
  assertFiniteNumber(value, what);
  if (value < 0) throw new AnalysisError(`${what} must not be negative, got ${value}`);
  return true;
}

/** Throws AnalysisError unless the rule can be applied. */
export function validateStabilityRule(rule: StabilityRule): void {
  if (!rule || typeof rule !== 'object') throw new AnalysisError('the stability rule is missing');
  if (typeof rule.name !== 'string' || rule.name.trim() === '') throw new AnalysisError('a stability rule needs a name');
  assertFiniteNumber(rule.windowSeconds, `rule "${rule.name}": window length`);
  if (rule.windowSeconds <= 0) throw new AnalysisError(`rule "${rule.name}": window length must be above 0 s, got ${rule.windowSeconds}`);
  const any = [
    checkLimit(rule.slopeLimitPerMinute, `rule "${rule.name}": slope limit`),
    checkLimit(rule.bandLimit, `rule "${rule.name}": band limit`),
    checkLimit(rule.driftLimit, `rule "${rule.name}": drift limit`),
  ].some(Boolean);
  if (!any) throw new AnalysisError(`rule "${rule.name}" sets no limit; set a slope limit, a max − min band or a drift limit`);
}

export interface StabilityOptions {
  /** End of the window, s; default the latest point. */
  end?: number;
  /** Channel unit for the messages, e.g. "°C". */
  unit?: string;
}

/**
 * The rule's verdict over [end − window, end]: the window must be covered by readings (to within
 * one reading interval), then each set limit is a part that passes or fails with its measured
 * value. Overall pass = every part passes.
 */
export function evaluateStability(rule: StabilityRule, points: readonly TrendPoint[], options: StabilityOptions = {}): StabilityVerdict {
  validateStabilityRule(rule);
  if (!Array.isArray(points) || points.length === 0) throw new AnalysisError(`rule "${rule.name}": there are no readings to judge`);
  let latest = -Infinity;
  if (options.end === undefined) for (const p of points) if (p.t > latest) latest = p.t;
  const end = options.end ?? latest;
  assertFiniteNumber(end, 'window end');
  const unit = options.unit ?? '';
  const u = unit ? ` ${unit}` : '';
  const window = { from: end - rule.windowSeconds, to: end };
  const series = selectWindow(points, window);
  const n = series.t.length;
  if (n < 3) {
    throw new AnalysisError(
      `rule "${rule.name}": the ${formatNumber(rule.windowSeconds)} s window ending at ${formatNumber(end)} s holds ${n} reading${n === 1 ? '' : 's'}; at least 3 are needed`,
    );
  }
  const fit = fitTrend(series.t, series.y, { residuals: false });
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < n; i++) {
    const v = series.y[i];
    if (v < min) min = v;
    if (v > max) max = v;
  }
  const parts: StabilityPart[] = [];
  const span = fit.tMax - fit.tMin;
  const interval = span / (n - 1);
  const covered = span >= rule.windowSeconds - interval - 1e-9 * rule.windowSeconds;
  parts.push({
    part: 'coverage',
    pass: covered,
    measured: span,
    limit: rule.windowSeconds,
    unit: 's',
    message: covered
      ? `readings cover ${formatNumber(span)} s of the ${formatNumber(rule.windowSeconds)} s window`
      : `readings cover only ${formatNumber(span)} s of the ${formatNumber(rule.windowSeconds)} s window; read more rows or move the end later`,
  });
  const slope = Math.abs(fit.slopePerMinute);
  if (checkLimit(rule.slopeLimitPerMinute, 'slope limit')) {
    const limit = rule.slopeLimitPerMinute;
    const pass = slope <= limit;
    parts.push({
      part: 'slope',
      pass,
      measured: slope,
      limit,
      unit: `${unit}/min`.replace(/^\//, 'per '),
      message: `|slope| ${formatNumber(slope)}${u}/min ${pass ? '≤' : '>'} ${formatNumber(limit)}${u}/min`,
    });
  }
  if (checkLimit(rule.bandLimit, 'band limit')) {
    const band = max - min;
    const limit = rule.bandLimit;
    const pass = band <= limit;
    parts.push({
      part: 'band',
      pass,
      measured: band,
      limit,
      unit,
      message: `max − min ${formatNumber(band)}${u} ${pass ? '≤' : '>'} ${formatNumber(limit)}${u}`,
    });
  }
  if (checkLimit(rule.driftLimit, 'drift limit')) {
    const drift = (slope * rule.windowSeconds) / 60;
    const limit = rule.driftLimit;
    const pass = drift <= limit;
    parts.push({
      part: 'drift',
      pass,
      measured: drift,
      limit,
      unit,
      message: `drift over ${formatNumber(rule.windowSeconds / 60)} min ${formatNumber(drift)}${u} ${pass ? '≤' : '>'} ${formatNumber(limit)}${u}`,
    });
  }
  return { rule: rule.name, window, n, pass: parts.every((p) => p.pass), parts };
}
