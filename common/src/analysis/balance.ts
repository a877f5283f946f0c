// Balance checks: streams in against streams out, as the closure ratio R = Σout / Σin, for mass
// flow and for energy (ṁ·h, air as an ideal gas). Each stream's value comes from its own run at its
// own t*, with its uncertainty split by source. A source that appears in several streams (one
// meter moved from port to port, one calibration factor) is one fully correlated component: its
// effects on R are added with their signs before squaring (GUM 5.2.2 with r = 1), so a relative
// error common to every stream cancels in R, as it should. The verdict is |R − 1| ≤ U_R (the
// normalised error E_n = |R − 1| / U_R ≤ 1). First-order propagation (GUM 5.1.2).
import type {
  BalanceResult,
  BalanceSide,
  ClosureBudgetLine,
  EnergyStream,
  EnthalpyModel,
  MassStream,
  MeasuredValue,
  SourceEffect,
  UncertaintyBudget,
} from '../types/analysis';
import { linearConversion } from '../units/units';
import { AIR_ENTHALPY_H_KJ_PER_KG, AIR_ENTHALPY_T_K } from './air-enthalpy-table';
import { AnalysisError, assertFiniteNumber, describeValue } from './errors';
import { DEFAULT_COVERAGE_FACTOR, formatNumber } from './uncertainty';

/** ASHRAE Handbook—Fundamentals (2017) ch. 1: dry-air h = 1.006·t kJ/kg, t in °C. */
export const DEFAULT_AIR_CP = 1006;

// ── Enthalpy ────────────────────────────────────────────────────────────────────────────────

/** Index of the table segment holding T (K); AnalysisError outside the table. */
function tableSegment(temperatureK: number): number {
  const T = AIR_ENTHALPY_T_K;
  const n = T.length;
  if (!(temperatureK >= T[0] && temperatureK <= T[n - 1])) {
    throw new AnalysisError(
      `${formatNumber(temperatureK)} K (${formatNumber(temperatureK - 273.15)} °C) is outside the air enthalpy table (${T[0]}–${T[n - 1]} K); use constant cp for this balance`,
    );
  }
  let a = 0;
  let b = n - 1;
  while (b - a > 1) {
    const mid = (a + b) >> 1;
    if (T[mid] <= temperatureK) a = mid;
    else b = mid;
  }
  return a;
}

/** h(T) of dry air, kJ/kg (h = 0 at 0 K), by linear interpolation in the ideal-gas table. */
export function airEnthalpyFromTable(temperatureK: number): number {
  assertFiniteNumber(temperatureK, 'temperature');
  const i = tableSegment(temperatureK);
  const T = AIR_ENTHALPY_T_K;
  const h = AIR_ENTHALPY_H_KJ_PER_KG;
  return h[i] + ((h[i + 1] - h[i]) / (T[i + 1] - T[i])) * (temperatureK - T[i]);
}

/** dh/dT of the interpolated table at T, kJ/(kg K) (the segment's slope, right-hand on a knot). */
export function airEnthalpyTableSlope(temperatureK: number): number {
  assertFiniteNumber(temperatureK, 'temperature');
  const i = tableSegment(temperatureK);
  return (AIR_ENTHALPY_H_KJ_PER_KG[i + 1] - AIR_ENTHALPY_H_KJ_PER_KG[i]) / (AIR_ENTHALPY_T_K[i + 1] - AIR_ENTHALPY_T_K[i]);
}

export interface EnthalpyFunction {
  /** J/kg at T in K. */
  h: (temperatureK: number) => number;
  /** dh/dT, J/(kg K). */
  dh: (temperatureK: number) => number;
  description: string;
}

/** h(T) and dh/dT in J/kg for a model; one model serves every stream of a balance. */
export function enthalpyFunction(model: EnthalpyModel): EnthalpyFunction {
  if (!model || typeof model !== 'object') throw new AnalysisError('the enthalpy model is missing; choose constant cp or the ideal-gas table');
  if (model.kind === 'constant-cp') {
    const cp = model.cp ?? DEFAULT_AIR_CP;
    assertFiniteNumber(cp, 'cp');
    if (cp <= 0) throw new AnalysisError(`cp must be above 0 J/(kg K), got ${cp}`);
    const refC = model.referenceTemperatureC ?? 0;
    assertFiniteNumber(refC, 'reference temperature');
    const refK = refC + 273.15;
    return { h: (T) => cp * (T - refK), dh: () => cp, description: `h = ${cp} J/(kg K) × (T − ${formatNumber(refC)} °C)` };
  }
  if (model.kind === 'ideal-gas-table') {
    return {
      h: (T) => 1000 * airEnthalpyFromTable(T),
      dh: (T) => 1000 * airEnthalpyTableSlope(T),
      description: 'h(T) of dry air, ideal-gas table (h = 0 at 0 K), interpolated',
    };
  }
  throw new AnalysisError(`unknown enthalpy model "${String((model as { kind?: unknown }).kind)}"; use constant-cp or ideal-gas-table`);
}

// ── Measured values ─────────────────────────────────────────────────────────────────────────

/**
 * A stable value's budget as a measured value for a balance: each line's effect is its signed
 * contribution c·u, its source id carried over (lines without one stay independent).
 */
export function measuredFromBudget(budget: UncertaintyBudget): MeasuredValue {
  return {
    value: budget.value,
    unit: budget.unit,
    components: budget.components.map((c) => ({ sourceId: c.sourceId, name: c.name, effect: c.sensitivity * c.standardUncertainty })),
  };
}

/** Effects keyed by source; independent components get a key of their own. */
type Effects = Map<string, { sourceId: string | null; name: string; effect: number }>;

function addEffects(into: Effects, components: readonly SourceEffect[] | undefined, scale: number, owner: string): void {
  (components ?? []).forEach((c, index) => {
    if (!c || typeof c !== 'object') throw new AnalysisError(`${owner}: uncertainty component ${index + 1} is missing`);
    assertFiniteNumber(c.effect, `${owner}: effect of "${c.name}"`);
    const shared = typeof c.sourceId === 'string' && c.sourceId !== '';
    const key = shared ? `s:${c.sourceId}` : `i:${owner}#${index}:${c.name}`;
    const entry = into.get(key);
    if (entry) entry.effect += scale * c.effect;
    else into.set(key, { sourceId: shared ? (c.sourceId as string) : null, name: c.name, effect: scale * c.effect });
  });
}

function checkMeasured(value: MeasuredValue | null | undefined, what: string): MeasuredValue {
  if (!value || typeof value !== 'object') throw new AnalysisError(`${what} is missing`);
  assertFiniteNumber(value.value, what);
  if (typeof value.unit !== 'string' || value.unit.trim() === '') throw new AnalysisError(`${what} has no unit`);
  if (!Array.isArray(value.components)) throw new AnalysisError(`${what}: components must be a list (may be empty)`);
  return value;
}

/** Scale to convert a value (and its effects) to `to`; refuses units with an offset. */
function scaleTo(unit: string, to: string, what: string): number {
  let conversion;
  try {
    conversion = linearConversion(unit, to);
  } catch (error) {
    throw new AnalysisError(`${what}: ${(error as Error).message}`);
  }
  return conversion.scale;
}

// ── Closure ─────────────────────────────────────────────────────────────────────────────────

interface Term {
  id: string;
  label: string;
  side: BalanceSide;
  value: number;
  effects: Effects;
}

function checkStreams(streams: readonly { id: string; label: string; side: BalanceSide }[]): void {
  if (!Array.isArray(streams)) throw new AnalysisError('the balance needs a list of streams');
  const ids = new Set<string>();
  for (const s of streams) {
    if (!s || typeof s.id !== 'string' || s.id === '') throw new AnalysisError('every stream needs an id');
    if (ids.has(s.id)) throw new AnalysisError(`stream id "${s.id}" is used twice`);
    ids.add(s.id);
    if (s.side !== 'in' && s.side !== 'out') throw new AnalysisError(`stream "${s.label ?? s.id}": side must be "in" or "out", got ${describeValue(s.side)}`);
  }
  if (!streams.some((s) => s.side === 'in')) throw new AnalysisError('the balance has no stream in; add at least one');
  if (!streams.some((s) => s.side === 'out')) throw new AnalysisError('the balance has no stream out; add at least one');
}

function closure(kind: 'mass' | 'energy', unit: string, terms: Term[], coverageFactor: number): BalanceResult {
  assertFiniteNumber(coverageFactor, 'coverage factor');
  if (coverageFactor <= 0) throw new AnalysisError(`coverage factor must be above 0, got ${coverageFactor}`);
  let sumIn = 0;
  let sumOut = 0;
  for (const t of terms) {
    if (t.side === 'in') sumIn += t.value;
    else sumOut += t.value;
  }
  if (!(sumIn > 0)) {
    throw new AnalysisError(
      `the streams in add up to ${formatNumber(sumIn)} ${unit}; the closure Σout/Σin needs a positive total in (check the sides and signs of the streams)`,
    );
  }
  const ratio = sumOut / sumIn;
  // ∂R/∂E = 1/Σin for a stream out, −R/Σin for a stream in; a source's effects add with sign.
  const bySource = new Map<string, ClosureBudgetLine>();
  for (const t of terms) {
    const dR = t.side === 'out' ? 1 / sumIn : -ratio / sumIn;
    for (const [key, e] of t.effects) {
      const line = bySource.get(key);
      if (line) {
        line.effect += dR * e.effect;
        if (!line.streams.includes(t.id)) line.streams.push(t.id);
      } else {
        bySource.set(key, { sourceId: e.sourceId, name: e.name, streams: [t.id], effect: dR * e.effect, percentOfVariance: 0 });
      }
    }
  }
  const budget = [...bySource.values()];
  let variance = 0;
  for (const line of budget) variance += line.effect * line.effect;
  for (const line of budget) line.percentOfVariance = variance > 0 ? (100 * line.effect * line.effect) / variance : 0;
  budget.sort((a, b) => b.percentOfVariance - a.percentOfVariance);
  const u = Math.sqrt(variance);
  const U = coverageFactor * u;
  const deviation = Math.abs(ratio - 1);
  return {
    kind,
    sumIn,
    sumOut,
    unit,
    terms: terms.map(({ id, label, side, value }) => ({ id, label, side, value })),
    ratio,
    closurePercent: (ratio - 1) * 100,
    standardUncertainty: u,
    coverageFactor,
    expandedUncertainty: U,
    expandedUncertaintyPercent: U * 100,
    normalisedError: U > 0 ? deviation / U : deviation === 0 ? 0 : Infinity,
    pass: deviation <= U,
    budget,
  };
}

export interface BalanceOptions {
  /** Default 2. */
  coverageFactor?: number;
}

/** Mass closure R = Σṁ_out / Σṁ_in, every stream converted to kg/s. */
export function massBalance(streams: readonly MassStream[], options: BalanceOptions = {}): BalanceResult {
  checkStreams(streams);
  const terms = streams.map((s): Term => {
    const what = `stream "${s.label ?? s.id}" mass flow`;
    const m = checkMeasured(s.massFlow, what);
    const k = scaleTo(m.unit, 'kg/s', what);
    const effects: Effects = new Map();
    addEffects(effects, m.components, k, s.id);
    return { id: s.id, label: s.label ?? s.id, side: s.side, value: k * m.value, effects };
  });
  return closure('mass', 'kg/s', terms, options.coverageFactor ?? DEFAULT_COVERAGE_FACTOR);
}

function temperatureK(value: MeasuredValue, what: string): { T: number; scale: number } {
  let conversion;
  try {
    conversion = linearConversion(value.unit, 'K');
  } catch (error) {
    throw new AnalysisError(`${what}: ${(error as Error).message}`);
  }
  // Effects are differences of temperature: scale only, no offset.
  return { T: conversion.scale * value.value + conversion.offset, scale: conversion.scale };
}

/**
 * Energy closure over terms ṁ·h(T) (or ṁ·(h(T) − h(T_minus)) for a stream's heat duty), in W.
 * One enthalpy model for every stream, so all share one reference state. With port terms (no
 * T_minus) the ratio depends on that reference state; duty terms do not.
 */
export function energyBalance(streams: readonly EnergyStream[], model: EnthalpyModel, options: BalanceOptions = {}): BalanceResult {
  checkStreams(streams);
  const enthalpy = enthalpyFunction(model);
  const terms = streams.map((s): Term => {
    const name = `stream "${s.label ?? s.id}"`;
    const m = checkMeasured(s.massFlow, `${name} mass flow`);
    const km = scaleTo(m.unit, 'kg/s', `${name} mass flow`);
    const mDot = km * m.value;
    const t1 = checkMeasured(s.temperature, `${name} temperature`);
    const a = temperatureK(t1, `${name} temperature`);
    let dh = enthalpy.h(a.T);
    const effects: Effects = new Map();
    addEffects(effects, t1.components, mDot * enthalpy.dh(a.T) * a.scale, s.id);
    if (s.minusTemperature) {
      const t2 = checkMeasured(s.minusTemperature, `${name} second temperature`);
      const b = temperatureK(t2, `${name} second temperature`);
      dh -= enthalpy.h(b.T);
      addEffects(effects, t2.components, -mDot * enthalpy.dh(b.T) * b.scale, s.id);
    }
    addEffects(effects, m.components, km * dh, s.id);
    return { id: s.id, label: s.label ?? s.id, side: s.side, value: mDot * dh, effects };
  });
  return closure('energy', 'W', terms, options.coverageFactor ?? DEFAULT_COVERAGE_FACTOR);
}
