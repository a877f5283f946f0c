// Standard volumetric flow → mass flow. A thermal mass-flow meter reading "175 standard L/min"
// means the mass of air that would fill 175 L per minute at the maker's reference conditions.
// There is no single standard: 0 °C, 20 °C, 70 °F (21.1 °C) and 25 °C at 101.325 kPa are all in
// use, and the choice moves the mass flow by up to 9 %. Always record the conditions with the meter.
import type { CustomStandardConditions, StandardConditionId } from '../types/analysis';
import { productFactor, sameQuantity, UnitError } from './units';
import { describeValue } from '../analysis/errors';

/**
 * Specific gas constant of dry air, J/(kg K): 8314.32 / 28.9647 (molar mass of dry air 28.9647
 * g/mol). Densities from it match the published ideal-gas figures in air-standard-density.json
 * (Wikipedia "Density of air"; Engineers Edge) to the 4th–5th digit.
 */
export const R_DRY_AIR = 287.05;

/** One standard atmosphere, kPa (exact by definition). */
export const STANDARD_PRESSURE_KPA = 101.325;

export interface StandardConditions {
  id: StandardConditionId | 'custom';
  label: string;
  temperatureC: number;
  pressureKPa: number;
}

/** The reference conditions people select for a meter, all at 101.325 kPa. */
export const STANDARD_CONDITIONS: Readonly<Record<StandardConditionId, StandardConditions>> = {
  '0C': { id: '0C', label: '0 °C, 101.325 kPa', temperatureC: 0, pressureKPa: STANDARD_PRESSURE_KPA },
  '20C': { id: '20C', label: '20 °C, 101.325 kPa', temperatureC: 20, pressureKPa: STANDARD_PRESSURE_KPA },
  '21.1C': { id: '21.1C', label: '21.1 °C (70 °F), 101.325 kPa', temperatureC: 21.1, pressureKPa: STANDARD_PRESSURE_KPA },
  '25C': { id: '25C', label: '25 °C, 101.325 kPa', temperatureC: 25, pressureKPa: STANDARD_PRESSURE_KPA },
};

/** Named or explicit conditions, checked. */
export function resolveStandardConditions(
  conditions: StandardConditionId | CustomStandardConditions,
): StandardConditions {
  if (typeof conditions === 'string') {
    const named = STANDARD_CONDITIONS[conditions];
    if (!named || !Object.hasOwn(STANDARD_CONDITIONS, conditions)) {
      throw new UnitError(
        `unknown standard conditions "${conditions}"; choose one of ${Object.keys(STANDARD_CONDITIONS).join(', ')} or give temperatureC and pressureKPa`,
      );
    }
    return named;
  }
  const { temperatureC, pressureKPa } = conditions ?? ({} as CustomStandardConditions);
  if (!Number.isFinite(temperatureC) || temperatureC <= -273.15) {
    throw new UnitError(`standard temperature must be a finite number above −273.15 °C, got ${describeValue(temperatureC)}`);
  }
  if (!Number.isFinite(pressureKPa) || pressureKPa <= 0) {
    throw new UnitError(`standard pressure must be a positive number of kPa, got ${describeValue(pressureKPa)}`);
  }
  return { id: 'custom', label: `${temperatureC} °C, ${pressureKPa} kPa`, temperatureC, pressureKPa };
}

/** ρ = p / (R·T), kg/m³, for an ideal gas; T in K, p in Pa, R in J/(kg K). */
export function idealGasDensity(temperatureK: number, pressurePa: number, gasConstant = R_DRY_AIR): number {
  if (!Number.isFinite(temperatureK) || temperatureK <= 0) {
    throw new UnitError(`absolute temperature must be above 0 K, got ${describeValue(temperatureK)} K`);
  }
  if (!Number.isFinite(pressurePa) || pressurePa <= 0) {
    throw new UnitError(`pressure must be above 0 Pa, got ${describeValue(pressurePa)} Pa`);
  }
  if (!Number.isFinite(gasConstant) || gasConstant <= 0) {
    throw new UnitError(`gas constant must be above 0 J/(kg K), got ${describeValue(gasConstant)}`);
  }
  return pressurePa / (gasConstant * temperatureK);
}

/** Dry-air density at standard conditions, kg/m³ (ideal gas, R = 287.05 J/(kg K)). */
export function standardDensity(conditions: StandardConditionId | CustomStandardConditions): number {
  const c = resolveStandardConditions(conditions);
  return idealGasDensity(c.temperatureC + 273.15, c.pressureKPa * 1000);
}

/**
 * Factor f with ṁ [massUnit] = f · Q_std [flowUnit]: f = ρ_std converted to massUnit per flowUnit.
 * flowUnit is a volume per time ("L/min", or "SLPM", read as litres per minute at the conditions).
 */
export function standardFlowToMassFactor(
  flowUnit: string,
  massUnit: string,
  conditions: StandardConditionId | CustomStandardConditions,
): number {
  if (!sameQuantity(flowUnit, 'L/min')) {
    throw new UnitError(`standard flow unit "${flowUnit}" is not a volume per time (e.g. L/min, SLPM, sccm)`);
  }
  if (!sameQuantity(massUnit, 'kg/s')) {
    throw new UnitError(`"${massUnit}" is not a mass flow unit (e.g. g/min, kg/s, kg/h)`);
  }
  return standardDensity(conditions) * productFactor(flowUnit, 'kg/m^3', massUnit);
}

/** ṁ in massUnit from a standard volumetric flow Q in flowUnit at the given conditions. */
export function standardFlowToMassFlow(
  flow: number,
  flowUnit: string,
  massUnit: string,
  conditions: StandardConditionId | CustomStandardConditions,
): number {
  if (!Number.isFinite(flow)) throw new UnitError(`standard flow must be a finite number, got ${describeValue(flow)}`);
  return flow * standardFlowToMassFactor(flowUnit, massUnit, conditions);
}

