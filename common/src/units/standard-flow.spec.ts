import { describe, expect, it } from 'vitest';
import reference from '../reference-data/air-standard-density.json';
import {
  R_DRY_AIR,
  STANDARD_CONDITIONS,
  idealGasDensity,
  standardDensity,
  standardFlowToMassFactor,
  standardFlowToMassFlow,
} from './standard-flow';

describe('dry-air density at standard conditions', () => {
  // Reference: air-standard-density.json, ideal gas with R = 287.05 J/(kg K) at 101.325 kPa, with
  // the published figures beside each row (Wikipedia "Density of air"; Engineers Edge).
  const rows: Array<[keyof typeof STANDARD_CONDITIONS, number]> = [
    ['0C', 0],
    ['20C', 20],
    ['21.1C', 21.1],
    ['25C', 25],
  ];

  it('uses the same gas constant as the reference file', () => {
    expect(R_DRY_AIR).toBe(reference.R_specific_J_per_kg_K);
  });

  it.each(rows)('%s matches the reference file to 1e-7 relative and the published figure to its digits', (id, tC) => {
    const row = reference.rows.find((r) => r.t_C === tC)!;
    const rho = standardDensity(id);
    expect(Math.abs(rho - row.rho_kg_per_m3) / row.rho_kg_per_m3).toBeLessThan(1e-7);
    // Published ideal-gas figures are printed to 4–5 significant digits (R = 287.058 there).
    const published = row.published[0].value_kg_per_m3;
    expect(Math.abs(rho - published) / published).toBeLessThan(1e-4);
  });

  it('lies about 0.06 % below the real-gas 1.293 kg/m³ quoted at 0 °C (compressibility)', () => {
    const rho = standardDensity('0C');
    expect((1.293 - rho) / 1.293).toBeGreaterThan(0.0004);
    expect((1.293 - rho) / 1.293).toBeLessThan(0.0008);
  });

  it('accepts explicit conditions and refuses impossible ones', () => {
    expect(standardDensity({ temperatureC: 15, pressureKPa: 101.325 })).toBeCloseTo(1.2250123, 6);
    expect(() => standardDensity({ temperatureC: -300, pressureKPa: 101.325 })).toThrow(/above −273.15 °C/);
    expect(() => standardDensity({ temperatureC: 20, pressureKPa: 0 })).toThrow(/positive number of kPa/);
    expect(() => standardDensity('15C' as never)).toThrow(/unknown standard conditions "15C"; choose one of 0C, 20C, 21.1C, 25C/);
    expect(() => idealGasDensity(0, 101325)).toThrow(/above 0 K/);
  });
});

describe('standard volumetric flow → mass flow', () => {
  it('1 standard L/min at 0 °C is ρ(0 °C) g/min (1 L × kg/m³ = 1 g)', () => {
    expect(standardFlowToMassFactor('SLPM', 'g/min', '0C')).toBeCloseTo(standardDensity('0C'), 14);
    expect(standardFlowToMassFlow(100, 'L/min', 'kg/s', '20C')).toBeCloseTo((100 * 1.2041183) / 60000, 9);
  });

  it('moves by up to 9 % with the choice of standard conditions', () => {
    const at0 = standardFlowToMassFlow(175, 'SLPM', 'g/min', '0C');
    const at25 = standardFlowToMassFlow(175, 'SLPM', 'g/min', '25C');
    expect(at0 / at25).toBeCloseTo(298.15 / 273.15, 12);
  });

  it('refuses units that are not a volume flow and a mass flow', () => {
    expect(() => standardFlowToMassFactor('g/min', 'g/min', '0C')).toThrow(/not a volume per time/);
    expect(() => standardFlowToMassFactor('L/min', 'L/min', '0C')).toThrow(/not a mass flow unit/);
  });
});
