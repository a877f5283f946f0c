// Numbers as an engineer reads them in a report: a few significant digits, units beside values.

/** x to `digits` significant digits (plain notation from 1e-4 to 1e7), or "–" for none. */
export function sig(x: number | null | undefined, digits = 4): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return '–';
  if (x === 0) return '0';
  const abs = Math.abs(x);
  if (abs >= 1e7 || abs < 1e-4) return x.toExponential(digits - 1);
  return String(Number(x.toPrecision(digits)));
}

/**
 * "12.34 ± 0.56 g/min": the uncertainty to two significant digits (GUM, JCGM 100:2008 §7.2.6:
 * at most two), the value to the same last decimal place as the uncertainty.
 */
export function valuePlusMinus(value: number, u: number, unit: string): string {
  let uText = sig(u, 2);
  let valueText = sig(value, 6);
  if (Number.isFinite(u) && u > 0 && Number.isFinite(value) && Math.abs(value) < 1e7 && u >= 1e-4 && u < 1e7) {
    const decimals = Math.max(0, 1 - Math.floor(Math.log10(u)));
    valueText = value.toFixed(decimals);
    uText = u.toFixed(decimals);
  }
  return `${valueText} ± ${uText}${unit ? ` ${unit}` : ''}`;
}

export function percentText(x: number | null | undefined, digits = 3): string {
  return x === null || x === undefined || !Number.isFinite(x) ? '–' : `${sig(x, digits)} %`;
}

/** A mismatch rate (0…1) as "2.5 %", "–" when nothing was compared. */
export function ratePercent(rate: number | null): string {
  return rate === null ? '–' : `${(rate * 100).toFixed(1)} %`;
}

/** The first 12 hex digits of a SHA-256: enough to tell releases apart on screen. */
export function shortHash(hash: string): string {
  return hash.slice(0, 12);
}
