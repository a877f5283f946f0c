/**
 * Bad input to an analysis (too few points, a table that is not increasing, t* outside the window
 * without leave to extrapolate…). The message says what is wrong and what to change; it is a
 * RangeError so callers that already treat RangeError as "the user's input" keep working.
 */
export class AnalysisError extends RangeError {
  override name = 'AnalysisError';
}

/** Throws AnalysisError unless `value` is a finite number. */
export function assertFiniteNumber(value: unknown, what: string): asserts value is number {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new AnalysisError(`${what} must be a finite number, got ${String(value)}`);
  }
}
