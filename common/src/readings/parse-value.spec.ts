import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { ParsedReading } from '../types/reading';
import { FLAG_TOKENS, parseReading } from './parse-value';

const DOT = { decimalComma: false };
const COMMA = { decimalComma: true };

function expectNumber(r: ParsedReading): Extract<ParsedReading, { kind: 'number' }> {
  if (r.kind !== 'number') throw new Error(`expected a number, got ${JSON.stringify(r)}`);
  return r;
}

function messageOf(text: string, options = DOT): string {
  const r = parseReading(text, options);
  if (r.kind !== 'error') throw new Error(`expected an error for ${JSON.stringify(text)}, got ${JSON.stringify(r)}`);
  expect(r.text).toBe(text);
  return r.message;
}

describe('parseReading: numbers', () => {
  it('parses integers, decimals, signs and exponents and keeps the text exactly', () => {
    expect(parseReading('12', DOT)).toEqual({ kind: 'number', value: 12, decimals: 0, canonical: '1.2e1', text: '12' });
    expect(parseReading('12.50', DOT)).toEqual({ kind: 'number', value: 12.5, decimals: 2, canonical: '1.25e1', text: '12.50' });
    expect(parseReading('-0.52', DOT)).toMatchObject({ value: -0.52, decimals: 2, canonical: '-5.2e-1' });
    expect(parseReading('+3.1', DOT)).toMatchObject({ value: 3.1, decimals: 1, canonical: '3.1' });
    expect(parseReading('1.5e3', DOT)).toMatchObject({ value: 1500, decimals: 1, canonical: '1.5e3' });
    expect(parseReading('2E-4', DOT)).toMatchObject({ value: 0.0002, decimals: 0, canonical: '2e-4' });
    expect(parseReading('1e+2', DOT)).toMatchObject({ value: 100, canonical: '1e2' });
    expect(parseReading('007', DOT)).toMatchObject({ value: 7, decimals: 0, canonical: '7' });
  });

  it('accepts the Unicode minus sign, also in the exponent', () => {
    expect(parseReading('\u22124.25', DOT)).toMatchObject({ kind: 'number', value: -4.25, text: '\u22124.25' });
    expect(parseReading('5e\u22122', DOT)).toMatchObject({ kind: 'number', value: 0.05 });
  });

  it('trims surrounding whitespace but returns the typed text unchanged', () => {
    const r = expectNumber(parseReading('  12.5\t', DOT));
    expect(r.value).toBe(12.5);
    expect(r.text).toBe('  12.5\t');
  });

  it('accepts a dropped leading zero (".5") and refuses a dangling separator ("5.")', () => {
    expect(parseReading('.5', DOT)).toMatchObject({ kind: 'number', value: 0.5, decimals: 1 });
    expect(parseReading('-.25', DOT)).toMatchObject({ kind: 'number', value: -0.25, decimals: 2 });
    expect(messageOf('5.')).toBe('Digits are missing after the decimal separator');
    expect(messageOf('5,', COMMA)).toBe('Digits are missing after the decimal separator');
    expect(messageOf('5.e3')).toBe('Digits are missing after the decimal separator');
  });

  it('stores minus zero as zero', () => {
    const r = expectNumber(parseReading('-0.0', DOT));
    expect(Object.is(r.value, 0)).toBe(true);
    expect(r.canonical).toBe('0');
    expect(r.decimals).toBe(1);
  });

  it('accepts a decimal comma only when the campaign says so, and still accepts the point', () => {
    expect(parseReading('12,5', COMMA)).toMatchObject({ kind: 'number', value: 12.5, decimals: 1, canonical: '1.25e1' });
    expect(parseReading('12.5', COMMA)).toMatchObject({ kind: 'number', value: 12.5 });
    expect(parseReading('-0,75e2', COMMA)).toMatchObject({ kind: 'number', value: -75 });
    expect(messageOf('12,5')).toBe("Use '.' as the decimal separator in this campaign");
    expect(messageOf('1,234.5')).toBe("Use '.' as the decimal separator in this campaign");
  });

  it('refuses values a double cannot hold instead of storing Infinity or 0', () => {
    expect(messageOf('1e400')).toBe('The number is too large to store');
    expect(messageOf('-1e400')).toBe('The number is too large to store');
    expect(messageOf('1e-400')).toBe('The number is too small to store (it would become 0)');
    expect(parseReading('0e400', DOT)).toMatchObject({ kind: 'number', value: 0, canonical: '0' });
    expect(parseReading('1.7976931348623157e308', DOT)).toMatchObject({ kind: 'number', value: Number.MAX_VALUE });
    expect(parseReading('5e-324', DOT)).toMatchObject({ kind: 'number', value: Number.MIN_VALUE });
  });
});

describe('parseReading: flags', () => {
  it('treats empty and whitespace-only text as blank', () => {
    expect(parseReading('', DOT)).toEqual({ kind: 'flag', flag: 'blank', text: '' });
    expect(parseReading('  \t', DOT)).toEqual({ kind: 'flag', flag: 'blank', text: '  \t' });
  });

  it('recognises the flag tokens the entry screen sends', () => {
    expect(parseReading(FLAG_TOKENS.unreadable, DOT)).toEqual({ kind: 'flag', flag: 'unreadable', text: '#unreadable' });
    expect(parseReading(FLAG_TOKENS.ambiguous, COMMA)).toEqual({ kind: 'flag', flag: 'ambiguous', text: '#ambiguous' });
    expect(parseReading(` ${FLAG_TOKENS.ambiguous} `, DOT)).toMatchObject({ kind: 'flag', flag: 'ambiguous' });
  });

  it('matches flag tokens exactly, so near misses are errors, not flags', () => {
    expect(parseReading('#Unreadable', DOT).kind).toBe('error');
    expect(parseReading('#unread', DOT).kind).toBe('error');
    expect(parseReading('?', DOT).kind).toBe('error');
  });
});

describe('parseReading: errors name what is wrong', () => {
  it.each([
    ['1.2.3', 'Only one decimal separator is allowed (no thousands separators)'],
    ['1e', "The exponent needs digits after 'e', as in 1.5e3 or 2e-4"],
    ['1e-', "The exponent needs digits after 'e', as in 1.5e3 or 2e-4"],
    ['1e2.5', 'The exponent must be a whole number'],
    ['1e2e3', "Only one exponent 'e' is allowed"],
    ['e5', "Digits are needed before the exponent 'e'"],
    ['.', 'Digits are missing: type the value shown on the display'],
    ['-', 'Digits are missing: type the value shown on the display'],
    ['+', 'Digits are missing: type the value shown on the display'],
    ['--5', 'Only one sign is allowed, at the start'],
    ['+-5', 'Only one sign is allowed, at the start'],
    ['5-', "A sign may only stand at the start or right after 'e'"],
    ['0x10', "Not a number: letters are not allowed (only 'e' for an exponent, as in 1.5e3)"],
    ['Infinity', "Not a number: letters are not allowed (only 'e' for an exponent, as in 1.5e3)"],
    ['-Infinity', "Not a number: letters are not allowed (only 'e' for an exponent, as in 1.5e3)"],
    ['NaN', "Not a number: letters are not allowed (only 'e' for an exponent, as in 1.5e3)"],
    ['12 V', "Not a number: letters are not allowed (only 'e' for an exponent, as in 1.5e3)"],
    ['1 000', 'Spaces are not allowed inside a number (no thousands separators)'],
    ['- 5', 'Spaces are not allowed inside a number (no thousands separators)'],
    ['\u0661\u0662', 'Use the digits 0-9 only'],
    ['\uFF11\uFF12', 'Use the digits 0-9 only'],
    ['12%', "Not a number: '%' is not allowed"],
    ['1/2', "Not a number: '/' is not allowed"],
    ['12\u200B5', 'Not a number: the invisible character U+200B is not allowed'],
  ])('%j', (text, message) => {
    expect(messageOf(text)).toBe(message);
  });

  it('with a decimal comma, a second separator of either kind is refused', () => {
    expect(messageOf('1.234,5', COMMA)).toBe('Only one decimal separator is allowed (no thousands separators)');
    expect(messageOf('1,2,3', COMMA)).toBe('Only one decimal separator is allowed (no thousands separators)');
    expect(messageOf('1,5e2,1', COMMA)).toBe('The exponent must be a whole number');
  });
});

describe('parseReading: properties', () => {
  it('gives back every finite double from its JavaScript spelling (including exponent forms)', () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), (d) => {
        const r = expectNumber(parseReading(String(d), DOT));
        expect(r.value).toBe(d === 0 ? 0 : d);
        const c = expectNumber(parseReading(String(d).replace('.', ','), COMMA));
        expect(c.value).toBe(r.value);
      }),
      { numRuns: 2000 },
    );
  });

  it('gives back fixed-point spellings such as a display shows', () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, min: -1e6, max: 1e6 }), fc.integer({ min: 0, max: 6 }), (d, digits) => {
        const text = d.toFixed(digits);
        const r = expectNumber(parseReading(text, DOT));
        expect(r.value).toBe(Number(text) === 0 ? 0 : Number(text));
        expect(r.decimals).toBe(digits);
      }),
    );
  });

  it('never throws and always returns the input text, for any string', () => {
    const anyText = fc.oneof(
      fc.string({ unit: 'binary' }),
      fc.string({ unit: 'grapheme' }),
      fc.string({ unit: fc.constantFrom(...'0123456789.,+-\u2212eE x#\u00A0\u0661') }),
    );
    fc.assert(
      fc.property(anyText, fc.boolean(), (text, decimalComma) => {
        const r = parseReading(text, { decimalComma });
        expect(r.text).toBe(text);
        if (r.kind === 'error') expect(r.message.length).toBeGreaterThan(0);
        if (r.kind === 'number') {
          expect(Number.isFinite(r.value)).toBe(true);
          expect(r.value === 0).toBe(r.canonical === '0');
        }
      }),
      { numRuns: 3000 },
    );
  });
});
