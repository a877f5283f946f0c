import { describe, expect, it } from 'vitest';
import type { CalibrationChain, TableStep } from '../types/analysis';
import { standardDensity } from '../units/standard-flow';
import { chainComponents, compileChain, evaluateChain, propagateChain, scaledOutputStep, twoPointToLinear } from './calibration';
import { AnalysisError } from './errors';
import { accuracyComponent, SQRT3 } from './uncertainty';

describe('single steps', () => {
  it('linear y = a·x + b', () => {
    const chain: CalibrationChain = { steps: [{ kind: 'linear', a: 2.5, b: -1, inputUnit: 'mA', outputUnit: 'kPa' }] };
    expect(evaluateChain(chain, 4)).toBe(9);
    expect(compileChain(chain).derivative(12)).toBe(2.5);
  });

  it('two-point from (raw, eng) pairs: a 4–20 mA transmitter over 0–250 kPa', () => {
    expect(twoPointToLinear({ raw: 4, eng: 0 }, { raw: 20, eng: 250 })).toEqual({ a: 15.625, b: -62.5 });
    const chain: CalibrationChain = {
      steps: [{ kind: 'two-point', points: [{ raw: 4, eng: 0 }, { raw: 20, eng: 250 }], inputUnit: 'mA', outputUnit: 'kPa' }],
    };
    expect(evaluateChain(chain, 12)).toBe(125);
    expect(() => twoPointToLinear({ raw: 4, eng: 0 }, { raw: 4, eng: 250 })).toThrow(/both points have the raw value 4/);
  });

  describe('multi-point table', () => {
    const step: TableStep = {
      kind: 'table',
      label: 'thermocouple correction',
      inputUnit: 'degC',
      outputUnit: 'degC',
      points: [
        { raw: 0, eng: 0.4 },
        { raw: 50, eng: 50.1 },
        { raw: 100, eng: 99.5 },
      ],
    };
    const chain = { steps: [step] };

    it('interpolates piecewise linearly and hits the knots', () => {
      expect(evaluateChain(chain, 0)).toBeCloseTo(0.4, 14);
      expect(evaluateChain(chain, 25)).toBeCloseTo(25.25, 12);
      expect(evaluateChain(chain, 50)).toBeCloseTo(50.1, 12);
      expect(evaluateChain(chain, 75)).toBeCloseTo(74.8, 12);
      expect(evaluateChain(chain, 100)).toBeCloseTo(99.5, 12);
    });

    it('gives the segment slope as derivative (the right-hand segment on a knot)', () => {
      const c = compileChain(chain);
      expect(c.derivative(10)).toBeCloseTo(0.994, 12);
      expect(c.derivative(50)).toBeCloseTo(0.988, 12);
      expect(c.derivative(100)).toBeCloseTo(0.988, 12);
      expect(c.linear).toBe(false);
    });

    it('refuses values outside the table unless extrapolation is allowed', () => {
      expect(() => evaluateChain(chain, 101)).toThrow(AnalysisError);
      expect(() => evaluateChain(chain, -1)).toThrow(/raw value -1 degC is outside the calibration table \(0–100 degC\); extend the table or allow extrapolation/);
      const open = { steps: [{ ...step, allowExtrapolation: true }] };
      expect(evaluateChain(open, 110)).toBeCloseTo(99.5 + 10 * 0.988, 12);
      expect(evaluateChain(open, -10)).toBeCloseTo(0.4 - 10 * 0.994, 12);
    });

    it('refuses a table whose raw values do not strictly increase, naming the point', () => {
      const bad = { steps: [{ ...step, points: [step.points[0], step.points[2], step.points[1]] }] };
      expect(() => compileChain(bad)).toThrow(/point 3 \(50\) is not above point 2 \(100\)/);
      const repeated = { steps: [{ ...step, points: [step.points[0], step.points[0]] }] };
      expect(() => compileChain(repeated)).toThrow(/strictly increase/);
      expect(() => compileChain({ steps: [{ ...step, points: [step.points[0]] }] })).toThrow(/at least 2 points, got 1/);
    });
  });

  it('unit step through the units library, offsets included', () => {
    const chain: CalibrationChain = { steps: [{ kind: 'unit', inputUnit: '°C', outputUnit: 'K' }] };
    expect(evaluateChain(chain, 20)).toBeCloseTo(293.15, 12);
    expect(() => compileChain({ steps: [{ kind: 'unit', inputUnit: 'V', outputUnit: 'K' }] })).toThrow(/step 1 \(unit, V → K\): cannot convert V to K/);
  });

  it('refuses unknown kinds, missing units and zero gains with the step named', () => {
    expect(() => compileChain({ steps: [{ kind: 'spline' } as never] })).toThrow(/step 1: unknown kind "spline"/);
    expect(() => compileChain({ steps: [{ kind: 'linear', a: 1, b: 0, inputUnit: '', outputUnit: 'V' }] })).toThrow(/input unit is missing/);
    expect(() => compileChain({ steps: [{ kind: 'linear', a: 0, b: 3, inputUnit: 'V', outputUnit: 'V', label: 'gain' }] })).toThrow(
      /step 1 \(gain\): gain a must not be 0/,
    );
  });
});

describe('chains', () => {
  it('refuses steps whose units do not meet, and a first step that does not take the display unit', () => {
    const chain: CalibrationChain = {
      steps: [
        { kind: 'linear', a: 278.145, b: 0, inputUnit: 'V', outputUnit: 'L/min' },
        { kind: 'unit', inputUnit: 'kg/s', outputUnit: 'g/min' },
      ],
    };
    expect(() => compileChain(chain)).toThrow(/step 2 \(unit, kg\/s → g\/min\) expects kg\/s but step 1 .* gives L\/min; add a unit step/);
    const ok: CalibrationChain = { steps: [{ kind: 'linear', a: 1, b: 0, inputUnit: 'V', outputUnit: 'L/min' }] };
    expect(() => compileChain(ok, 'mV')).toThrow(/expects V but the channel shows mV/);
    // Different spellings of one unit meet.
    expect(compileChain({ steps: [ok.steps[0], { kind: 'unit', inputUnit: 'l/min', outputUnit: 'm^3/h' }] }).unit).toBe('m^3/h');
  });

  it('an empty chain is the identity in the raw unit', () => {
    const c = compileChain({ steps: [] }, 'degC');
    expect(c.apply(21.3)).toBe(21.3);
    expect(c.unit).toBe('degC');
  });

  // Trade fact (common practice, no published source): a 0–175 standard L/min thermal mass-flow
  // meter with 0–5 V out and a bypass passing 7.947 × the metered flow reads 0–1391 L/min at full
  // scale (175 × 7.947 = 1390.7), i.e. about 334 g/min per volt at an air density of about 1.2 g/L.
  describe('volts → standard L/min → g/min (bypassed thermal mass-flow meter)', () => {
    const meter = scaledOutputStep({
      signal: [0, 5],
      range: [0, 175],
      multiplier: 7.947,
      inputUnit: 'V',
      outputUnit: 'SLPM',
      label: 'meter and bypass',
      uncertainty: { basis: 'absolute', value: 0.015 * 175 * 7.947, label: '±1.5 % of full scale', sourceId: 'meter-1/fs' },
    });
    const chain = (standard: '0C' | '20C' | '21.1C' | '25C'): CalibrationChain => ({
      steps: [meter, { kind: 'standard-to-mass', inputUnit: 'SLPM', outputUnit: 'g/min', standardConditions: standard }],
    });

    it('reads 0–1391 standard L/min over 0–5 V', () => {
      expect(evaluateChain({ steps: [meter] }, 5)).toBeCloseTo(1390.725, 9);
      expect(Math.round(evaluateChain({ steps: [meter] }, 5))).toBe(1391);
      expect(evaluateChain({ steps: [meter] }, 0)).toBe(0);
    });

    it('gives about 334 g/min per volt at about 1.2 g/L', () => {
      for (const standard of ['20C', '21.1C'] as const) {
        const perVolt = compileChain(chain(standard), 'V').derivative(2.5);
        expect(perVolt).toBeCloseTo((1390.725 / 5) * standardDensity(standard), 9);
        expect(Math.abs(perVolt - 334) / 334).toBeLessThan(0.005);
      }
      expect(compileChain(chain('21.1C')).linear).toBe(true);
    });

    it('±1.5 % of full scale is ±20.9 L/min at every reading: large relative uncertainty low in the range', () => {
      const compiled = compileChain(chain('21.1C'));
      const rho = standardDensity('21.1C');
      const low = chainComponents(compiled, 0.25);
      const high = chainComponents(compiled, 4.75);
      for (const evaluation of [low, high]) {
        const c = evaluation.components[0];
        expect(c.value).toBeCloseTo(20.86, 2);
        expect(c.sourceId).toBe('meter-1/fs');
        // ∂(g/min)/∂(L/min) = ρ in g/L.
        expect(c.sensitivity).toBeCloseTo(rho, 12);
      }
      const relative = (e: typeof low) => (e.components[0].value * e.components[0].sensitivity) / SQRT3 / e.value;
      expect(relative(low)).toBeCloseTo(0.015 * 20 / SQRT3, 12);
      expect(relative(low) / relative(high)).toBeCloseTo(19, 9);
    });

    it('propagates the display accuracy through the chain as well (sensitivity = g/min per volt)', () => {
      const display = accuracyComponent(2, { rawUnit: 'V', resolution: 0.001, accuracy: { percentOfReading: 0.5, digits: 2 } })!;
      const budget = propagateChain(chain('20C'), 2, [display], { rawUnit: 'V' });
      const perVolt = (1390.725 / 5) * standardDensity('20C');
      expect(budget.value).toBeCloseTo(2 * perVolt, 9);
      expect(budget.unit).toBe('g/min');
      const [displayLine, meterLine] = budget.components;
      expect(displayLine.value).toBeCloseTo(0.012, 12);
      expect(displayLine.sensitivity).toBeCloseTo(perVolt, 9);
      expect(meterLine.contribution).toBeCloseTo((20.8609 * standardDensity('20C')) / SQRT3, 3);
      const uc = Math.hypot((0.012 / SQRT3) * perVolt, (0.015 * 1390.725 * standardDensity('20C')) / SQRT3);
      expect(budget.combinedStandardUncertainty).toBeCloseTo(uc, 9);
      expect(budget.expandedUncertainty).toBeCloseTo(2 * uc, 9);
    });
  });

  it('propagates through a table by its local slope (agrees with a numerical derivative)', () => {
    const chain: CalibrationChain = {
      steps: [
        {
          kind: 'table',
          inputUnit: 'mV',
          outputUnit: 'degC',
          points: [
            { raw: 0, eng: 0 },
            { raw: 1, eng: 25 },
            { raw: 2, eng: 49 },
            { raw: 3, eng: 72 },
          ],
          uncertainty: { basis: 'absolute', value: 0.2, distribution: 'normal', k: 2, label: 'table certificate' },
        },
        { kind: 'unit', inputUnit: 'degC', outputUnit: 'K' },
        { kind: 'linear', a: 2, b: 0, inputUnit: 'K', outputUnit: 'K' },
      ],
    };
    const c = compileChain(chain);
    const h = 1e-6;
    const numeric = (c.apply(1.5 + h) - c.apply(1.5 - h)) / (2 * h);
    expect(c.derivative(1.5)).toBeCloseTo(numeric, 6);
    expect(c.derivative(1.5)).toBeCloseTo(48, 12);
    const e = chainComponents(c, 1.5);
    expect(e.value).toBeCloseTo(2 * (37 + 273.15), 9);
    expect(e.components[0]).toMatchObject({ name: 'step 1 (table, mV → degC): table certificate', divisor: 2, value: 0.2, sensitivity: 2 });
    expect(e.intermediate.map((s) => s.unit)).toEqual(['degC', 'K', 'K']);
  });

  it('states relative step uncertainties as a percent of that step output', () => {
    const chain: CalibrationChain = {
      steps: [{ kind: 'linear', a: 10, b: 0, inputUnit: 'V', outputUnit: 'kPa', uncertainty: { basis: 'relative', value: 1 } }],
    };
    const budget = propagateChain(chain, 3);
    expect(budget.components[0].value).toBeCloseTo(0.3, 12);
    expect(budget.components[0].distribution).toBe('rectangular');
    expect(budget.combinedStandardUncertainty).toBeCloseTo(0.3 / SQRT3, 12);
    expect(() =>
      propagateChain({ steps: [{ ...chain.steps[0], uncertainty: { basis: 'absolute', value: 1, distribution: 'normal' } }] }, 3),
    ).toThrow(/needs its coverage factor k/);
  });
});
