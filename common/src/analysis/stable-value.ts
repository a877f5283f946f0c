// The stable value of a channel at the chosen time t*: fit the readings of a window, take the
// fitted value at t* in engineering units, and give it an uncertainty budget (instrument accuracy
// and display resolution at the raw reading, the calibration steps, the fit's standard error of
// the mean response), combined in quadrature and expanded with k = 2 (JCGM 100:2008).
// The server stores it as the authoritative result; the browser runs the same function for a live
// preview while the engineer drags the window, so it is written to be fast on 100 000 readings.
import type {
  CalibrationChain,
  ChannelSpec,
  FitPrediction,
  StableValue,
  StableValueOptions,
  TimeWindow,
  TrendFit,
  TrendPoint,
} from '../types/analysis';
import { chainComponents, compileChain, evaluateChainMany, type CompiledChain } from './calibration';
import { AnalysisError } from './errors';
import { copyWindow, fitTrend, predictAt } from './trend-fit';
import { accuracyComponent, combineBudget, fitComponent, formatNumber, resolutionComponent, type ComponentInput } from './uncertainty';

/** Scratch arrays are kept for windows up to this many points; larger ones are allocated per call. */
const MAX_SCRATCH_POINTS = 1_000_000;
let scratchT = new Float64Array(0);
let scratchY = new Float64Array(0);

function scratch(size: number): { t: Float64Array; y: Float64Array } {
  if (size > MAX_SCRATCH_POINTS) return { t: new Float64Array(size), y: new Float64Array(size) };
  if (scratchT.length < size) {
    scratchT = new Float64Array(size);
    scratchY = new Float64Array(size);
  }
  return { t: scratchT, y: scratchY };
}

/**
 * Fit + value at t* in engineering units + budget + expanded uncertainty. `calibration` converts
 * the channel's raw display values (its first step takes channel.rawUnit); without one the value
 * stays in the raw unit. The readings are fitted after conversion (so the fit, its residuals and a
 * stability rule are in engineering units); the raw reading at t*, where the instrument's spec
 * applies, comes from a fit of the raw values over the same points.
 */
export function stableValue(
  points: readonly TrendPoint[],
  window: TimeWindow,
  tStar: number,
  channel: ChannelSpec,
  calibration?: CalibrationChain | CompiledChain | null,
  options: StableValueOptions = {},
): StableValue {
  if (!channel || typeof channel !== 'object') throw new AnalysisError('the channel is missing');
  if (typeof channel.rawUnit !== 'string' || channel.rawUnit.trim() === '') throw new AnalysisError('the channel has no raw unit');
  if (!Array.isArray(points)) throw new AnalysisError('the readings must be a list of {t, y} points');
  const chain: CompiledChain =
    calibration && 'apply' in calibration && typeof calibration.apply === 'function'
      ? calibration
      : compileChain((calibration as CalibrationChain | null | undefined) ?? null, channel.rawUnit);
  // The window's points go into scratch arrays kept between calls (the function is synchronous,
  // so no two calls share them at once): fresh 100 000-point arrays on every drag of the window
  // would cost more in page faults and collection than the fit itself.
  const { t, y } = scratch(points.length);
  const { count: n, uncheckedCount } = copyWindow(points, window, t, y);
  if (n < 3) {
    throw new AnalysisError(
      `a stable value needs at least 3 readings in the window, ${formatNumber(window.from)}–${formatNumber(window.to)} s holds ${n}; widen the window`,
    );
  }
  const tw = t.subarray(0, n);
  const yw = y.subarray(0, n);
  const confidence = options.confidence;
  const fitOptions = { confidence, residuals: options.includeResiduals !== false, uncheckedCount };
  let fit: TrendFit;
  let rawValue: number;
  let prediction: FitPrediction;
  if (chain.steps.length === 0) {
    fit = fitTrend(tw, yw, fitOptions);
    prediction = predictAt(fit, tStar, { allowExtrapolation: options.allowExtrapolation });
    rawValue = prediction.value;
  } else {
    // Raw fit first (for the reading at t*, where the instrument spec applies), then convert the
    // values in place and fit again in engineering units.
    const rawFit = fitTrend(tw, yw, { confidence, residuals: false });
    rawValue = rawFit.yMean + rawFit.slope * (tStar - rawFit.tMean);
    evaluateChainMany(chain, yw, yw);
    fit = fitTrend(tw, yw, fitOptions);
    prediction = predictAt(fit, tStar, { allowExtrapolation: options.allowExtrapolation });
  }

  const evaluation = chainComponents(chain, rawValue);
  const components: ComponentInput[] = [];
  const accuracy = accuracyComponent(rawValue, channel, evaluation.sensitivity);
  if (accuracy) components.push(accuracy);
  if (options.includeResolution !== false) components.push(resolutionComponent(channel, evaluation.sensitivity));
  components.push(...evaluation.components);
  components.push(fitComponent(prediction, chain.unit, fit.dof));
  const budget = combineBudget(prediction.value, chain.unit, components, { coverageFactor: options.coverageFactor });

  const warnings = [...prediction.warnings];
  if (fit.uncheckedCount > 0) {
    warnings.push(`${fit.uncheckedCount} of ${n} readings are unchecked first-pass values (no second pass yet)`);
  }
  if (!accuracy) warnings.push('the channel states no accuracy; the budget holds resolution, calibration and fit only');
  return {
    tStar,
    fit,
    prediction,
    rawValue,
    rawUnit: channel.rawUnit,
    value: prediction.value,
    unit: chain.unit,
    budget,
    expandedUncertainty: budget.expandedUncertainty,
    warnings,
  };
}
