// Units through the mathjs units library. People type units as they see them on a display or a
// data sheet ("°C", "m³/h", "µA", "SLPM"); the library wants its own spelling ("degC", "m^3/h",
// "uA", "L/min"). `toLibraryUnit` bridges the two; every conversion goes through the library.
import type { Unit } from 'mathjs';
import { math } from './math';

/** A unit that cannot be read or a conversion that is not possible, with what to do about it. */
export class UnitError extends RangeError {
  override name = 'UnitError';
}

/**
 * Standard volumetric flow units: a volume per minute at the meter's reference conditions, which
 * is really a mass flow in disguise. We map them to their plain volumetric spelling here and turn
 * them into mass flow only through the gas density at stated conditions (standard-flow.ts).
 * Do NOT use another library's "slpm": some define it as something other than a mass flow (pint's
 * standard_liter_per_minute is atmosphere·litre/minute, a power), and mathjs has none.
 */
const STANDARD_FLOW_SPELLINGS: Record<string, string> = {
  slpm: 'L/min',
  slm: 'L/min',
  'sl/min': 'L/min',
  'ls/min': 'L/min',
  'ln/min': 'L/min',
  nlpm: 'L/min',
  sccm: 'cm^3/min',
  'scc/min': 'cm^3/min',
  scfm: 'ft^3/min',
  scfh: 'ft^3/h',
  'sm3/h': 'm^3/h',
  'nm3/h': 'm^3/h',
  'sm^3/h': 'm^3/h',
  'nm^3/h': 'm^3/h',
};

/** True for "SLPM", "sccm", "Nm3/h"… (a standard volumetric flow spelling). */
export function isStandardFlowUnit(unit: string): boolean {
  return Object.hasOwn(STANDARD_FLOW_SPELLINGS, unit.trim().toLowerCase().replace(/\s+/g, '').replace('³', '3'));
}

/** The mathjs spelling of a unit typed by a person. */
export function toLibraryUnit(unit: string): string {
  if (typeof unit !== 'string' || unit.trim() === '') {
    throw new UnitError('a unit is missing; write it as e.g. V, L/min, g/min, degC or kPa');
  }
  const trimmed = unit.trim();
  const flowKey = trimmed.toLowerCase().replace(/\s+/g, '').replace('³', '3');
  if (Object.hasOwn(STANDARD_FLOW_SPELLINGS, flowKey)) return STANDARD_FLOW_SPELLINGS[flowKey];
  return trimmed
    .replace(/°\s*C|℃/g, 'degC')
    .replace(/°\s*F|℉/g, 'degF')
    .replace(/°\s*R/g, 'degR')
    .replace(/[µμ]/g, 'u')
    .replace(/Ω/g, 'ohm')
    .replace(/²/g, '^2')
    .replace(/³/g, '^3')
    .replace(/[·⋅]/g, ' ');
}

const unitCache = new Map<string, Unit>();

/** The library's unit for a typed spelling; a UnitError says which spelling was not understood. */
export function parseUnit(unit: string): Unit {
  const spelled = toLibraryUnit(unit);
  const cached = unitCache.get(spelled);
  if (cached) return cached;
  let parsed: Unit;
  try {
    parsed = math.unit(spelled);
  } catch (error) {
    throw new UnitError(
      `unknown unit "${unit}" (${(error as Error).message}); write units as e.g. V, mV, L/min, g/min, kg/s, degC, K, kPa, J/kg`,
    );
  }
  if (parsed.value !== null) {
    throw new UnitError(`"${unit}" has a number in it; give the unit alone, e.g. "L/min"`);
  }
  unitCache.set(spelled, parsed);
  return parsed;
}

/** True when both units measure the same kind of quantity (so one converts to the other). */
export function sameQuantity(a: string, b: string): boolean {
  return parseUnit(a).equalBase(parseUnit(b));
}

/** y = scale·x + offset: a conversion between two units (offset is non-zero for °C ↔ K, °F…). */
export interface LinearConversion {
  scale: number;
  offset: number;
}

/** Every conversion the library offers is linear; we read it off at 0 and 1 once and reuse it. */
export function linearConversion(from: string, to: string): LinearConversion {
  const source = parseUnit(from);
  const target = parseUnit(to);
  if (!source.equalBase(target)) {
    throw new UnitError(
      `cannot convert ${from} to ${to}: they measure different quantities` +
        (isStandardFlowUnit(from) || isStandardFlowUnit(to)
          ? ' (a standard volumetric flow becomes a mass flow only through the gas density at its standard conditions: use a standard-to-mass step)'
          : ''),
    );
  }
  const targetSpelling = toLibraryUnit(to);
  const at = (x: number): number => math.unit(x, toLibraryUnit(from)).toNumber(targetSpelling);
  const offset = at(0);
  return { scale: at(1) - offset, offset };
}

/** A value converted from one unit to another. */
export function convert(value: number, from: string, to: string): number {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new UnitError(`cannot convert ${String(value)} ${from}: not a finite number`);
  }
  const { scale, offset } = linearConversion(from, to);
  return scale * value + offset;
}

/**
 * Factor f with (x in `from`)·(y in `by`) = f·x·y in `to`, e.g. L/min × kg/m^3 → g/min gives 1.
 * A UnitError when the product does not measure what `to` measures.
 */
export function productFactor(from: string, by: string, to: string): number {
  const product = parseUnit(from).multiply(parseUnit(by));
  const target = parseUnit(to);
  if (!product.equalBase(target)) {
    throw new UnitError(`${from} × ${by} does not give ${to}: they measure different quantities`);
  }
  return math.unit(1, toLibraryUnit(from)).multiply(math.unit(1, toLibraryUnit(by))).toNumber(toLibraryUnit(to));
}
