// A calibration chain while someone edits it: the wire's CalibrationChain with numbers that may
// still be missing (NaN). The common compiler then names the missing number in its message, so
// the editor needs no validation of its own.
import type { CalibrationStep, StandardConditionId, StatedUncertainty } from '@dialsheet/common';

export type StepKind = CalibrationStep['kind'];

export const STEP_KINDS: Array<{ value: StepKind; label: string }> = [
  { value: 'linear', label: 'Linear y = a·x + b' },
  { value: 'two-point', label: 'Two points' },
  { value: 'table', label: 'Table (piecewise linear)' },
  { value: 'unit', label: 'Change of unit' },
  { value: 'standard-to-mass', label: 'Standard flow → mass flow' },
];

export const STANDARD_CONDITION_OPTIONS: Array<{ value: StandardConditionId | 'custom'; label: string }> = [
  { value: '0C', label: '0 °C, 101.325 kPa' },
  { value: '20C', label: '20 °C, 101.325 kPa' },
  { value: '21.1C', label: '21.1 °C (70 °F), 101.325 kPa' },
  { value: '25C', label: '25 °C, 101.325 kPa' },
  { value: 'custom', label: 'Custom temperature and pressure' },
];

/** A new step of a kind, taking over the units of the step it replaces (or follows). */
export function newStep(kind: StepKind, inputUnit: string, outputUnit = '', keep?: Pick<CalibrationStep, 'label' | 'uncertainty'>): CalibrationStep {
  const base = { inputUnit, outputUnit, label: keep?.label ?? null, uncertainty: keep?.uncertainty ?? null };
  switch (kind) {
    case 'linear':
      return { ...base, kind, a: NaN, b: 0 };
    case 'two-point':
      return { ...base, kind, points: [{ raw: NaN, eng: NaN }, { raw: NaN, eng: NaN }] };
    case 'table':
      return { ...base, kind, points: [{ raw: NaN, eng: NaN }, { raw: NaN, eng: NaN }], allowExtrapolation: false };
    case 'unit':
      return { ...base, kind };
    case 'standard-to-mass':
      return { ...base, kind, outputUnit: outputUnit || 'g/min', standardConditions: '21.1C' };
  }
}

export function newUncertainty(): StatedUncertainty {
  return { basis: 'relative', value: NaN, distribution: 'rectangular', k: null, sourceId: null, label: null };
}

/** The output unit of the last step, or the display's unit for an empty chain. */
export function chainUnit(steps: readonly CalibrationStep[], rawUnit: string): string {
  return steps.length > 0 ? steps[steps.length - 1].outputUnit : rawUnit;
}

/** One line per step for a table cell, e.g. "linear V → L/min · standard-to-mass L/min → g/min". */
export function describeChain(steps: readonly CalibrationStep[]): string {
  return steps.map((s) => `${s.kind} ${s.inputUnit} → ${s.outputUnit}`).join(' · ');
}
