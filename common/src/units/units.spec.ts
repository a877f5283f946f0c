import { describe, expect, it } from 'vitest';
import { convert, isStandardFlowUnit, linearConversion, parseUnit, productFactor, sameQuantity, toLibraryUnit, UnitError } from './units';

describe('toLibraryUnit', () => {
  it('maps display spellings to the units library', () => {
    expect(toLibraryUnit('°C')).toBe('degC');
    expect(toLibraryUnit(' ℃ ')).toBe('degC');
    expect(toLibraryUnit('°F')).toBe('degF');
    expect(toLibraryUnit('m³/h')).toBe('m^3/h');
    expect(toLibraryUnit('µA')).toBe('uA');
    expect(toLibraryUnit('W·h')).toBe('W h');
  });

  it('reads standard flow spellings as the volume flow they name, never as a library unit', () => {
    expect(toLibraryUnit('SLPM')).toBe('L/min');
    expect(toLibraryUnit('slpm')).toBe('L/min');
    expect(toLibraryUnit('sccm')).toBe('cm^3/min');
    expect(toLibraryUnit('SCFM')).toBe('ft^3/min');
    expect(toLibraryUnit('Nm³/h')).toBe('m^3/h');
    expect(isStandardFlowUnit('SLPM')).toBe(true);
    expect(isStandardFlowUnit('L/min')).toBe(false);
  });

  it('refuses a missing unit', () => {
    expect(() => toLibraryUnit('')).toThrow(UnitError);
    expect(() => toLibraryUnit('  ')).toThrow(/unit is missing/);
  });
});

describe('parseUnit', () => {
  it('names the unit it did not understand', () => {
    expect(() => parseUnit('furlongs/fortnight')).toThrow(/unknown unit "furlongs\/fortnight"/);
    expect(() => parseUnit('5 V')).toThrow(/has a number in it/);
  });
});

describe('conversions', () => {
  it('converts with offsets where the units have them', () => {
    expect(convert(0, '°C', 'K')).toBeCloseTo(273.15, 12);
    expect(convert(100, 'degC', 'degF')).toBeCloseTo(212, 10);
    expect(linearConversion('degC', 'K')).toEqual({ scale: 1, offset: 273.15 });
    expect(convert(1, 'bar', 'kPa')).toBeCloseTo(100, 12);
    expect(convert(1500, 'mV', 'V')).toBeCloseTo(1.5, 14);
    expect(convert(60, 'g/min', 'kg/h')).toBeCloseTo(3.6, 12);
  });

  // Exact by definition: 1 Btu_IT = 1055.05585262 J and 1 lb = 0.45359237 kg, so 1 Btu_IT/lb =
  // 2326 J/kg (NIST SP 811 App. B.8; Fifth Int. Conference on the Properties of Steam, 1956);
  // 1 W·h = 3600 J (W = J/s, h = 3600 s). The units library's BTU is the IT Btu.
  it('1 Btu(IT)/lb = 2.326 kJ/kg and 1 W·h = 3.6 kJ, exactly', () => {
    expect(Math.abs(convert(1, 'BTU/lb', 'kJ/kg') - 2.326)).toBeLessThanOrEqual(2.326 * 4e-16);
    expect(Math.abs(convert(1, 'W·h', 'kJ') - 3.6)).toBeLessThanOrEqual(3.6 * 4e-16);
    expect(convert(1, 'kW h', 'MJ')).toBe(3.6);
    // The thermochemical Btu (1054.35 J) is a different unit; make sure we did not get it.
    expect(convert(1, 'BTU', 'J')).toBe(1055.05585262);
  });

  it('refuses to convert between different quantities, and says why for standard flow', () => {
    expect(sameQuantity('L/min', 'g/min')).toBe(false);
    expect(() => convert(1, 'V', 'kPa')).toThrow(/cannot convert V to kPa: they measure different quantities/);
    expect(() => convert(1, 'SLPM', 'g/min')).toThrow(/standard-to-mass step/);
    expect(() => convert(Number.NaN, 'V', 'mV')).toThrow(/not a finite number/);
  });

  it('multiplies units: L/min × kg/m³ → g/min', () => {
    expect(productFactor('L/min', 'kg/m^3', 'g/min')).toBeCloseTo(1, 14);
    expect(productFactor('m^3/h', 'kg/m^3', 'kg/s')).toBeCloseTo(1 / 3600, 16);
    expect(() => productFactor('L/min', 'kg/m^3', 'W')).toThrow(/does not give W/);
  });
});
