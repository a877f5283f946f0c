import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { canonicalDecimal, sameReading } from './normalise';
import { FLAG_TOKENS, parseReading } from './parse-value';

const DOT = { decimalComma: false };
const p = (text: string, options = DOT) => parseReading(text, options);
const agree = (a: string, b: string, options = DOT): boolean => sameReading(p(a, options), p(b, options));

describe('canonicalDecimal', () => {
  it('spells equal values the same way', () => {
    expect(canonicalDecimal('12.50')).toBe('1.25e1');
    expect(canonicalDecimal('12.5')).toBe('1.25e1');
    expect(canonicalDecimal('1e1')).toBe('1e1');
    expect(canonicalDecimal('10')).toBe('1e1');
    expect(canonicalDecimal('-0')).toBe('0');
    expect(canonicalDecimal('+0.000e5')).toBe('0');
    expect(canonicalDecimal('0,75', { decimalComma: true })).toBe('7.5e-1');
  });

  it('returns null for flags and errors', () => {
    expect(canonicalDecimal('')).toBeNull();
    expect(canonicalDecimal(FLAG_TOKENS.unreadable)).toBeNull();
    expect(canonicalDecimal('12,5')).toBeNull();
    expect(canonicalDecimal('abc')).toBeNull();
  });
});

describe('sameReading', () => {
  it('agrees on equal values written differently', () => {
    expect(agree('12.50', '12.5')).toBe(true);
    expect(agree('-0', '0')).toBe(true);
    expect(agree('1e1', '10')).toBe(true);
    expect(agree('\u22121.5', '-1.50')).toBe(true);
    expect(agree(' 3.0 ', '+3')).toBe(true);
    expect(agree('.5', '0.5')).toBe(true);
  });

  it('disagrees on different values, including ones that round to the same double', () => {
    expect(agree('12.5', '12.6')).toBe(false);
    expect(agree('12.5', '-12.5')).toBe(false);
    expect(agree('125', '12.5')).toBe(false);
    expect(Number('0.1000000000000000000001')).toBe(0.1);
    expect(agree('0.1000000000000000000001', '0.1')).toBe(false);
    expect(Number('9007199254740993')).toBe(9007199254740992);
    expect(agree('9007199254740993', '9007199254740992')).toBe(false);
  });

  it('does not let float arithmetic decide: 0.3 and 0.1+0.2 spelled out differ, 0.30 and 0.3 agree', () => {
    expect(agree(String(0.1 + 0.2), '0.3')).toBe(false);
    expect(agree('0.30', '0.3')).toBe(true);
  });

  it('never agrees when either side is flagged or not a number, even the same flag twice', () => {
    expect(agree(FLAG_TOKENS.unreadable, FLAG_TOKENS.unreadable)).toBe(false);
    expect(agree(FLAG_TOKENS.ambiguous, FLAG_TOKENS.ambiguous)).toBe(false);
    expect(agree('', '')).toBe(false);
    expect(agree('', '0')).toBe(false);
    expect(agree('12.5', FLAG_TOKENS.ambiguous)).toBe(false);
    expect(agree('1.2.3', '1.2.3')).toBe(false);
  });
});

// Decimal texts built from a few digits so that equal values turn up often.
const digitsArb = fc.string({ unit: fc.constantFrom('0', '1', '5'), maxLength: 4 });
const decimalParts = fc.record({
  sign: fc.constantFrom('', '-', '+', '\u2212'),
  int: digitsArb,
  frac: digitsArb,
  exp: fc.option(fc.integer({ min: -30, max: 30 }), { nil: undefined }),
});
type Parts = { sign: string; int: string; frac: string; exp: number | undefined };
const spell = ({ sign, int, frac, exp }: Parts, extraZeros = 0): string => {
  const int1 = int === '' && frac === '' ? '0' : int;
  const fraction = frac + '0'.repeat(extraZeros);
  return `${sign}${int1}${fraction ? `.${fraction}` : ''}${exp === undefined ? '' : `e${exp}`}`;
};

describe('normalising: properties', () => {
  it('canonicalDecimal is idempotent', () => {
    fc.assert(
      fc.property(decimalParts, (parts) => {
        const once = canonicalDecimal(spell(parts));
        expect(once).not.toBeNull();
        expect(canonicalDecimal(once as string)).toBe(once);
      }),
    );
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), (d) => {
        const once = canonicalDecimal(String(d)) as string;
        expect(canonicalDecimal(once)).toBe(once);
        expect(Number(once)).toBe(d === 0 ? 0 : d);
      }),
    );
  });

  it('sameReading is reflexive and symmetric for numbers', () => {
    fc.assert(
      fc.property(decimalParts, decimalParts, (x, y) => {
        const a = p(spell(x));
        const b = p(spell(y));
        expect(sameReading(a, a)).toBe(true);
        expect(sameReading(a, b)).toBe(sameReading(b, a));
      }),
    );
  });

  it('agrees exactly when the exact decimal values are equal', () => {
    // Reference: scale both to integers (BigInt) at a common power of ten and compare.
    const exact = ({ sign, int, frac, exp }: Parts): [bigint, number] => {
      const m = BigInt(`${int}${frac}` || '0') * (sign === '-' || sign === '\u2212' ? -1n : 1n);
      return [m, (exp ?? 0) - frac.length];
    };
    const equal = (x: Parts, y: Parts): boolean => {
      const [mx, ex] = exact(x);
      const [my, ey] = exact(y);
      const e = Math.min(ex, ey);
      return mx * 10n ** BigInt(ex - e) === my * 10n ** BigInt(ey - e);
    };
    fc.assert(
      fc.property(decimalParts, decimalParts, (x, y) => {
        expect(sameReading(p(spell(x)), p(spell(y)))).toBe(equal(x, y));
      }),
      { numRuns: 3000 },
    );
  });

  it('moving the decimal point into the exponent keeps agreement', () => {
    fc.assert(
      fc.property(decimalParts, (parts) => {
        const allDigits = `${parts.int}${parts.frac}` || '0';
        const shifted = `${parts.sign}${allDigits}e${(parts.exp ?? 0) - parts.frac.length}`;
        expect(sameReading(p(spell(parts)), p(shifted))).toBe(true);
      }),
    );
  });

  it('adding trailing zeros after the decimal point never changes agreement', () => {
    fc.assert(
      fc.property(decimalParts, decimalParts, fc.integer({ min: 1, max: 5 }), (x, y, zeros) => {
        const b = p(spell(y));
        expect(sameReading(p(spell(x, zeros)), b)).toBe(sameReading(p(spell(x)), b));
        expect(sameReading(p(spell(x, zeros)), p(spell(x)))).toBe(true);
      }),
    );
  });
});
