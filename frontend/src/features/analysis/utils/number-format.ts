// Numbers as an engineer reads them: a few significant digits, never "1e-7" for an everyday size.

/** x to `digits` significant digits (plain notation from 1e-4 to 1e7), or "–" for none. */
export function sig(x: number | null | undefined, digits = 4): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return '–';
  if (x === 0) return '0';
  const abs = Math.abs(x);
  if (abs >= 1e7 || abs < 1e-4) return x.toExponential(digits - 1);
  return String(Number(x.toPrecision(digits)));
}

/** "12.3 ± 0.4 g/min" */
export function plusMinus(value: number, u: number, unit: string, digits = 4): string {
  return `${sig(value, digits)} ± ${sig(u, 2)}${unit ? ` ${unit}` : ''}`;
}

/** "[1.20, 1.35] unit" */
export function interval(low: number, high: number, unit: string, digits = 4): string {
  return `[${sig(low, digits)}, ${sig(high, digits)}]${unit ? ` ${unit}` : ''}`;
}

export function percent(x: number | null | undefined, digits = 3): string {
  return x === null || x === undefined || !Number.isFinite(x) ? '–' : `${sig(x, digits)} %`;
}

/** The message of a thrown value (an AnalysisError says what to change). */
export function thrownMessage(error: unknown): string {
  return error instanceof Error ? error.message : String(error);
}
