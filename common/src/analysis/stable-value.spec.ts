import { describe, expect, it } from 'vitest';
import type { CalibrationChain, ChannelSpec, TrendPoint } from '../types/analysis';
import { standardDensity } from '../units/standard-flow';
import { compileChain, scaledOutputStep } from './calibration';
import { stableValue } from './stable-value';
import { fitTrend, predictAt } from './trend-fit';
import { SQRT3 } from './uncertainty';

/** Readings every 3 s over [0, 900] s: a slow ramp plus a fixed zig-zag, rounded to the display digit. */
function readings(base: number, perMinute: number, zigzag: number, digit: number): TrendPoint[] {
  const points: TrendPoint[] = [];
  for (let i = 0; i <= 300; i++) {
    const t = 3 * i;
    const y = base + (perMinute * t) / 60 + (i % 3 === 0 ? zigzag : i % 3 === 1 ? -zigzag : 0);
    points.push({ t, y: Math.round(y / digit) * digit });
  }
  return points;
}

// The demo rig's thermal mass-flow meter (0–175 standard L/min, bypass 7.947×, 0–5 V out) read
// on a panel voltmeter (δ = 0.001 V, ±(0.5 % of reading + 2 digits)); 20 °C standard conditions.
const voltmeter: ChannelSpec = { id: 'dvm-flow', name: 'flow meter volts', rawUnit: 'V', resolution: 0.001, accuracy: { percentOfReading: 0.5, digits: 2 } };
const flowChain: CalibrationChain = {
  steps: [
    scaledOutputStep({
      signal: [0, 5],
      range: [0, 175],
      multiplier: 7.947,
      inputUnit: 'V',
      outputUnit: 'SLPM',
      label: 'meter and bypass',
      uncertainty: { basis: 'absolute', value: 0.015 * 175 * 7.947, sourceId: 'meter-1/fs', label: '±1.5 % of full scale' },
    }),
    { kind: 'standard-to-mass', inputUnit: 'SLPM', outputUnit: 'g/min', standardConditions: '20C' },
  ],
};
const perVolt = (175 * 7.947 * standardDensity('20C')) / 5;

describe('stableValue through a calibration chain', () => {
  const points = readings(3.2, 0.001, 0.002, 0.001);
  const result = stableValue(points, { from: 300, to: 900 }, 900, voltmeter, flowChain);

  it('fits in engineering units and takes the value at t*', () => {
    expect(result.unit).toBe('g/min');
    expect(result.rawUnit).toBe('V');
    expect(result.fit.n).toBe(201);
    const rawFit = fitTrend(
      points.filter((p) => p.t >= 300).map((p) => p.t),
      points.filter((p) => p.t >= 300).map((p) => p.y),
    );
    const raw = predictAt(rawFit, 900).value;
    expect(result.rawValue).toBeCloseTo(raw, 12);
    expect(result.value).toBeCloseTo(raw * perVolt, 8);
    expect(result.fit.slopePerMinute).toBeCloseTo(rawFit.slopePerMinute * perVolt, 8);
    expect(result.fit.residuals).toHaveLength(201);
    expect(result.prediction.extrapolated).toBe(false);
  });

  it('builds the budget: accuracy and resolution at the raw reading, the meter step, the fit', () => {
    const [accuracy, resolution, meter, fit] = result.budget.components;
    expect(result.budget.components.map((c) => c.name)).toEqual([
      'instrument accuracy',
      'display resolution',
      'step 1 (meter and bypass): ±1.5 % of full scale',
      'trend fit at t*',
    ]);
    expect(accuracy.value).toBeCloseTo(0.005 * result.rawValue + 0.002, 12);
    expect(accuracy.sensitivity).toBeCloseTo(perVolt, 9);
    expect(accuracy.sourceId).toBe('dvm-flow/accuracy');
    expect(resolution.standardUncertainty).toBeCloseTo(0.001 / Math.sqrt(12), 15);
    expect(meter.value).toBeCloseTo(20.86, 2);
    expect(meter.sensitivity).toBeCloseTo(standardDensity('20C'), 12);
    expect(meter.sourceId).toBe('meter-1/fs');
    expect(fit.standardUncertainty).toBe(result.prediction.meanSe);
    const uc = Math.hypot(
      ((0.005 * result.rawValue + 0.002) / SQRT3) * perVolt,
      (0.0005 / SQRT3) * perVolt,
      ((0.015 * 1390.725) / SQRT3) * standardDensity('20C'),
      result.prediction.meanSe,
    );
    expect(result.budget.combinedStandardUncertainty).toBeCloseTo(uc, 9);
    expect(result.expandedUncertainty).toBeCloseTo(2 * uc, 9);
    expect(result.budget.components.reduce((s, c) => s + c.percentOfVariance, 0)).toBeCloseTo(100, 9);
    // The meter's ±1.5 % FS dominates at 3.2 V of 5 V.
    expect(meter.percentOfVariance).toBeGreaterThan(50);
  });

  it('accepts a compiled chain and gives the same result', () => {
    const again = stableValue(points, { from: 300, to: 900 }, 900, voltmeter, compileChain(flowChain, 'V'));
    expect(again.value).toBe(result.value);
    expect(again.expandedUncertainty).toBe(result.expandedUncertainty);
  });
});

describe('stableValue in the raw unit', () => {
  const thermometer: ChannelSpec = { id: 'T-warm-out', rawUnit: '°C', resolution: 0.1, accuracy: { percentOfReading: 0.1, digits: 1 } };
  const points = readings(31.4, -0.02, 0.1, 0.1);

  it('without a calibration the value stays in the display unit', () => {
    const r = stableValue(points, { from: 0, to: 900 }, 600, thermometer);
    expect(r.unit).toBe('°C');
    const direct = predictAt(fitTrend(points.map((p) => p.t), points.map((p) => p.y)), 600);
    expect(r.value).toBeCloseTo(direct.value, 12);
    expect(r.rawValue).toBe(r.value);
    expect(r.budget.components[0].value).toBeCloseTo(0.001 * r.value + 0.1, 12);
  });

  it('can leave resolution out and reports it', () => {
    const r = stableValue(points, { from: 0, to: 900 }, 600, thermometer, null, { includeResolution: false, includeResiduals: false });
    expect(r.budget.components.map((c) => c.name)).toEqual(['instrument accuracy', 'trend fit at t*']);
    expect(r.fit.residuals).toEqual([]);
  });

  it('refuses t* outside the window unless extrapolation is confirmed', () => {
    expect(() => stableValue(points, { from: 0, to: 600 }, 700, thermometer)).toThrow(/t\* = 700 s is outside the fitted points \(0–600 s\)/);
    const r = stableValue(points, { from: 0, to: 600 }, 700, thermometer, null, { allowExtrapolation: true });
    expect(r.warnings[0]).toMatch(/^extrapolated/);
  });

  it('refuses a window with fewer than 3 readings and a calibration that does not take the display unit', () => {
    expect(() => stableValue(points, { from: 0, to: 4 }, 3, thermometer)).toThrow(/at least 3 readings in the window, 0–4 s holds 2/);
    expect(() => stableValue(points, { from: 0, to: 900 }, 600, thermometer, flowChain)).toThrow(/expects V but the channel shows °C/);
  });

  it('counts unchecked first-pass readings and says so', () => {
    const marked = points.map((p, i) => (i % 10 === 0 ? { ...p, unchecked: true } : p));
    const r = stableValue(marked, { from: 0, to: 900 }, 600, thermometer);
    expect(r.fit.uncheckedCount).toBe(31);
    expect(r.warnings).toContain('31 of 301 readings are unchecked first-pass values (no second pass yet)');
  });
});
