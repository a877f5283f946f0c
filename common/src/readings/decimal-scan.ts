// The decimal grammar shared by the parser and the normaliser: one scanner that either accepts
// the text or names the first thing wrong with it, and one canonical spelling per exact value.

import type { ReadingParseOptions } from '../types/reading';

const UNICODE_MINUS = '\u2212';
const SIGNS = new Set(['+', '-', UNICODE_MINUS]);

const isAsciiDigit = (c: string): boolean => c >= '0' && c <= '9';

export interface ScannedDecimal {
  negative: boolean;
  intDigits: string;
  fracDigits: string;
  /** Exponent as typed, '-' for a negative one, '' when there is none. */
  exponent: string;
}

export type ScanResult = { ok: true; number: ScannedDecimal } | { ok: false; message: string };

/** A character as the reader should see it in a message; invisible ones by code point. */
function describeChar(c: string): string {
  if (/^[\p{L}\p{N}\p{P}\p{S}]$/u.test(c)) return `'${c}'`;
  const code = c.codePointAt(0) ?? 0;
  return `the invisible character U+${code.toString(16).toUpperCase().padStart(4, '0')}`;
}

/** Whole-text problems get one clear message before the character-by-character scan. */
function diagnoseWhole(s: string, options: ReadingParseOptions): string | null {
  if (/\p{L}/u.test(s.replace(/[eE]/g, ''))) {
    return "Not a number: letters are not allowed (only 'e' for an exponent, as in 1.5e3)";
  }
  if (/\p{Nd}/u.test(s.replace(/[0-9]/g, ''))) {
    return 'Use the digits 0-9 only';
  }
  if (/\s/u.test(s)) return 'Spaces are not allowed inside a number (no thousands separators)';
  if (!options.decimalComma && s.includes(',')) {
    return "Use '.' as the decimal separator in this campaign";
  }
  return null;
}

/** Scans the trimmed text against the grammar: sign? digits* (sep digits*)? (e sign? digits+)? */
export function scanDecimal(s: string, options: ReadingParseOptions): ScanResult {
  const whole = diagnoseWhole(s, options);
  if (whole) return { ok: false, message: whole };

  const chars = Array.from(s);
  let i = 0;
  let negative = false;
  if (i < chars.length && SIGNS.has(chars[i])) {
    negative = chars[i] !== '+';
    i++;
  }
  let intDigits = '';
  while (i < chars.length && isAsciiDigit(chars[i])) intDigits += chars[i++];

  let hasSeparator = false;
  let fracDigits = '';
  const isSeparator = (c: string): boolean => c === '.' || (options.decimalComma && c === ',');
  if (i < chars.length && isSeparator(chars[i])) {
    hasSeparator = true;
    i++;
    while (i < chars.length && isAsciiDigit(chars[i])) fracDigits += chars[i++];
  }

  if (intDigits === '' && fracDigits === '') {
    if (i < chars.length && SIGNS.has(chars[i])) return { ok: false, message: 'Only one sign is allowed, at the start' };
    if (i < chars.length && (chars[i] === 'e' || chars[i] === 'E')) {
      return { ok: false, message: "Digits are needed before the exponent 'e'" };
    }
    return { ok: false, message: 'Digits are missing: type the value shown on the display' };
  }
  // ".5" is accepted: a dropped leading zero is a common typing habit and the value is complete.
  // "5." is refused: a separator with nothing after it usually means keystrokes were lost at
  // speed (the reader meant 5.2 or 5.25), and a display never shows a bare trailing point.
  if (hasSeparator && fracDigits === '') {
    return { ok: false, message: 'Digits are missing after the decimal separator' };
  }

  let exponent = '';
  if (i < chars.length && (chars[i] === 'e' || chars[i] === 'E')) {
    i++;
    let expSign = '';
    if (i < chars.length && SIGNS.has(chars[i])) {
      expSign = chars[i] === '+' ? '' : '-';
      i++;
    }
    let expDigits = '';
    while (i < chars.length && isAsciiDigit(chars[i])) expDigits += chars[i++];
    if (expDigits === '') {
      return { ok: false, message: "The exponent needs digits after 'e', as in 1.5e3 or 2e-4" };
    }
    exponent = expSign + expDigits;
    if (i < chars.length && (chars[i] === '.' || chars[i] === ',')) {
      return { ok: false, message: 'The exponent must be a whole number' };
    }
  }

  if (i < chars.length) {
    const c = chars[i];
    if (c === '.' || c === ',') {
      return { ok: false, message: 'Only one decimal separator is allowed (no thousands separators)' };
    }
    if (SIGNS.has(c)) return { ok: false, message: "A sign may only stand at the start or right after 'e'" };
    if (c === 'e' || c === 'E') return { ok: false, message: "Only one exponent 'e' is allowed" };
    return { ok: false, message: `Not a number: ${describeChar(c)} is not allowed` };
  }
  return { ok: true, number: { negative, intDigits, fracDigits, exponent } };
}

/**
 * One spelling per exact decimal value, from the digits alone: "0" for zero (any sign), otherwise
 * "-"? d(.ddd)? with "e<n>" when the exponent is not zero ("12.50" → "1.25e1", "0.5" → "5e-1").
 * The exponent is kept as a BigInt so no amount of typed zeros can round it.
 */
export function canonicalFromScan(n: ScannedDecimal): string {
  let digits = n.intDigits + n.fracDigits;
  let exp = BigInt(n.exponent === '' ? 0 : n.exponent) - BigInt(n.fracDigits.length);
  digits = digits.replace(/^0+/, '');
  if (digits === '') return '0';
  const trimmed = digits.replace(/0+$/, '');
  exp += BigInt(digits.length - trimmed.length);
  const sciExp = exp + BigInt(trimmed.length - 1);
  const mantissa = trimmed.length > 1 ? `${trimmed[0]}.${trimmed.slice(1)}` : trimmed;
  return `${n.negative ? '-' : ''}${mantissa}${sciExp === 0n ? '' : `e${sciExp}`}`;
}
