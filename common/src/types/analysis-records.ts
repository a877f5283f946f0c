// What the server stores for the engineer's part and sends over the wire: each channel's
// calibration chain, derived channels, named stability rules, the series a chart draws, and named
// analyses (a stable value of one channel in one run, or a balance across runs) stored with the
// inputs they came from. The computation itself is in common/src/analysis.

import type {
  BalanceResult,
  BalanceSide,
  CalibrationChain,
  EnthalpyModel,
  StabilityRule,
  StabilityVerdict,
  StableValue,
  TimeWindow,
} from './analysis';

// ── Calibrations ─────────────────────────────────────────────────────────────────────────────

/** A channel's raw → engineering chain. A channel without one is used in its raw unit. */
export interface ChannelCalibration {
  channelId: string;
  chain: CalibrationChain;
  /** Output unit of the last step. */
  engineeringUnit: string;
  /** Starts at 1; a change must name the stored one (409 otherwise). */
  version: number;
  updatedAt: string;
  updatedBy: { id: string; displayName: string } | null;
}

/** PUT /api/channels/:channelId/calibration (Engineer). */
export interface SetCalibrationRequest {
  chain: CalibrationChain;
  /** The stored version when changing one; omitted for the first. */
  baseVersion?: number;
  reason?: string;
}

// ── Derived channels ─────────────────────────────────────────────────────────────────────────

/**
 * A value computed at each timestamp from other channels' engineering values by an expression
 * (mathjs parser, plain arithmetic only), e.g. heat rate "m * cp * (T2 - T1) / 60".
 */
export interface DerivedChannel {
  id: string;
  campaignId: string;
  name: string;
  /** Unique among the campaign's channel and derived-channel symbols. */
  symbol: string;
  unit: string;
  expression: string;
  /** Named numbers the expression may use, e.g. {cp: 1.006}. */
  constants: Record<string, number>;
  /** Channel symbols the expression uses. */
  inputs: string[];
  version: number;
  createdAt: string;
  updatedAt: string;
}

export interface CreateDerivedChannelRequest {
  name: string;
  symbol: string;
  unit: string;
  expression: string;
  constants?: Record<string, number>;
}

export interface UpdateDerivedChannelRequest extends Partial<CreateDerivedChannelRequest> {
  baseVersion: number;
  reason?: string;
}

// ── Stability rules ──────────────────────────────────────────────────────────────────────────

export interface StoredStabilityRule extends StabilityRule {
  id: string;
  campaignId: string;
  /** null: any channel of the campaign. */
  channelId: string | null;
  version: number;
  createdAt: string;
  updatedAt: string;
}

export interface CreateStabilityRuleRequest extends StabilityRule {
  channelId?: string | null;
}

export interface UpdateStabilityRuleRequest extends Partial<CreateStabilityRuleRequest> {
  baseVersion: number;
  reason?: string;
}

// ── Series (what a chart and a live preview use) ─────────────────────────────────────────────

/**
 * One channel (or derived channel) of one run over its sheets' timestamps: the resolved value
 * where both passes exist (the agreed value, or the resolution), the first pass alone marked
 * unchecked. Parallel arrays, ordered by t.
 */
export interface ChannelSeries {
  runId: string;
  /** A channel id or a derived channel id. */
  channelId: string;
  derived: boolean;
  symbol: string;
  rawUnit: string;
  /** Engineering unit (rawUnit when the channel has no calibration). */
  unit: string;
  /** Test time, s. */
  t: number[];
  /** Raw display values (for a derived channel: the computed values, equal to `value`). */
  raw: number[];
  /** Engineering values. */
  value: number[];
  unchecked: boolean[];
  uncheckedCount: number;
  /** Timestamps with no usable number (flagged unreadable/ambiguous, or an input missing). */
  skipped: Array<{ t: number; reason: string }>;
  /** Calibration version used; null without one. */
  calibrationVersion: number | null;
}

// ── Analyses ─────────────────────────────────────────────────────────────────────────────────

/** The stabilised value of one channel in one run at t*, with its fit, budget and verdict. */
export interface StableValueInput {
  runId: string;
  /** A channel id or a derived channel id. */
  channelId: string;
  window: TimeWindow;
  tStar: number;
  /** A stored rule to judge the window by; null: no verdict. */
  ruleId?: string | null;
  /** Default 0.95. */
  confidence?: number;
  /** Required when t* lies outside the fitted readings. */
  allowExtrapolation?: boolean;
  /** Default 2. */
  coverageFactor?: number;
  /** Default true. */
  includeResolution?: boolean;
}

export interface StableValueOutput {
  stable: StableValue;
  stability: StabilityVerdict | null;
}

/** One stream of a balance: each value a stable-value analysis of its own run at its own t*. */
export interface BalanceStreamInput {
  id: string;
  label: string;
  side: BalanceSide;
  /** Stable-value analysis of a mass flow. */
  massFlowAnalysisId: string;
  /** Stable-value analysis of the stream's temperature (needed for an energy balance). */
  temperatureAnalysisId?: string | null;
  /** Optional second temperature: the term becomes ṁ·(h(T) − h(T_minus)). */
  minusTemperatureAnalysisId?: string | null;
}

export interface BalanceInput {
  streams: BalanceStreamInput[];
  /** Compute an energy balance as well (every stream needs a temperature). */
  energy: boolean;
  enthalpyModel?: EnthalpyModel | null;
  /** Default 2. */
  coverageFactor?: number;
}

export interface BalanceOutput {
  mass: BalanceResult;
  energy: BalanceResult | null;
}

export type AnalysisKind = 'stable-value' | 'balance';

interface AnalysisBase {
  id: string;
  campaignId: string;
  /** Unique in the campaign. */
  name: string;
  note: string | null;
  /** Runs whose readings it used (for a balance, the runs of every stream). */
  runIds: string[];
  /**
   * 'current': the stored result was computed from the data as it is now. 'stale': readings,
   * resolutions, a calibration, a derived channel, a rule or an analysis it uses changed since;
   * the result is kept (and shown marked) until it is recomputed. 'failed': the last computation
   * was refused (`error` says why).
   */
  status: 'current' | 'stale' | 'failed';
  /** Why it is stale, e.g. "readings of run 3 changed". */
  staleReason: string | null;
  error: string | null;
  computedAt: string | null;
  computedBy: { id: string; displayName: string } | null;
  version: number;
  createdAt: string;
  updatedAt: string;
}

export interface StableValueAnalysis extends AnalysisBase {
  kind: 'stable-value';
  input: StableValueInput;
  result: StableValueOutput | null;
}

export interface BalanceAnalysis extends AnalysisBase {
  kind: 'balance';
  input: BalanceInput;
  result: BalanceOutput | null;
}

export type Analysis = StableValueAnalysis | BalanceAnalysis;

/** POST /api/campaigns/:campaignId/analyses (Engineer): computes and stores. */
export type CreateAnalysisRequest =
  | { kind: 'stable-value'; name: string; note?: string | null; input: StableValueInput }
  | { kind: 'balance'; name: string; note?: string | null; input: BalanceInput };

/** PUT /api/analyses/:analysisId (Engineer): new inputs, recomputed. */
export interface UpdateAnalysisRequest {
  baseVersion: number;
  name?: string;
  note?: string | null;
  input?: StableValueInput | BalanceInput;
  reason?: string;
}
