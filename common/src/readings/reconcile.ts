// Comparing the two passes of a row, channel by channel, and the mismatch rate shown per reader
// and per channel. Every difference is resolved against the frame, so the reasons are written for
// the person who will look at it.

import type { CellComparison, CellStatus, MismatchRate, ParsedReading, ReadingFlag, ReadingParseOptions } from '../types/reading';
import { sameReading } from './normalise';
import { DEFAULT_PARSE_OPTIONS, parseReading } from './parse-value';

/** Typed text per channel id; null (or no key) when that pass has no entry for the channel yet. */
export type PassEntries = Readonly<Record<string, string | null | undefined>>;

export interface CompareRowsOptions extends ReadingParseOptions {
  /** The sheet's channels in order; a channel with no entry in either pass is then reported missing. */
  channelIds?: readonly string[];
}

const FLAG_WORDS: Record<ReadingFlag, string> = {
  blank: 'blank (nothing typed)',
  unreadable: 'unreadable',
  ambiguous: 'ambiguous (digits changing)',
};

function entry(pass: PassEntries, channelId: string): string | null {
  if (!Object.hasOwn(pass, channelId)) return null;
  const text = pass[channelId];
  return typeof text === 'string' ? text : null;
}

function problem(pass: 1 | 2, reading: ParsedReading): string | null {
  if (reading.kind === 'flag') return `Pass ${pass} is flagged ${FLAG_WORDS[reading.flag]}`;
  if (reading.kind === 'error') return `Pass ${pass} is not a valid number: ${reading.message}`;
  return null;
}

/** One comparison per channel. A blank entry is an entry (a flag), not a missing one. */
export function compareRows(
  pass1: PassEntries,
  pass2: PassEntries,
  options: CompareRowsOptions = DEFAULT_PARSE_OPTIONS,
): Record<string, CellComparison> {
  const parseOptions: ReadingParseOptions = { decimalComma: options.decimalComma };
  const ids = options.channelIds ?? [...new Set([...Object.keys(pass1), ...Object.keys(pass2)])];
  // Built from entries so that an id such as "__proto__" becomes an own property like any other.
  const result: [string, CellComparison][] = [];
  for (const id of ids) {
    const text1 = entry(pass1, id);
    const text2 = entry(pass2, id);
    if (text1 === null || text2 === null) {
      const reasons: string[] = [];
      if (text1 === null) reasons.push('Pass 1 has no entry yet');
      if (text2 === null) reasons.push('Pass 2 has no entry yet');
      result.push([id, { status: 'missing', reasons }]);
      continue;
    }
    const r1 = parseReading(text1, parseOptions);
    const r2 = parseReading(text2, parseOptions);
    if (sameReading(r1, r2)) {
      result.push([id, { status: 'agree', reasons: [] }]);
      continue;
    }
    const reasons = [problem(1, r1), problem(2, r2)].filter((r): r is string => r !== null);
    if (reasons.length === 0) {
      reasons.push(`The passes differ: "${text1.trim()}" (pass 1) and "${text2.trim()}" (pass 2)`);
    }
    result.push([id, { status: 'mismatch', reasons }]);
  }
  return Object.fromEntries(result);
}

/** Rate over any set of cells (one row, a channel's column, all cells a reader entered). */
export function mismatchRate(cells: Iterable<{ status: CellStatus }>): MismatchRate {
  let compared = 0;
  let mismatches = 0;
  for (const cell of cells) {
    if (cell.status === 'missing') continue;
    compared++;
    if (cell.status === 'mismatch') mismatches++;
  }
  return { compared, mismatches, rate: compared === 0 ? null : mismatches / compared };
}
