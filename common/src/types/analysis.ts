// The engineer's part: calibration chains, trend fits, stable values, stability rules, uncertainty
// budgets and balance checks. These are the inputs and results that travel between the server
// (authoritative results, stored with their inputs) and the browser (live preview).
// Time is test time in seconds throughout; rates are also given per minute as people quote them.

import type { Channel, ChannelAccuracy } from './channel';

// ── Uncertainty statements (JCGM 100:2008, GUM) ──────────────────────────────────────────────

/**
 * How a stated uncertainty is distributed. 'normal': the value is an expanded uncertainty with
 * coverage factor k (a certificate's "U = …, k = 2"; k = 1 for a standard uncertainty).
 * 'rectangular': the value is a half-width ±a with every value inside equally likely; u = a/√3
 * (GUM 4.3.7). A bare "±a" with no distribution stated is taken as rectangular.
 */
export type UncertaintyDistribution = 'normal' | 'rectangular';

/** An uncertainty as someone stated it, before it is turned into a standard uncertainty. */
export interface StatedUncertainty {
  /** 'absolute': `value` is in the unit of the quantity; 'relative': a percent of its value. */
  basis: 'absolute' | 'relative';
  /** ≥ 0; a half-width (rectangular) or an expanded uncertainty (normal). */
  value: number;
  /** Omitted or null: rectangular. */
  distribution?: UncertaintyDistribution | null;
  /** Coverage factor of a normal statement; required for 'normal', ignored for 'rectangular'. */
  k?: number | null;
  /**
   * The same id on components of several values marks one shared source (one meter, one
   * calibration factor): its errors are fully correlated wherever it appears. Omitted: independent.
   */
  sourceId?: string | null;
  /** What it is, for the budget, e.g. "bypass ratio". */
  label?: string | null;
}

/** One line of an uncertainty budget. */
export interface BudgetComponent {
  name: string;
  /** Shared-source id, or null for a component that belongs to this value only. */
  sourceId: string | null;
  /** As stated: a half-width (rectangular) or an expanded uncertainty (normal), in `unit`. */
  value: number;
  unit: string;
  distribution: UncertaintyDistribution;
  /** √3 for rectangular, k for normal. */
  divisor: number;
  /** value / divisor, in `unit`. */
  standardUncertainty: number;
  /** ∂result/∂(this quantity), in result unit per `unit`; signed. */
  sensitivity: number;
  /** |sensitivity| × standardUncertainty, in the result's unit. */
  contribution: number;
  /** 100 × contribution² / u_c² (with correlated inputs the shares need not add to 100). */
  percentOfVariance: number;
  /** How the stated value was obtained, e.g. "±(1.5 % of FS 5 V)". */
  note?: string;
}

export interface UncertaintyBudget {
  /** The value the budget belongs to, in `unit`. */
  value: number;
  unit: string;
  components: BudgetComponent[];
  /** 2 Σ c_i c_j r_ij u_i u_j over correlated input pairs (0 without correlations), in unit². */
  covarianceTerm: number;
  /** u_c, in `unit`. */
  combinedStandardUncertainty: number;
  /** k (2 unless asked otherwise): about 95 % coverage when u_c is reliable (NIST TN 1297 §6.2). */
  coverageFactor: number;
  /** U = k·u_c, in `unit`. */
  expandedUncertainty: number;
  /** 100·U/|value|; null when the value is 0. */
  relativeExpandedPercent: number | null;
}

// ── Calibration chains ───────────────────────────────────────────────────────────────────────

/** One (raw, engineering) pair of a two-point or table calibration. */
export interface CalibrationPoint {
  raw: number;
  eng: number;
}

/** Reference conditions of a standard volumetric flow: named sets at 101.325 kPa, or explicit. */
export type StandardConditionId = '0C' | '20C' | '21.1C' | '25C';

export interface CustomStandardConditions {
  temperatureC: number;
  pressureKPa: number;
}

interface CalibrationStepBase {
  /** Shown in the budget and in errors, e.g. "panel voltmeter → standard flow". */
  label?: string | null;
  /** Units as the units library spells them ("V", "L/min", "g/min", "degC"); "°C" is accepted. */
  inputUnit: string;
  outputUnit: string;
  /** This step's own uncertainty, stated on its output. */
  uncertainty?: StatedUncertainty | null;
}

/** y = a·x + b. */
export interface LinearStep extends CalibrationStepBase {
  kind: 'linear';
  a: number;
  b: number;
}

/** The straight line through two (raw, eng) pairs with different raw values. */
export interface TwoPointStep extends CalibrationStepBase {
  kind: 'two-point';
  points: [CalibrationPoint, CalibrationPoint];
}

/**
 * Piecewise linear between table points, raw strictly increasing. Values outside the table are
 * refused unless `allowExtrapolation` is true (then the end segments are extended).
 */
export interface TableStep extends CalibrationStepBase {
  kind: 'table';
  points: CalibrationPoint[];
  allowExtrapolation?: boolean;
}

/** A change of unit only (input and output must measure the same quantity). */
export interface UnitStep extends CalibrationStepBase {
  kind: 'unit';
}

/**
 * Standard volumetric flow (e.g. standard L/min) to mass flow: multiply by the gas density at the
 * meter's standard (reference) conditions. Dry air as an ideal gas, R = 287.05 J/(kg K).
 */
export interface StandardToMassStep extends CalibrationStepBase {
  kind: 'standard-to-mass';
  standardConditions: StandardConditionId | CustomStandardConditions;
}

export type CalibrationStep = LinearStep | TwoPointStep | TableStep | UnitStep | StandardToMassStep;

/** Raw display value → engineering value, step by step. The first input unit is the raw unit. */
export interface CalibrationChain {
  steps: CalibrationStep[];
}

// ── Trend fit ────────────────────────────────────────────────────────────────────────────────

export interface TrendPoint {
  /** Test time, s. */
  t: number;
  y: number;
  /** First-pass value with no second pass yet (counted in the result so it can be marked). */
  unchecked?: boolean;
}

/** Closed time interval [from, to], s. */
export interface TimeWindow {
  from: number;
  to: number;
}

export interface Interval {
  low: number;
  high: number;
}

/**
 * y = intercept + slope·t by ordinary least squares (Montgomery & Runger, Applied Statistics and
 * Probability for Engineers, ch. 11). Slopes per second and per minute, in y's unit.
 */
export interface TrendFit {
  n: number;
  /** Points marked unchecked among the n. */
  uncheckedCount: number;
  /** Earliest and latest t of the fitted points. */
  tMin: number;
  tMax: number;
  tMean: number;
  yMean: number;
  /** Σ(t − t̄)², s². */
  sxx: number;
  intercept: number;
  slope: number;
  slopePerMinute: number;
  /** Null when every y is the same (R² is undefined; the fit is a flat line). */
  rSquared: number | null;
  /** s = √(SSE/(n − 2)). */
  residualSd: number;
  interceptSe: number;
  slopeSe: number;
  slopeSePerMinute: number;
  /** n − 2. */
  dof: number;
  /** e.g. 0.95. */
  confidence: number;
  /** t(α/2, n − 2). */
  tQuantile: number;
  slopeInterval: Interval;
  slopeIntervalPerMinute: Interval;
  /** y − ŷ at each point, in input order; empty when not asked for. */
  residuals: number[];
}

/** The fitted value at t* with its two intervals (Montgomery & Runger §11-5.2 and §11-6). */
export interface FitPrediction {
  tStar: number;
  value: number;
  /** Standard error of the mean response: s·√(1/n + (t* − t̄)²/Sxx). */
  meanSe: number;
  meanInterval: Interval;
  /** s·√(1 + 1/n + (t* − t̄)²/Sxx). */
  predictionSe: number;
  predictionInterval: Interval;
  /** t* − t̄, s: both intervals widen away from the window's centre. */
  distanceFromCentre: number;
  extrapolated: boolean;
  warnings: string[];
}

// ── Stability rules ──────────────────────────────────────────────────────────────────────────

/** A named steady-state rule; any limit may be absent (null), at least one must be set. */
export interface StabilityRule {
  name: string;
  /** The window ends at the chosen time and reaches back this far, s. */
  windowSeconds: number;
  /** |slope| limit, channel units per minute. */
  slopeLimitPerMinute?: number | null;
  /** max − min limit over the window, channel units. */
  bandLimit?: number | null;
  /** |slope| × window length limit, channel units. */
  driftLimit?: number | null;
}

export type StabilityPartName = 'coverage' | 'slope' | 'band' | 'drift';

export interface StabilityPart {
  part: StabilityPartName;
  pass: boolean;
  measured: number;
  limit: number;
  /** Unit of measured and limit as words, e.g. "°C/min", "s". */
  unit: string;
  message: string;
}

export interface StabilityVerdict {
  rule: string;
  window: TimeWindow;
  n: number;
  pass: boolean;
  parts: StabilityPart[];
}

// ── Stable value ─────────────────────────────────────────────────────────────────────────────

/** What the uncertainty of a channel needs to know; a Channel fits as it is. */
export interface ChannelSpec extends Pick<Channel, 'rawUnit' | 'resolution'> {
  /** Used to build shared-source ids ("<id>/accuracy"); one meter keeps one id across runs. */
  id?: string;
  name?: string;
  fullScale?: number | null;
  accuracy?: ChannelAccuracy | null;
}

export interface StableValueOptions {
  /** Of the intervals; default 0.95. */
  confidence?: number;
  /** Refused without it when t* is outside the fitted points' time range. */
  allowExtrapolation?: boolean;
  /** Default 2. */
  coverageFactor?: number;
  /** Add δ/√12 for the display resolution; default true (record the choice in the budget). */
  includeResolution?: boolean;
  /** Return the residuals of the engineering fit; default true. */
  includeResiduals?: boolean;
}

export interface StableValue {
  tStar: number;
  /** Fit of the readings converted to engineering units. */
  fit: TrendFit;
  prediction: FitPrediction;
  /** Raw display value at t* (fit of the raw readings), in the raw unit. */
  rawValue: number;
  rawUnit: string;
  value: number;
  unit: string;
  budget: UncertaintyBudget;
  expandedUncertainty: number;
  warnings: string[];
}

// ── Balance checks ───────────────────────────────────────────────────────────────────────────

/** How one source moves one value: the change of the value for +1 standard uncertainty of it. */
export interface SourceEffect {
  /** Shared-source id; null or absent: this value's own, independent component. */
  sourceId?: string | null;
  name: string;
  /** Signed, in the value's unit. */
  effect: number;
}

/** A measured value with its uncertainty split by source (e.g. from a stable value's budget). */
export interface MeasuredValue {
  value: number;
  unit: string;
  components: SourceEffect[];
}

export type BalanceSide = 'in' | 'out';

export interface MassStream {
  id: string;
  label: string;
  side: BalanceSide;
  /** Any mass-flow unit ("g/min", "kg/s"). */
  massFlow: MeasuredValue;
}

/**
 * An energy term: ṁ·h(T), or ṁ·(h(T) − h(T_minus)) when `minusTemperature` is set (the heat a
 * stream gives up or takes up between two ports, independent of the reference state).
 */
export interface EnergyStream {
  id: string;
  label: string;
  side: BalanceSide;
  massFlow: MeasuredValue;
  /** Any temperature unit ("degC", "°C", "K"). */
  temperature: MeasuredValue;
  minusTemperature?: MeasuredValue | null;
}

/** How h(T) is obtained; one model for every stream of a balance, so all share a reference state. */
export type EnthalpyModel =
  | {
      kind: 'constant-cp';
      /** J/(kg K); default 1006 (ASHRAE dry air). */
      cp?: number;
      /** h = 0 here, °C; default 0 °C. */
      referenceTemperatureC?: number;
    }
  | {
      /** Linear interpolation in the ideal-gas table of dry air (h = 0 at 0 K), 250–400 K. */
      kind: 'ideal-gas-table';
    };

/** One source's share of the closure's uncertainty. */
export interface ClosureBudgetLine {
  sourceId: string | null;
  name: string;
  /** Streams this source enters. */
  streams: string[];
  /** Change of R for +1 standard uncertainty of the source (shared effects added first). */
  effect: number;
  percentOfVariance: number;
}

export interface BalanceResult {
  kind: 'mass' | 'energy';
  /** Σin and Σout in `unit` (kg/s for mass, W for energy). */
  sumIn: number;
  sumOut: number;
  unit: string;
  /** Per stream: its value in `unit`. */
  terms: Array<{ id: string; label: string; side: BalanceSide; value: number }>;
  /** R = Σout/Σin. */
  ratio: number;
  /** (R − 1)·100. */
  closurePercent: number;
  standardUncertainty: number;
  coverageFactor: number;
  /** U_R = k·u_R. */
  expandedUncertainty: number;
  /** U_R·100, the ± on closurePercent. */
  expandedUncertaintyPercent: number;
  /** |R − 1| / U_R (E_n); ≤ 1 passes. */
  normalisedError: number;
  /** |R − 1| ≤ U_R. */
  pass: boolean;
  budget: ClosureBudgetLine[];
}
