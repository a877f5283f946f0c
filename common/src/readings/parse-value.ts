// Strict parsing of a typed reading. A reading is transcribed from a display, so anything a
// display would not show (thousands separators, units, hex, words) is an error with a message the
// reader can act on, never a guess. The typed text is returned unchanged with every result.

import type { ParsedReading, ReadingFlag, ReadingParseOptions } from '../types/reading';
import { canonicalFromScan, scanDecimal } from './decimal-scan';

/**
 * What the entry screen sends when the reader flags a cell instead of typing a value. Words rather
 * than single symbols so they read plainly in the sheet table and in exports, and so they can never
 * be mistaken for a number or a spreadsheet formula; '?' is kept free for the shortcut sheet.
 */
export const FLAG_TOKENS = {
  unreadable: '#unreadable',
  ambiguous: '#ambiguous',
} as const satisfies Record<Exclude<ReadingFlag, 'blank'>, string>;

export const DEFAULT_PARSE_OPTIONS: ReadingParseOptions = { decimalComma: false };

/** String(value), except that objects such as {"toString": []} from a hand-made request body make it throw. */
function safeString(value: unknown): string {
  try {
    return String(value);
  } catch {
    return '';
  }
}

/**
 * Parses what a reader typed. Never throws: every input gives a number, a flag or an error with a
 * message. Whitespace around the text is ignored; the returned `text` is the input unchanged.
 */
export function parseReading(text: string, options: ReadingParseOptions = DEFAULT_PARSE_OPTIONS): ParsedReading {
  if (typeof text !== 'string') {
    return { kind: 'error', message: 'A reading must be text', text: safeString(text) };
  }
  const s = text.trim();
  if (s === '') return { kind: 'flag', flag: 'blank', text };
  if (s === FLAG_TOKENS.unreadable) return { kind: 'flag', flag: 'unreadable', text };
  if (s === FLAG_TOKENS.ambiguous) return { kind: 'flag', flag: 'ambiguous', text };

  const scanned = scanDecimal(s, options);
  if (!scanned.ok) return { kind: 'error', message: scanned.message, text };
  const n = scanned.number;

  const canonical = canonicalFromScan(n);
  const ascii = `${n.intDigits || '0'}${n.fracDigits ? `.${n.fracDigits}` : ''}${n.exponent ? `e${n.exponent}` : ''}`;
  const magnitude = Number(ascii);
  if (!Number.isFinite(magnitude)) {
    return { kind: 'error', message: 'The number is too large to store', text };
  }
  if (magnitude === 0 && canonical !== '0') {
    return { kind: 'error', message: 'The number is too small to store (it would become 0)', text };
  }
  // -0 is stored as 0: a display showing "-0.0" means zero, and -0 would surprise later arithmetic.
  const value = n.negative && magnitude !== 0 ? -magnitude : magnitude;
  return { kind: 'number', value, decimals: n.fracDigits.length, canonical, text };
}
