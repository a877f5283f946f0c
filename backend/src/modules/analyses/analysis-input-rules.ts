// Shape checks of a stored analysis's input, before the computation judges the numbers: a wrong
// type must be a 400 naming the field, not a TypeError deep in a fit.
import type { BalanceInput, StableValueInput } from '@dialsheet/common';
import { isUUID } from 'class-validator';
import { isPlainObject } from '../calibrations/analysis-input';

const isFiniteNumber = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v);
const optional = (v: unknown) => v === undefined || v === null;

export const MAX_BALANCE_STREAMS = 50;

export function stableValueInputProblems(input: unknown): string[] {
  if (!isPlainObject(input)) return ['input must be an object'];
  const p: string[] = [];
  if (typeof input.runId !== 'string' || !isUUID(input.runId)) p.push('input.runId must be a run id');
  if (typeof input.channelId !== 'string' || !isUUID(input.channelId)) p.push('input.channelId must be a channel or derived channel id');
  const w = input.window;
  if (!isPlainObject(w) || !isFiniteNumber(w.from) || !isFiniteNumber(w.to)) p.push('input.window must be {from, to} in seconds of test time');
  else if (!(w.from < w.to)) p.push(`input.window.from (${w.from} s) must be before input.window.to (${w.to} s)`);
  if (!isFiniteNumber(input.tStar)) p.push('input.tStar must be a number of seconds of test time');
  if (!optional(input.ruleId) && (typeof input.ruleId !== 'string' || !isUUID(input.ruleId))) p.push('input.ruleId must be a stability rule id or null');
  if (!optional(input.confidence) && !(isFiniteNumber(input.confidence) && input.confidence > 0 && input.confidence < 1)) {
    p.push('input.confidence must be a number between 0 and 1, e.g. 0.95');
  }
  if (!optional(input.coverageFactor) && !(isFiniteNumber(input.coverageFactor) && input.coverageFactor > 0)) p.push('input.coverageFactor must be a number above 0');
  for (const flag of ['allowExtrapolation', 'includeResolution'] as const) {
    if (!optional(input[flag]) && typeof input[flag] !== 'boolean') p.push(`input.${flag} must be true or false`);
  }
  return p;
}

/** Only the known fields, so a stored input is exactly the wire type. */
export function cleanStableValueInput(input: StableValueInput): StableValueInput {
  return {
    runId: input.runId,
    channelId: input.channelId,
    window: { from: input.window.from, to: input.window.to },
    tStar: input.tStar,
    ruleId: input.ruleId ?? null,
    ...(optional(input.confidence) ? {} : { confidence: input.confidence }),
    ...(optional(input.allowExtrapolation) ? {} : { allowExtrapolation: input.allowExtrapolation }),
    ...(optional(input.coverageFactor) ? {} : { coverageFactor: input.coverageFactor }),
    ...(optional(input.includeResolution) ? {} : { includeResolution: input.includeResolution }),
  };
}

export function balanceInputProblems(input: unknown): string[] {
  if (!isPlainObject(input)) return ['input must be an object'];
  const p: string[] = [];
  if (typeof input.energy !== 'boolean') p.push('input.energy must be true or false');
  if (!optional(input.coverageFactor) && !(isFiniteNumber(input.coverageFactor) && input.coverageFactor > 0)) p.push('input.coverageFactor must be a number above 0');
  if (!optional(input.enthalpyModel)) {
    const m = input.enthalpyModel;
    if (!isPlainObject(m) || (m.kind !== 'constant-cp' && m.kind !== 'ideal-gas-table')) p.push('input.enthalpyModel.kind must be constant-cp or ideal-gas-table');
    else if (m.kind === 'constant-cp') {
      if (!optional(m.cp) && !isFiniteNumber(m.cp)) p.push('input.enthalpyModel.cp must be a number of J/(kg K)');
      if (!optional(m.referenceTemperatureC) && !isFiniteNumber(m.referenceTemperatureC)) p.push('input.enthalpyModel.referenceTemperatureC must be a number of °C');
    }
  }
  if (!Array.isArray(input.streams) || input.streams.length === 0) {
    p.push('input.streams must list the streams in and out');
    return p;
  }
  if (input.streams.length > MAX_BALANCE_STREAMS) p.push(`input.streams holds ${input.streams.length} streams; at most ${MAX_BALANCE_STREAMS}`);
  input.streams.forEach((s: unknown, i: number) => {
    const at = `input.streams.${i}`;
    if (!isPlainObject(s)) {
      p.push(`${at} must be an object`);
      return;
    }
    if (typeof s.id !== 'string' || s.id.trim() === '') p.push(`${at}.id must be a non-empty text`);
    if (typeof s.label !== 'string') p.push(`${at}.label must be text`);
    if (s.side !== 'in' && s.side !== 'out') p.push(`${at}.side must be "in" or "out"`);
    if (typeof s.massFlowAnalysisId !== 'string' || !isUUID(s.massFlowAnalysisId)) p.push(`${at}.massFlowAnalysisId must be an analysis id`);
    for (const key of ['temperatureAnalysisId', 'minusTemperatureAnalysisId'] as const) {
      if (!optional(s[key]) && (typeof s[key] !== 'string' || !isUUID(s[key]))) p.push(`${at}.${key} must be an analysis id or null`);
    }
    if (input.energy === true && optional(s.temperatureAnalysisId)) p.push(`${at}.temperatureAnalysisId is needed for an energy balance`);
  });
  return p;
}

export function cleanBalanceInput(input: BalanceInput): BalanceInput {
  return {
    streams: input.streams.map((s) => ({
      id: s.id,
      label: s.label,
      side: s.side,
      massFlowAnalysisId: s.massFlowAnalysisId,
      temperatureAnalysisId: s.temperatureAnalysisId ?? null,
      minusTemperatureAnalysisId: s.minusTemperatureAnalysisId ?? null,
    })),
    energy: input.energy,
    enthalpyModel: input.enthalpyModel ?? null,
    ...(optional(input.coverageFactor) ? {} : { coverageFactor: input.coverageFactor }),
  };
}
