// Whether two passes agree. Agreement is decided on exact decimal values spelled from the typed
// digits, never on binary doubles: "0.1000000000000000000001" and "0.1" round to the same double
// but are different readings, and a reader who typed more digits than the display has must be
// caught, not silently matched.

import type { ParsedReading, ReadingParseOptions } from '../types/reading';
import { DEFAULT_PARSE_OPTIONS, parseReading } from './parse-value';

/**
 * The canonical decimal spelling of a typed number ("12.50" → "1.25e1", "-0" → "0", "1e1" → "1e1",
 * "10" → "1e1"), or null when the text is not a number (flag or error). Its output parses back to
 * itself, so it is safe to store and compare.
 */
export function canonicalDecimal(text: string, options: ReadingParseOptions = DEFAULT_PARSE_OPTIONS): string | null {
  const parsed = parseReading(text, options);
  return parsed.kind === 'number' ? parsed.canonical : null;
}

/**
 * True only when both are numbers with the same exact value. Any flag or error, on either side,
 * is never agreement: the cell goes to the mismatch list to be resolved against the frame, even
 * when both passes flagged it the same way.
 */
export function sameReading(a: ParsedReading, b: ParsedReading): boolean {
  return a.kind === 'number' && b.kind === 'number' && a.canonical === b.canonical;
}
