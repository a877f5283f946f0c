// Uncertainty budgets after JCGM 100:2008 (the GUM). Each component is stated as people find it
// (a data-sheet bound, a certificate's U with k, a display's last digit), turned into a standard
// uncertainty u = value / divisor, multiplied by its sensitivity coefficient c = ∂y/∂x, and the
// contributions combined in quadrature: u_c² = Σ (c_i u_i)² (+ covariance terms, GUM 5.2.2).
// The expanded uncertainty is U = k·u_c with k = 2 (about 95 % for a normal distribution).
import type {
  BudgetComponent,
  ChannelSpec,
  FitPrediction,
  StatedUncertainty,
  UncertaintyBudget,
  UncertaintyDistribution,
} from '../types/analysis';
import { AnalysisError, assertFiniteNumber, describeValue } from './errors';

export const SQRT3 = Math.sqrt(3);
export const DEFAULT_COVERAGE_FACTOR = 2;

/** A budget line before the budget is combined (contribution and share are filled in then). */
export interface ComponentInput {
  name: string;
  sourceId?: string | null;
  /** As stated: half-width (rectangular) or expanded uncertainty (normal), in `unit`. */
  value: number;
  unit: string;
  distribution: UncertaintyDistribution;
  divisor: number;
  /** ∂result/∂(this quantity); signed. */
  sensitivity: number;
  note?: string;
}

/** The standard uncertainty a statement stands for. */
export function standardUncertainty(component: Pick<ComponentInput, 'value' | 'divisor'>): number {
  return component.value / component.divisor;
}

/**
 * A stated uncertainty of a quantity whose value is `quantityValue` (needed for relative
 * statements), as a budget line with sensitivity `sensitivity`. A statement without a
 * distribution is a bare ± bound and is taken as rectangular (GUM 4.3.7: u = a/√3).
 */
export function statedComponent(
  name: string,
  stated: StatedUncertainty,
  quantityValue: number,
  unit: string,
  sensitivity = 1,
): ComponentInput {
  if (!stated || typeof stated !== 'object') throw new AnalysisError(`${name}: the uncertainty statement is missing`);
  assertFiniteNumber(stated.value, `${name}: uncertainty value`);
  if (stated.value < 0) throw new AnalysisError(`${name}: uncertainty must not be negative, got ${stated.value}`);
  if (stated.basis !== 'absolute' && stated.basis !== 'relative') {
    throw new AnalysisError(`${name}: uncertainty basis must be "absolute" or "relative" (percent of the value), got ${describeValue(stated.basis)}`);
  }
  const distribution: UncertaintyDistribution = stated.distribution ?? 'rectangular';
  let divisor: number;
  if (distribution === 'normal') {
    if (typeof stated.k !== 'number' || !Number.isFinite(stated.k) || stated.k <= 0) {
      throw new AnalysisError(
        `${name}: a normal uncertainty needs its coverage factor k (> 0), e.g. k = 2 from a calibration certificate, k = 1 for a standard uncertainty`,
      );
    }
    divisor = stated.k;
  } else if (distribution === 'rectangular') {
    divisor = SQRT3;
  } else {
    throw new AnalysisError(`${name}: distribution must be "normal" or "rectangular", got ${describeValue(distribution)}`);
  }
  const value = stated.basis === 'relative' ? (Math.abs(quantityValue) * stated.value) / 100 : stated.value;
  const how = stated.basis === 'relative' ? `${stated.value} % of ${formatNumber(quantityValue)} ${unit}` : `${stated.value} ${unit}`;
  const note = distribution === 'normal' ? `U = ${how}, k = ${stated.k}` : `±${how}, rectangular`;
  return { name: stated.label ? `${name}: ${stated.label}` : name, sourceId: stated.sourceId ?? null, value, unit, distribution, divisor, sensitivity, note };
}

/**
 * The instrument's accuracy spec at a reading, as one rectangular bound: the parts of a data
 * sheet's "±(p % of reading + q % of full scale + d digits)" add up to one half-width a, and
 * u = a/√3. Null when the channel states no accuracy. "% of full scale" is the same at every
 * reading, so low readings carry a large relative uncertainty.
 */
export function accuracyComponent(reading: number, channel: ChannelSpec, sensitivity = 1): ComponentInput | null {
  assertFiniteNumber(reading, 'reading');
  const spec = channel.accuracy;
  if (!spec) return null;
  const parts: string[] = [];
  let bound = 0;
  const set = (x: number | null | undefined): x is number => typeof x === 'number';
  if (set(spec.percentOfReading)) {
    assertFiniteNumber(spec.percentOfReading, 'accuracy % of reading');
    if (spec.percentOfReading < 0) throw new AnalysisError(`accuracy % of reading must not be negative, got ${spec.percentOfReading}`);
    bound += (Math.abs(reading) * spec.percentOfReading) / 100;
    parts.push(`${spec.percentOfReading} % of reading`);
  }
  if (set(spec.percentOfFullScale)) {
    assertFiniteNumber(spec.percentOfFullScale, 'accuracy % of full scale');
    if (spec.percentOfFullScale < 0) throw new AnalysisError(`accuracy % of full scale must not be negative, got ${spec.percentOfFullScale}`);
    const fs = channel.fullScale;
    if (typeof fs !== 'number' || !Number.isFinite(fs) || fs <= 0) {
      throw new AnalysisError(
        `${channel.name ?? 'the channel'} states its accuracy as % of full scale but has no full scale; set the channel's full scale (in ${channel.rawUnit})`,
      );
    }
    bound += (fs * spec.percentOfFullScale) / 100;
    parts.push(`${spec.percentOfFullScale} % of FS ${formatNumber(fs)} ${channel.rawUnit}`);
  }
  if (set(spec.digits)) {
    assertFiniteNumber(spec.digits, 'accuracy digits');
    if (spec.digits < 0) throw new AnalysisError(`accuracy digits must not be negative, got ${spec.digits}`);
    assertResolution(channel);
    bound += spec.digits * channel.resolution;
    parts.push(`${spec.digits} digit${spec.digits === 1 ? '' : 's'} of ${formatNumber(channel.resolution)} ${channel.rawUnit}`);
  }
  if (parts.length === 0) return null;
  return {
    name: 'instrument accuracy',
    sourceId: channel.id ? `${channel.id}/accuracy` : null,
    value: bound,
    unit: channel.rawUnit,
    distribution: 'rectangular',
    divisor: SQRT3,
    sensitivity,
    note: `±(${parts.join(' + ')}) at ${formatNumber(reading)} ${channel.rawUnit}`,
  };
}

function assertResolution(channel: ChannelSpec): void {
  if (typeof channel.resolution !== 'number' || !Number.isFinite(channel.resolution) || channel.resolution <= 0) {
    throw new AnalysisError(`the channel's resolution (last displayed digit) must be a number above 0, got ${describeValue(channel.resolution)}`);
  }
}

/**
 * The display's last digit δ: the true value lies anywhere within ±δ/2 of the shown one, a
 * rectangular half-width, so u = (δ/2)/√3 = δ/√12 (GUM F.2.2.1). Random from reading to reading,
 * so never shared.
 */
export function resolutionComponent(channel: ChannelSpec, sensitivity = 1): ComponentInput {
  assertResolution(channel);
  return {
    name: 'display resolution',
    sourceId: null,
    value: channel.resolution / 2,
    unit: channel.rawUnit,
    distribution: 'rectangular',
    divisor: SQRT3,
    sensitivity,
    note: `±δ/2 with δ = ${formatNumber(channel.resolution)} ${channel.rawUnit}; u = δ/√12`,
  };
}

/** The name of the fit's line in a budget (the rest are the instrument's and calibration's). */
export const FIT_COMPONENT_NAME = 'trend fit at t*';

/**
 * The trend fit's standard error of the mean response at t*, a Type A standard uncertainty (GUM
 * 4.2). Readings every few seconds are autocorrelated, so this is on the optimistic side.
 */
export function fitComponent(prediction: FitPrediction, unit: string, dof?: number): ComponentInput {
  return {
    name: FIT_COMPONENT_NAME,
    sourceId: null,
    value: prediction.meanSe,
    unit,
    distribution: 'normal',
    divisor: 1,
    sensitivity: 1,
    note: `standard error of the mean response at t* = ${formatNumber(prediction.tStar)} s${dof === undefined ? '' : `, ${dof} degrees of freedom`}`,
  };
}

export interface CombineOptions {
  coverageFactor?: number;
  /** 2 Σ c_i c_j r_ij u_i u_j, in unit²; default 0. */
  covarianceTerm?: number;
}

/** Combines budget lines in quadrature into a budget table with k·u_c. */
export function combineBudget(value: number, unit: string, components: ComponentInput[], options: CombineOptions = {}): UncertaintyBudget {
  const k = options.coverageFactor ?? DEFAULT_COVERAGE_FACTOR;
  assertFiniteNumber(k, 'coverage factor');
  if (k <= 0) throw new AnalysisError(`coverage factor must be above 0, got ${k}`);
  const covarianceTerm = options.covarianceTerm ?? 0;
  assertFiniteNumber(covarianceTerm, 'covariance term');
  let variance = covarianceTerm;
  const lines: BudgetComponent[] = components.map((c) => {
    assertFiniteNumber(c.value, `${c.name}: value`);
    assertFiniteNumber(c.divisor, `${c.name}: divisor`);
    assertFiniteNumber(c.sensitivity, `${c.name}: sensitivity coefficient`);
    if (c.divisor <= 0) throw new AnalysisError(`${c.name}: divisor must be above 0, got ${c.divisor}`);
    const u = c.value / c.divisor;
    const contribution = Math.abs(c.sensitivity) * u;
    variance += contribution * contribution;
    return {
      name: c.name,
      sourceId: c.sourceId ?? null,
      value: c.value,
      unit: c.unit,
      distribution: c.distribution,
      divisor: c.divisor,
      standardUncertainty: u,
      sensitivity: c.sensitivity,
      contribution,
      percentOfVariance: 0,
      ...(c.note === undefined ? {} : { note: c.note }),
    };
  });
  if (variance < 0) {
    // Full correlation can cancel exactly (ΔT from one pair of correlated thermometers); rounding
    // then leaves a tiny negative remainder, which is zero. Anything larger is a real error.
    const scale = variance - 2 * covarianceTerm;
    if (-variance > 1e-9 * scale) {
      throw new AnalysisError('the combined variance came out negative; check the correlation coefficients (each must lie in −1…1)');
    }
    variance = 0;
  }
  for (const line of lines) line.percentOfVariance = variance > 0 ? (100 * line.contribution * line.contribution) / variance : 0;
  const uc = Math.sqrt(variance);
  const expanded = k * uc;
  return {
    value,
    unit,
    components: lines,
    covarianceTerm,
    combinedStandardUncertainty: uc,
    coverageFactor: k,
    expandedUncertainty: expanded,
    relativeExpandedPercent: value === 0 ? null : (100 * expanded) / Math.abs(value),
  };
}

/** Short number for notes: up to 6 significant digits, no trailing zeros. */
export function formatNumber(x: number): string {
  if (!Number.isFinite(x)) return String(x);
  return String(Number(x.toPrecision(6)));
}
