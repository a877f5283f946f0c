/**
 * Bad input to an analysis (too few points, a table that is not increasing, t* outside the window
 * without leave to extrapolate…). The message says what is wrong and what to change; it is a
 * RangeError so callers that already treat RangeError as "the user's input" keep working.
 */
export class AnalysisError extends RangeError {
  override name = 'AnalysisError';
}

/**
 * A value as a message may show it. String() itself throws on objects without a usable toString
 * (JSON such as {"toString": null} reaches us from request bodies), which would turn a 400 into a 500.
 */
export function describeValue(value: unknown): string {
  try {
    return String(value);
  } catch {
    return typeof value === 'object' && value !== null ? 'an object' : typeof value;
  }
}

/** Throws AnalysisError unless `value` is a finite number. */
export function assertFiniteNumber(value: unknown, what: string): asserts value is number {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new AnalysisError(`${what} must be a finite number, got ${describeValue(value)}`);
  }
}
