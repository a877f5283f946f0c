import { describe, expect, it } from 'vitest';
import { canonicalFromScan, scanDecimal } from './decimal-scan';

const DOT = { decimalComma: false };

describe('scanDecimal', () => {
  it('splits sign, integer digits, fraction digits and exponent as typed', () => {
    expect(scanDecimal('-012.340e+05', DOT)).toEqual({
      ok: true,
      number: { negative: true, intDigits: '012', fracDigits: '340', exponent: '05' },
    });
    expect(scanDecimal('\u2212.5E\u22123', DOT)).toEqual({
      ok: true,
      number: { negative: true, intDigits: '', fracDigits: '5', exponent: '-3' },
    });
    expect(scanDecimal('+7', DOT)).toEqual({ ok: true, number: { negative: false, intDigits: '7', fracDigits: '', exponent: '' } });
  });

  it('treats the comma as a separator only when asked', () => {
    expect(scanDecimal('3,25', { decimalComma: true })).toMatchObject({ ok: true, number: { intDigits: '3', fracDigits: '25' } });
    expect(scanDecimal('3,25', DOT)).toEqual({ ok: false, message: "Use '.' as the decimal separator in this campaign" });
  });
});

describe('canonicalFromScan', () => {
  const canon = (negative: boolean, intDigits: string, fracDigits: string, exponent = ''): string =>
    canonicalFromScan({ negative, intDigits, fracDigits, exponent });

  it('writes one digit before the point and a power of ten, without leading or trailing zeros', () => {
    expect(canon(false, '12', '50')).toBe('1.25e1');
    expect(canon(false, '0012', '5000')).toBe('1.25e1');
    expect(canon(false, '', '125', '2')).toBe('1.25e1');
    expect(canon(false, '1250', '', '-2')).toBe('1.25e1');
    expect(canon(true, '0', '0052')).toBe('-5.2e-3');
    expect(canon(false, '3', '')).toBe('3');
    expect(canon(false, '100', '')).toBe('1e2');
  });

  it('writes every zero as "0", whatever its sign, point or exponent', () => {
    expect(canon(true, '0', '')).toBe('0');
    expect(canon(false, '', '000', '-7')).toBe('0');
    expect(canon(true, '000', '0', '99999999999999999999999')).toBe('0');
  });

  it('keeps exponents exact beyond the range of a double', () => {
    expect(canon(false, '1', '', '12345678901234567890123')).toBe('1e12345678901234567890123');
    expect(canon(false, '1', '', '12345678901234567890124')).not.toBe(canon(false, '1', '', '12345678901234567890123'));
  });
});
