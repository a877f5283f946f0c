// Property-based fuzzing of calibration chains (issue 7, bad input). A chain arrives as JSON from
// the calibration editor or a hand-made API call; compiling it must either succeed or fail with a
// typed error whose message the server can return as a 400 (AnalysisError, or UnitError for a
// unit nobody can read), never a TypeError from deep inside. Chains that compile must obey the
// algebra of straight lines: composition of y = a·x + b (textbook algebra), the inverse line
// x = (y − b)/a, the two-point line through its points, and table interpolation between knots
// (linear interpolation, common practice).
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { CalibrationChain, CalibrationStep, LinearStep } from '../types/analysis';
import { UnitError } from '../units/units';
import { chainComponents, compileChain, evaluateChain } from './calibration';
import { AnalysisError } from './errors';

const UNITS = ['V', 'mV', 'mA', 'A', 'kPa', 'Pa', 'bar', 'degC', '°C', 'K', 'degF', 'L/min', 'SLPM', 'sccm', 'g/min', 'kg/s', 'm^3/h', 'W', 'kW'];
const unitArb = fc.oneof(
  { weight: 4, arbitrary: fc.constantFrom(...UNITS) },
  { weight: 1, arbitrary: fc.string({ maxLength: 12 }) },
  { weight: 1, arbitrary: fc.constantFrom('', ' ', '5 V', 'V/0', 'foo', '<b>', '__proto__', 'constructor', 'm^', '1e400 K') },
  { weight: 1, arbitrary: fc.anything() },
);
const numberArb = fc.oneof(
  { weight: 4, arbitrary: fc.double() },
  { weight: 1, arbitrary: fc.constantFrom(0, -0, Number.NaN, Infinity, -Infinity, 1e308, -1e308, 5e-324) },
  { weight: 1, arbitrary: fc.anything() },
);
const pointArb = fc.oneof(
  { weight: 5, arbitrary: fc.record({ raw: numberArb, eng: numberArb }) },
  { weight: 1, arbitrary: fc.anything() },
);
const stepArb = fc.oneof(
  {
    weight: 3,
    arbitrary: fc.record(
      {
        kind: fc.constantFrom('linear', 'two-point', 'table', 'unit', 'standard-to-mass', 'polynomial', '', 'LINEAR'),
        a: numberArb,
        b: numberArb,
        points: fc.oneof(fc.array(pointArb, { maxLength: 6 }), fc.anything()),
        inputUnit: unitArb,
        outputUnit: unitArb,
        label: fc.option(fc.string({ maxLength: 20 })),
        allowExtrapolation: fc.oneof(fc.boolean(), fc.anything()),
        standardConditions: fc.oneof(
          fc.constantFrom('0C', '20C', '21.1C', '25C', 'STP', ''),
          fc.record({ temperatureC: numberArb, pressureKPa: numberArb }),
          fc.anything(),
        ),
        uncertainty: fc.constant(null),
      },
      { requiredKeys: ['kind'] },
    ),
  },
  { weight: 1, arbitrary: fc.anything() },
);
const chainArb = fc.oneof(
  { weight: 6, arbitrary: fc.record({ steps: fc.array(stepArb, { maxLength: 4 }) }) },
  { weight: 1, arbitrary: fc.record({ steps: fc.anything() }) },
  { weight: 1, arbitrary: fc.anything() },
);

/** Whether `error` is one of the typed errors the server turns into a 400 with its message. */
function isTyped(error: unknown): boolean {
  return (error instanceof AnalysisError || error instanceof UnitError) && error.message.trim().length > 0;
}

function rethrowUntyped(fn: () => void): void {
  try {
    fn();
  } catch (error) {
    if (!isTyped(error)) throw new Error(`untyped error: ${String(error)}`, { cause: error });
  }
}

describe('calibration chains fuzz: arbitrary chains never throw an untyped error', () => {
  it('compiling, evaluating and propagating any JSON-shaped chain gives a result or a typed error', () => {
    fc.assert(
      fc.property(chainArb, fc.option(unitArb, { nil: undefined }), numberArb, (chain, rawUnit, raw) => {
        rethrowUntyped(() => {
          const compiled = compileChain(chain as CalibrationChain, rawUnit as string | undefined);
          expect(typeof compiled.apply).toBe('function');
          expect(compiled.steps.length).toBe((chain as CalibrationChain | null)?.steps?.length ?? 0);
          const evaluation = chainComponents(compiled, raw as number);
          expect(typeof evaluation.value).toBe('number');
        });
        rethrowUntyped(() => void evaluateChain(chain as CalibrationChain, raw as number, rawUnit as string | undefined));
      }),
      { numRuns: 3000 },
    );
  });

  it('a non-finite raw value is refused with an AnalysisError, whatever the chain', () => {
    const chain: CalibrationChain = { steps: [{ kind: 'linear', a: 2, b: 1, inputUnit: 'V', outputUnit: 'kPa' }] };
    for (const raw of [Number.NaN, Infinity, -Infinity, '1' as unknown as number, null as unknown as number]) {
      expect(() => evaluateChain(chain, raw)).toThrow(AnalysisError);
    }
  });
});

const finite = (min: number, max: number) => fc.double({ min, max, noNaN: true, noDefaultInfinity: true });
const gain = fc.oneof(finite(-1e3, -1e-3), finite(1e-3, 1e3));
const offset = finite(-1e3, 1e3);
const rawValue = finite(-1e3, 1e3);

function linear(a: number, b: number, inputUnit: string, outputUnit: string): LinearStep {
  return { kind: 'linear', a, b, inputUnit, outputUnit };
}

/** Relative closeness for doubles after a handful of multiplications (a few ulps per operation). */
function expectClose(actual: number, expected: number, scale: number): void {
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(scale)));
}

describe('calibration chains fuzz: straight lines obey their algebra', () => {
  it('two linear steps compose: a2·(a1·x + b1) + b2, with derivative a1·a2', () => {
    fc.assert(
      fc.property(gain, offset, gain, offset, rawValue, (a1, b1, a2, b2, x) => {
        const compiled = compileChain({ steps: [linear(a1, b1, 'V', 'mA'), linear(a2, b2, 'mA', 'kPa')] }, 'V');
        expect(compiled.linear).toBe(true);
        const expected = a2 * (a1 * x + b1) + b2;
        expectClose(compiled.apply(x), expected, Math.abs(a2 * a1 * x) + Math.abs(a2 * b1) + Math.abs(b2));
        expectClose(compiled.derivative(x), a1 * a2, a1 * a2);
        expect(compiled.unit).toBe('kPa');
      }),
      { numRuns: 1000 },
    );
  });

  it('a line followed by its inverse x = (y − b)/a is the identity', () => {
    fc.assert(
      fc.property(gain, offset, rawValue, (a, b, x) => {
        const compiled = compileChain({ steps: [linear(a, b, 'V', 'kPa'), linear(1 / a, -b / a, 'kPa', 'V')] }, 'V');
        expectClose(compiled.apply(x), x, Math.abs(x) + Math.abs(b / a));
        expectClose(compiled.derivative(x), 1, 1);
      }),
      { numRuns: 1000 },
    );
  });

  it('a two-point step passes through both of its points and equals the linear step it implies', () => {
    fc.assert(
      fc.property(rawValue, rawValue, offset, offset, rawValue, (r1, r2, e1, e2, x) => {
        fc.pre(Math.abs(r1 - r2) > 1e-3 && Math.abs(e1 - e2) > 1e-3);
        const step: CalibrationStep = { kind: 'two-point', points: [{ raw: r1, eng: e1 }, { raw: r2, eng: e2 }], inputUnit: 'mA', outputUnit: 'kPa' };
        const compiled = compileChain({ steps: [step] });
        const span = Math.abs(e1) + Math.abs(e2) + Math.abs(((e2 - e1) / (r2 - r1)) * (Math.abs(r1) + Math.abs(r2)));
        expectClose(compiled.apply(r1), e1, span);
        expectClose(compiled.apply(r2), e2, span);
        const a = (e2 - e1) / (r2 - r1);
        expectClose(compiled.apply(x), e1 + a * (x - r1), span + Math.abs(a * x));
      }),
      { numRuns: 1000 },
    );
  });

  it('a unit step there and back (°C → K → °C, kPa → bar → kPa, L/min → m^3/h → L/min) is the identity', () => {
    fc.assert(
      fc.property(fc.constantFrom(['degC', 'K'], ['kPa', 'bar'], ['L/min', 'm^3/h'], ['mV', 'V'], ['degF', 'degC']), rawValue, ([u, v], x) => {
        const compiled = compileChain({ steps: [{ kind: 'unit', inputUnit: u, outputUnit: v }, { kind: 'unit', inputUnit: v, outputUnit: u }] }, u);
        expectClose(compiled.apply(x), x, Math.abs(x) + 500);
      }),
      { numRuns: 300 },
    );
  });

  it('a table with rising values stays between its neighbouring knots and hits every knot', () => {
    const table = fc
      .uniqueArray(finite(-1e3, 1e3), { minLength: 2, maxLength: 8, comparator: (p, q) => Math.abs(p - q) < 1e-6 })
      .chain((raws) =>
        fc.tuple(
          fc.constant([...raws].sort((p, q) => p - q)),
          fc.array(offset, { minLength: raws.length, maxLength: raws.length }),
        ),
      );
    fc.assert(
      fc.property(table, fc.double({ min: 0, max: 1, noNaN: true }), ([raws, engs], t) => {
        const points = raws.map((raw, i) => ({ raw, eng: engs[i] }));
        const compiled = compileChain({ steps: [{ kind: 'table', points, inputUnit: 'mV', outputUnit: 'degC' }] });
        expect(compiled.linear).toBe(false);
        for (const p of points) expectClose(compiled.apply(p.raw), p.eng, 1e3);
        // Clamped: lo + t·(hi − lo) can round a hair past hi.
        const x = Math.min(raws[raws.length - 1], Math.max(raws[0], raws[0] + t * (raws[raws.length - 1] - raws[0])));
        // The segment holding x: the last knot at or below it (the last segment for the last knot).
        let i = 0;
        while (i < raws.length - 2 && raws[i + 1] <= x) i++;
        const y = compiled.apply(x);
        expect(y).toBeGreaterThanOrEqual(Math.min(engs[i], engs[i + 1]) - 1e-6);
        expect(y).toBeLessThanOrEqual(Math.max(engs[i], engs[i + 1]) + 1e-6);
        // Outside the table without leave to extrapolate: a typed error, never a made-up value.
        expect(() => compiled.apply(raws[raws.length - 1] + 1)).toThrow(AnalysisError);
      }),
      { numRuns: 500 },
    );
  });

  it('the chain\u2019s derivative agrees with a central difference wherever the chain is smooth', () => {
    // Central difference f'(x) ≈ (f(x+h) − f(x−h)) / 2h, exact for straight lines (numerical analysis, common practice).
    fc.assert(
      fc.property(gain, offset, fc.constantFrom(['degC', 'K'], ['kPa', 'Pa'], ['mA', 'A']), rawValue, (a, b, [u, v], x) => {
        const compiled = compileChain({ steps: [linear(a, b, 'V', u), { kind: 'unit', inputUnit: u, outputUnit: v }] }, 'V');
        const h = 1e-3;
        const numeric = (compiled.apply(x + h) - compiled.apply(x - h)) / (2 * h);
        expect(Math.abs(numeric - compiled.derivative(x))).toBeLessThanOrEqual(1e-6 * Math.max(1, Math.abs(compiled.derivative(x))) + 1e-6 * Math.abs(compiled.apply(x)));
      }),
      { numRuns: 500 },
    );
  });
});
