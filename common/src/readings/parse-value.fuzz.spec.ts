// Property-based fuzzing of the reading parser (issue 7, bad input). The parser faces whatever a
// reader's keyboard, a paste or a hand-made API call sends; it must answer every input with a
// number, a flag or an error message, and a number it accepts must survive being stored as its
// canonical text and parsed again. Properties are "common practice" for a parser: total, stable
// under re-parsing, and its canonical form a fixed point.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { ParsedReading, ReadingParseOptions } from '../types/reading';
import { canonicalDecimal, sameReading } from './normalise';
import { FLAG_TOKENS, parseReading } from './parse-value';

const DOT: ReadingParseOptions = { decimalComma: false };
const COMMA: ReadingParseOptions = { decimalComma: true };

function expectNumber(r: ParsedReading): Extract<ParsedReading, { kind: 'number' }> {
  if (r.kind !== 'number') throw new Error(`expected a number, got ${JSON.stringify(r)}`);
  return r;
}

/** Text a display, a keyboard or a hostile client might produce, mixed. */
const hostileText = fc.oneof(
  fc.string({ unit: 'binary', maxLength: 60 }),
  fc.string({ unit: 'grapheme', maxLength: 60 }),
  fc.string({ unit: fc.constantFrom(...'0123456789.,+-\u2212eE \t\n\u00A0\u200B\u202E\u0000#'), maxLength: 40 }),
  fc.constantFrom('NaN', 'Infinity', '-Infinity', '1e999999999999', '1e-999999999999', '0x10', '1_000', '٣', '１２', '<script>1</script>', '=1+2'),
  fc.string({ unit: fc.constantFrom('9', '0'), minLength: 300, maxLength: 2000 }),
);

/** Digit strings a display could show, spelled every way the grammar allows. */
const decimalParts = fc.record({
  sign: fc.constantFrom('', '+', '-', '\u2212'),
  int: fc.string({ unit: fc.constantFrom(...'0123456789'), maxLength: 25 }),
  frac: fc.string({ unit: fc.constantFrom(...'0123456789'), maxLength: 25 }),
  exp: fc.option(fc.integer({ min: -300, max: 300 }), { nil: null }),
});
type DecimalParts = typeof decimalParts extends fc.Arbitrary<infer T> ? T : never;

function spell(p: DecimalParts, separator = '.'): string {
  const body = p.frac === '' ? p.int || '0' : `${p.int}${separator}${p.frac}`;
  return `${p.sign}${body}${p.exp === null ? '' : `e${p.exp}`}`;
}

describe('parseReading fuzz: total on any input', () => {
  it('never throws, even when handed a value that is not text (a hand-made API body)', () => {
    fc.assert(
      fc.property(fc.oneof(hostileText, fc.anything()), fc.boolean(), (input, decimalComma) => {
        const r = parseReading(input as string, { decimalComma });
        expect(['number', 'flag', 'error']).toContain(r.kind);
        expect(typeof r.text).toBe('string');
        if (r.kind === 'error') expect(r.message.trim().length).toBeGreaterThan(0);
        if (r.kind === 'number') expect(Number.isFinite(r.value)).toBe(true);
        if (typeof input === 'string') expect(r.text).toBe(input);
        else expect(r.kind).toBe('error');
      }),
      { numRuns: 2000 },
    );
  });

  it('an error message never echoes control characters (it is shown beside the cell)', () => {
    fc.assert(
      fc.property(hostileText, (text) => {
        const r = parseReading(text, DOT);
        // eslint-disable-next-line no-control-regex
        if (r.kind === 'error') expect(r.message).not.toMatch(/[\u0000-\u001F\u007F\u200B\u202E]/);
      }),
      { numRuns: 2000 },
    );
  });
});

describe('parseReading fuzz: accepted text round-trips', () => {
  it('an accepted number parses again from its canonical text to the same value and canonical (a fixed point)', () => {
    fc.assert(
      fc.property(fc.oneof(hostileText, decimalParts.map((p) => spell(p))), fc.boolean(), (text, decimalComma) => {
        const first = parseReading(text, { decimalComma });
        if (first.kind !== 'number') return;
        const again = expectNumber(parseReading(first.canonical, { decimalComma }));
        expect(again.canonical).toBe(first.canonical);
        expect(again.value).toBe(first.value);
        expect(sameReading(first, again)).toBe(true);
      }),
      { numRuns: 3000 },
    );
  });

  it('whitespace around accepted text changes nothing but the stored text', () => {
    fc.assert(
      fc.property(decimalParts, fc.constantFrom(' ', '\t', '\u00A0', '\n', '  '), (p, pad) => {
        const text = spell(p);
        const bare = parseReading(text, DOT);
        const padded = parseReading(`${pad}${text}${pad}`, DOT);
        expect(padded.kind).toBe(bare.kind);
        if (bare.kind === 'number') {
          const n = expectNumber(padded);
          expect(n.canonical).toBe(bare.canonical);
          expect(n.value).toBe(bare.value);
          expect(n.text).toBe(`${pad}${text}${pad}`);
        }
      }),
      { numRuns: 1000 },
    );
  });

  it('a decimal comma campaign reads "a,b" exactly as a point campaign reads "a.b"', () => {
    fc.assert(
      fc.property(decimalParts, (p) => {
        const point = parseReading(spell(p, '.'), DOT);
        const comma = parseReading(spell(p, ','), COMMA);
        expect(comma.kind).toBe(point.kind);
        if (point.kind === 'number') expect(expectNumber(comma).canonical).toBe(point.canonical);
      }),
      { numRuns: 1000 },
    );
  });

  it('leading zeros, trailing fractional zeros and moving the point into the exponent keep the same exact value', () => {
    // Exact decimal arithmetic: d × 10^e = (d × 10^k) × 10^(e−k) — common practice.
    fc.assert(
      fc.property(
        decimalParts.filter((p) => /[1-9]/.test(p.int + p.frac)),
        fc.integer({ min: 1, max: 5 }),
        fc.integer({ min: 0, max: 4 }),
        (p, extraZeros, leadingZeros) => {
          const base = parseReading(spell(p), DOT);
          if (base.kind !== 'number') return; // out of the double range: refused, tested elsewhere
          const padded = parseReading(
            spell({ ...p, int: '0'.repeat(leadingZeros) + p.int, frac: p.frac + '0'.repeat(extraZeros) }),
            DOT,
          );
          expect(expectNumber(padded).canonical).toBe(base.canonical);
          // All digits after the point, the point moved into the exponent: 12.5 → 125e-1.
          const shifted = `${p.sign}${p.int}${p.frac}e${(p.exp ?? 0) - p.frac.length}`;
          if (p.int + p.frac === '') return;
          expect(expectNumber(parseReading(shifted, DOT)).canonical).toBe(base.canonical);
        },
      ),
      { numRuns: 1500 },
    );
  });

  it('flags are exact tokens: any other text beginning with # is an error, never a flag or a number', () => {
    fc.assert(
      fc.property(fc.string({ maxLength: 20 }), (tail) => {
        const text = `#${tail}`;
        const r = parseReading(text, DOT);
        if (text.trim() === FLAG_TOKENS.unreadable || text.trim() === FLAG_TOKENS.ambiguous) expect(r.kind).toBe('flag');
        else expect(r.kind).toBe('error');
      }),
      { numRuns: 1000 },
    );
  });
});

describe('parseReading fuzz: a number\u2019s canonical text parses to itself', () => {
  it('for every finite double, canonical(String(d)) is a fixed point and reads back as d', () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), (d) => {
        const canonical = canonicalDecimal(String(d), DOT);
        expect(canonical).not.toBeNull();
        expect(canonicalDecimal(canonical as string, DOT)).toBe(canonical);
        expect(expectNumber(parseReading(canonical as string, DOT)).value).toBe(d === 0 ? 0 : d);
      }),
      { numRuns: 2000 },
    );
  });

  it('the canonical text has one spelling per value: no leading or trailing zeros, one digit before the point', () => {
    fc.assert(
      fc.property(decimalParts, (p) => {
        const canonical = canonicalDecimal(spell(p), DOT);
        if (canonical === null || canonical === '0') return;
        expect(canonical).toMatch(/^-?[1-9](\.\d*[1-9])?(e-?[1-9]\d*)?$/);
      }),
      { numRuns: 1500 },
    );
  });
});
