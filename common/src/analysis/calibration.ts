// Calibration chains: a raw display value becomes an engineering value through a list of steps,
// each with its input and output unit and, where it has one, its own uncertainty. Example: a panel
// voltmeter shows 0–5 V from a thermal mass-flow meter → standard L/min (meter span × bypass
// ratio) → g/min (air density at the meter's standard conditions).
//
// Every step is a function y = f(x) with a known derivative f'(x). The uncertainty of the chain's
// output follows the GUM's law of propagation (JCGM 100:2008, 5.1.2): a step's own uncertainty,
// stated on its output, reaches the end multiplied by the derivatives of the steps after it; the
// raw reading's uncertainty is multiplied by the derivatives of all steps.
import type { CalibrationChain, CalibrationPoint, CalibrationStep, LinearStep, TableStep, UncertaintyBudget } from '../types/analysis';
import { standardFlowToMassFactor, resolveStandardConditions } from '../units/standard-flow';
import { linearConversion, toLibraryUnit, UnitError } from '../units/units';
import { AnalysisError, assertFiniteNumber, describeValue } from './errors';
import { combineBudget, formatNumber, statedComponent, type CombineOptions, type ComponentInput } from './uncertainty';

export interface CompiledStep {
  index: number;
  label: string;
  step: CalibrationStep;
  inputUnit: string;
  outputUnit: string;
  apply: (x: number) => number;
  derivative: (x: number) => number;
}

export interface CompiledChain {
  rawUnit: string;
  unit: string;
  steps: CompiledStep[];
  /** Raw → engineering value. */
  apply: (x: number) => number;
  /** d(engineering)/d(raw) at x. */
  derivative: (x: number) => number;
  /** True when every step is a straight line (the chain is y = a·x + b). */
  linear: boolean;
}

/** a and b of the line through two (raw, eng) pairs. */
export function twoPointToLinear(p1: CalibrationPoint, p2: CalibrationPoint, what = 'two-point calibration'): { a: number; b: number } {
  for (const [p, name] of [
    [p1, 'first'],
    [p2, 'second'],
  ] as const) {
    if (!p || typeof p !== 'object') throw new AnalysisError(`${what}: the ${name} point is missing`);
    assertFiniteNumber(p.raw, `${what}: ${name} point raw value`);
    assertFiniteNumber(p.eng, `${what}: ${name} point engineering value`);
  }
  if (p1.raw === p2.raw) {
    throw new AnalysisError(`${what}: both points have the raw value ${p1.raw}; the two raw values must differ`);
  }
  const a = (p2.eng - p1.eng) / (p2.raw - p1.raw);
  return { a, b: p1.eng - a * p1.raw };
}

/**
 * A linear step for an instrument with a scaled analogue output, e.g. a 0–175 standard L/min
 * meter with 0–5 V out: signal [0, 5] V ↔ range [0, 175] L/min, times `multiplier` for a bypass
 * that passes that many times the metered flow (the total is multiplier × metered).
 */
export function scaledOutputStep(options: {
  signal: [number, number];
  range: [number, number];
  multiplier?: number;
  inputUnit: string;
  outputUnit: string;
  label?: string;
  uncertainty?: LinearStep['uncertainty'];
}): LinearStep {
  const m = options.multiplier ?? 1;
  assertFiniteNumber(m, 'multiplier');
  if (m <= 0) throw new AnalysisError(`multiplier (bypass ratio) must be above 0, got ${m}`);
  const { a, b } = twoPointToLinear(
    { raw: options.signal[0], eng: options.range[0] * m },
    { raw: options.signal[1], eng: options.range[1] * m },
    options.label ?? 'scaled output',
  );
  return {
    kind: 'linear',
    a,
    b,
    inputUnit: options.inputUnit,
    outputUnit: options.outputUnit,
    label: options.label ?? null,
    uncertainty: options.uncertainty ?? null,
  };
}

const STEP_KINDS: ReadonlyArray<CalibrationStep['kind']> = ['linear', 'two-point', 'table', 'unit', 'standard-to-mass'];

function stepLabel(step: CalibrationStep, index: number): string {
  return step.label ? `step ${index + 1} (${step.label})` : `step ${index + 1} (${step.kind}, ${step.inputUnit} → ${step.outputUnit})`;
}

function line(a: number, b: number): Pick<CompiledStep, 'apply' | 'derivative'> {
  return { apply: (x) => a * x + b, derivative: () => a };
}

/**
 * Piecewise linear through sorted points. A value on a knot takes the segment to its right (the
 * last knot the last segment), so the derivative is defined everywhere. Outside the table: a clear
 * error, unless extrapolation is allowed — then the end segments carry on.
 */
function compileTable(step: TableStep, label: string): Pick<CompiledStep, 'apply' | 'derivative'> {
  const points = step.points;
  if (!Array.isArray(points) || points.length < 2) {
    throw new AnalysisError(`${label}: a calibration table needs at least 2 points, got ${Array.isArray(points) ? points.length : 'none'}`);
  }
  const n = points.length;
  const raw = new Float64Array(n);
  const eng = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const p = points[i];
    assertFiniteNumber(p?.raw, `${label}: point ${i + 1} raw value`);
    assertFiniteNumber(p?.eng, `${label}: point ${i + 1} engineering value`);
    raw[i] = p.raw;
    eng[i] = p.eng;
    if (i > 0 && !(raw[i] > raw[i - 1])) {
      throw new AnalysisError(
        `${label}: raw values must strictly increase down the table; point ${i + 1} (${raw[i]}) is not above point ${i} (${raw[i - 1]}). Sort the table and remove repeated raw values`,
      );
    }
  }
  const slopes = new Float64Array(n - 1);
  for (let i = 0; i < n - 1; i++) slopes[i] = (eng[i + 1] - eng[i]) / (raw[i + 1] - raw[i]);
  const allow = step.allowExtrapolation === true;
  const lo = raw[0];
  const hi = raw[n - 1];
  const segment = (x: number): number => {
    if (!(x >= lo && x <= hi) && !allow) {
      throw new AnalysisError(
        `${label}: raw value ${formatNumber(x)} ${step.inputUnit} is outside the calibration table (${formatNumber(lo)}–${formatNumber(hi)} ${step.inputUnit}); extend the table or allow extrapolation on this step`,
      );
    }
    if (x <= lo) return 0;
    if (x >= hi) return n - 2;
    let a = 0;
    let b = n - 1;
    while (b - a > 1) {
      const mid = (a + b) >> 1;
      if (raw[mid] <= x) a = mid;
      else b = mid;
    }
    return a;
  };
  return {
    apply: (x) => {
      const i = segment(x);
      return eng[i] + slopes[i] * (x - raw[i]);
    },
    derivative: (x) => slopes[segment(x)],
  };
}

function compileStep(step: CalibrationStep, index: number): CompiledStep {
  if (!step || typeof step !== 'object') throw new AnalysisError(`step ${index + 1} is missing`);
  if (!STEP_KINDS.includes(step.kind)) {
    throw new AnalysisError(`step ${index + 1}: unknown kind "${describeValue(step.kind)}"; use ${STEP_KINDS.join(', ')}`);
  }
  const label = stepLabel(step, index);
  if (typeof step.inputUnit !== 'string' || step.inputUnit.trim() === '') throw new AnalysisError(`${label}: the input unit is missing`);
  if (typeof step.outputUnit !== 'string' || step.outputUnit.trim() === '') throw new AnalysisError(`${label}: the output unit is missing`);
  let fn: Pick<CompiledStep, 'apply' | 'derivative'>;
  switch (step.kind) {
    case 'linear': {
      assertFiniteNumber(step.a, `${label}: gain a`);
      assertFiniteNumber(step.b, `${label}: offset b`);
      if (step.a === 0) throw new AnalysisError(`${label}: gain a must not be 0 (every reading would give ${step.b})`);
      fn = line(step.a, step.b);
      break;
    }
    case 'two-point': {
      if (!Array.isArray(step.points) || step.points.length !== 2) {
        throw new AnalysisError(`${label}: a two-point calibration needs exactly 2 (raw, eng) points`);
      }
      const { a, b } = twoPointToLinear(step.points[0], step.points[1], label);
      if (a === 0) throw new AnalysisError(`${label}: both points have the same engineering value; the line would be flat`);
      fn = line(a, b);
      break;
    }
    case 'table':
      fn = compileTable(step, label);
      break;
    case 'unit': {
      let conversion;
      try {
        conversion = linearConversion(step.inputUnit, step.outputUnit);
      } catch (error) {
        throw new AnalysisError(`${label}: ${(error as Error).message}`);
      }
      fn = line(conversion.scale, conversion.offset);
      break;
    }
    case 'standard-to-mass': {
      let factor;
      try {
        resolveStandardConditions(step.standardConditions);
        factor = standardFlowToMassFactor(step.inputUnit, step.outputUnit, step.standardConditions);
      } catch (error) {
        throw new AnalysisError(`${label}: ${(error as Error).message}`);
      }
      fn = line(factor, 0);
      break;
    }
    default:
      throw new AnalysisError(`step ${index + 1}: unknown kind "${describeValue((step as { kind?: unknown }).kind)}"`);
  }
  return { index, label, step, inputUnit: step.inputUnit, outputUnit: step.outputUnit, ...fn };
}

/** True when two spellings name the same unit (same library spelling, or a conversion of 1·x + 0). */
function sameUnit(a: string, b: string): boolean {
  if (toLibraryUnit(a) === toLibraryUnit(b)) return true;
  try {
    const c = linearConversion(a, b);
    return c.offset === 0 && Math.abs(c.scale - 1) < 1e-12;
  } catch (error) {
    if (error instanceof UnitError) return false;
    throw error;
  }
}

/**
 * Validates a chain once and returns fast functions for it. `rawUnit` (the channel's display
 * unit) is checked against the first step; consecutive steps must hand over the same unit.
 */
export function compileChain(chain: CalibrationChain | null | undefined, rawUnit?: string): CompiledChain {
  const steps = chain?.steps ?? [];
  if (!Array.isArray(steps)) throw new AnalysisError('a calibration chain needs a list of steps');
  const compiled = steps.map(compileStep);
  for (let i = 1; i < compiled.length; i++) {
    const before = compiled[i - 1];
    const after = compiled[i];
    if (!sameUnit(before.outputUnit, after.inputUnit)) {
      throw new AnalysisError(
        `${after.label} expects ${after.inputUnit} but ${before.label} gives ${before.outputUnit}; add a unit step between them or correct a unit`,
      );
    }
  }
  if (compiled.length === 0) {
    if (rawUnit === undefined) throw new AnalysisError('an empty calibration chain needs the raw unit');
    return { rawUnit, unit: rawUnit, steps: [], apply: (x) => x, derivative: () => 1, linear: true };
  }
  if (rawUnit !== undefined && !sameUnit(rawUnit, compiled[0].inputUnit)) {
    throw new AnalysisError(`${compiled[0].label} expects ${compiled[0].inputUnit} but the channel shows ${rawUnit}; the first step must take the display's unit`);
  }
  const linear = compiled.every((s) => s.step.kind !== 'table');
  let apply: (x: number) => number;
  let derivative: (x: number) => number;
  if (linear) {
    // Fold the straight lines into one: y = A·x + B (the bench converts 100 000 readings).
    let A = 1;
    let B = 0;
    for (const s of compiled) {
      const a = s.derivative(0);
      const b = s.apply(0);
      A = a * A;
      B = a * B + b;
    }
    apply = (x) => A * x + B;
    derivative = () => A;
  } else {
    apply = (x) => {
      let y = x;
      for (const s of compiled) y = s.apply(y);
      return y;
    };
    derivative = (x) => {
      let y = x;
      let d = 1;
      for (const s of compiled) {
        d *= s.derivative(y);
        y = s.apply(y);
      }
      return d;
    };
  }
  return { rawUnit: rawUnit ?? compiled[0].inputUnit, unit: compiled[compiled.length - 1].outputUnit, steps: compiled, apply, derivative, linear };
}

/** The engineering value of one raw value. */
export function evaluateChain(chain: CalibrationChain, raw: number, rawUnit?: string): number {
  assertFiniteNumber(raw, 'raw value');
  return compileChain(chain, rawUnit).apply(raw);
}

/** Every raw value through the chain, into a new (or the given) array. */
export function evaluateChainMany(compiled: CompiledChain, raw: ArrayLike<number>, out: Float64Array = new Float64Array(raw.length)): Float64Array {
  const f = compiled.apply;
  for (let i = 0; i < raw.length; i++) out[i] = f(raw[i]);
  return out;
}

export interface ChainEvaluation {
  raw: number;
  value: number;
  unit: string;
  /** d(engineering)/d(raw) at raw. */
  sensitivity: number;
  /** Each step's value on the way (step i's output), and its derivative d(end)/d(that output). */
  intermediate: Array<{ label: string; value: number; unit: string; sensitivityToEnd: number }>;
  /** The steps' own uncertainties as budget lines in the end unit's terms. */
  components: ComponentInput[];
}

/**
 * Evaluates the chain at one raw value and returns each step's own uncertainty as a budget line
 * whose sensitivity is ∂(end)/∂(that step's output) = the product of the later steps' derivatives.
 */
export function chainComponents(compiled: CompiledChain, raw: number): ChainEvaluation {
  assertFiniteNumber(raw, 'raw value');
  const n = compiled.steps.length;
  const outputs = new Array<number>(n);
  const local = new Array<number>(n);
  let y = raw;
  for (let i = 0; i < n; i++) {
    local[i] = compiled.steps[i].derivative(y);
    y = compiled.steps[i].apply(y);
    outputs[i] = y;
  }
  // toEnd[i] = ∂(end)/∂(output of step i) = Π_{j>i} local[j].
  const toEnd = new Array<number>(n);
  let d = 1;
  for (let i = n - 1; i >= 0; i--) {
    toEnd[i] = d;
    d *= local[i];
  }
  const components: ComponentInput[] = [];
  for (let i = 0; i < n; i++) {
    const s = compiled.steps[i];
    if (s.step.uncertainty) components.push(statedComponent(s.label, s.step.uncertainty, outputs[i], s.outputUnit, toEnd[i]));
  }
  return {
    raw,
    value: y,
    unit: compiled.unit,
    sensitivity: d,
    intermediate: compiled.steps.map((s, i) => ({ label: s.label, value: outputs[i], unit: s.outputUnit, sensitivityToEnd: toEnd[i] })),
    components,
  };
}

/**
 * The chain's output at `raw` with its budget: the raw value's own components (given in the raw
 * unit with sensitivity 1 to the raw value; they are rescaled by the chain's derivative) and each
 * step's uncertainty.
 */
export function propagateChain(
  chain: CalibrationChain,
  raw: number,
  rawComponents: ComponentInput[] = [],
  options: CombineOptions & { rawUnit?: string } = {},
): UncertaintyBudget {
  const compiled = compileChain(chain, options.rawUnit);
  const evaluation = chainComponents(compiled, raw);
  const scaled = rawComponents.map((c) => ({ ...c, sensitivity: c.sensitivity * evaluation.sensitivity }));
  return combineBudget(evaluation.value, compiled.unit, [...scaled, ...evaluation.components], options);
}
