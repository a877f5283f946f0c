import { describe, expect, it } from 'vitest';
import type { ChannelSpec } from '../types/analysis';
import { accuracyComponent, combineBudget, fitComponent, resolutionComponent, SQRT3, statedComponent } from './uncertainty';

describe('components from a channel spec', () => {
  // GUM F.2.2.1: a display's last digit δ gives a rectangular half-width δ/2, u = δ/√12. Worked
  // figure: δ = 0.001 → u = 0.000 288 7 (Shah, "Resolution Resolve", ASQ Quality Progress 2016).
  it('resolution δ/√12', () => {
    const c = resolutionComponent({ rawUnit: 'V', resolution: 0.001 });
    expect(c).toMatchObject({ value: 0.0005, divisor: SQRT3, distribution: 'rectangular', sourceId: null });
    expect(c.value / c.divisor).toBeCloseTo(0.0002887, 7);
    expect(c.value / c.divisor).toBeCloseTo(0.001 / Math.sqrt(12), 15);
    expect(() => resolutionComponent({ rawUnit: 'V', resolution: 0 })).toThrow(/resolution \(last displayed digit\) must be a number above 0/);
  });

  // Ours (worked by hand): ±(0.5 % of reading + 2 digits) on a 2 V range (δ = 0.001 V) reading
  // 1.234 V: a = 0.00617 + 0.002 = 0.00817 V, rectangular, u = 0.0047 V.
  it('% of reading + digits is one rectangular bound', () => {
    const channel: ChannelSpec = { id: 'dvm-1', rawUnit: 'V', resolution: 0.001, accuracy: { percentOfReading: 0.5, digits: 2 } };
    const c = accuracyComponent(1.234, channel)!;
    expect(c.value).toBeCloseTo(0.00817, 12);
    expect(c.value / c.divisor).toBeCloseTo(0.0047, 4);
    expect(c.sourceId).toBe('dvm-1/accuracy');
    expect(c.note).toBe('±(0.5 % of reading + 2 digits of 0.001 V) at 1.234 V');
    // A negative reading has the same bound.
    expect(accuracyComponent(-1.234, channel)!.value).toBeCloseTo(0.00817, 12);
  });

  // Trade fact (common practice, no published source): a 0–175 standard L/min meter with a bypass
  // passing 7.947 × the metered flow reads 0–1390.7 L/min; ±1.5 % of full scale is ±20.9 L/min at
  // every reading, so low readings carry a large relative uncertainty.
  it('% of full scale is the same at every reading', () => {
    const channel: ChannelSpec = { rawUnit: 'L/min', resolution: 1, fullScale: 175 * 7.947, accuracy: { percentOfFullScale: 1.5 } };
    const low = accuracyComponent(100, channel)!;
    const high = accuracyComponent(1300, channel)!;
    expect(low.value).toBeCloseTo(20.86, 2);
    expect(high.value).toBe(low.value);
    const relLow = low.value / SQRT3 / 100;
    const relHigh = high.value / SQRT3 / 1300;
    expect(relLow).toBeGreaterThan(0.12);
    expect(relHigh).toBeLessThan(0.01);
    expect(() => accuracyComponent(100, { ...channel, fullScale: null })).toThrow(/has no full scale; set the channel's full scale \(in L\/min\)/);
  });

  it('no accuracy spec, no component', () => {
    expect(accuracyComponent(3, { rawUnit: 'V', resolution: 0.01, accuracy: null })).toBeNull();
    expect(accuracyComponent(3, { rawUnit: 'V', resolution: 0.01, accuracy: {} })).toBeNull();
  });
});

describe('stated uncertainties', () => {
  it('a bare ± bound is rectangular (÷√3); a normal one is divided by its k', () => {
    const bare = statedComponent('bypass ratio', { basis: 'relative', value: 1 }, 7.947, '');
    expect(bare.distribution).toBe('rectangular');
    expect(bare.value / bare.divisor).toBeCloseTo(0.07947 / SQRT3, 14);
    const certificate = statedComponent('thermometer', { basis: 'absolute', value: 0.1, distribution: 'normal', k: 2 }, 25, 'degC');
    expect(certificate.value / certificate.divisor).toBe(0.05);
    expect(certificate.note).toBe('U = 0.1 degC, k = 2');
    expect(() => statedComponent('x', { basis: 'absolute', value: -1 }, 1, 'V')).toThrow(/must not be negative/);
    expect(() => statedComponent('x', { basis: 'percent' as never, value: 1 }, 1, 'V')).toThrow(/basis must be "absolute" or "relative"/);
  });
});

describe('combineBudget', () => {
  it('combines in quadrature, expands with k = 2 and shares the variance', () => {
    const budget = combineBudget(100, 'g/min', [
      { name: 'a', value: 3, unit: 'g/min', distribution: 'normal', divisor: 1, sensitivity: 1 },
      { name: 'b', value: 2, unit: 'V', distribution: 'normal', divisor: 1, sensitivity: -2 },
    ]);
    expect(budget.combinedStandardUncertainty).toBe(5);
    expect(budget.coverageFactor).toBe(2);
    expect(budget.expandedUncertainty).toBe(10);
    expect(budget.relativeExpandedPercent).toBe(10);
    expect(budget.components.map((c) => c.percentOfVariance)).toEqual([36, 64]);
    expect(budget.components[1]).toMatchObject({ contribution: 4, sensitivity: -2, standardUncertainty: 2 });
  });

  it('takes the fit standard error as a standard uncertainty', () => {
    const c = fitComponent(
      { tStar: 600, value: 1, meanSe: 0.02, meanInterval: { low: 0, high: 0 }, predictionSe: 0, predictionInterval: { low: 0, high: 0 }, distanceFromCentre: 0, extrapolated: false, warnings: [] },
      'degC',
      98,
    );
    expect(c).toMatchObject({ value: 0.02, divisor: 1, distribution: 'normal' });
    expect(c.note).toMatch(/t\* = 600 s, 98 degrees of freedom/);
  });

  it('refuses a coverage factor that is not positive', () => {
    expect(() => combineBudget(1, 'V', [], { coverageFactor: 0 })).toThrow(/coverage factor must be above 0/);
  });
});
