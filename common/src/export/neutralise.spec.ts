import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { exportCell, FORMULA_TRIGGERS, neutraliseText, startsLikeFormula } from './neutralise';

// Source: OWASP, "CSV Injection" (cells beginning with = + - @ tab or carriage return are
// prefixed with a single quote); MITRE CWE-1236.
describe('neutraliseText (OWASP CSV Injection, CWE-1236)', () => {
  it.each([
    ['=HYPERLINK("http://example.test","x")', `'=HYPERLINK("http://example.test","x")`],
    ['+1+2', "'+1+2"],
    ['-2+3', "'-2+3"],
    ['@SUM(A1:A2)', "'@SUM(A1:A2)"],
    ['\t=1', "'\t=1"],
    ['\r=1', "'\r=1"],
  ])('prefixes %j', (input, expected) => {
    expect(neutraliseText(input)).toBe(expected);
  });

  it('leaves ordinary text alone', () => {
    expect(neutraliseText('outlet settled after valve change')).toBe('outlet settled after valve change');
    expect(neutraliseText('')).toBe('');
    expect(neutraliseText("'quoted")).toBe("'quoted");
  });

  it('keeps numbers as numbers, a negative reading included', () => {
    expect(exportCell(-12.5)).toBe(-12.5);
    expect(exportCell(0)).toBe(0);
    expect(exportCell(Number.NaN)).toBeNull();
    expect(exportCell(null)).toBeNull();
    expect(exportCell(undefined)).toBeNull();
    expect(exportCell(true)).toBe(true);
    expect(exportCell('-12.5')).toBe("'-12.5");
  });

  it('never leaves a text cell starting with a trigger, and only ever adds one quote', () => {
    fc.assert(
      fc.property(fc.string(), (text) => {
        const out = neutraliseText(text);
        expect(startsLikeFormula(out)).toBe(false);
        expect(out === text || out === `'${text}`).toBe(true);
        expect(out !== text).toBe(FORMULA_TRIGGERS.includes(text[0] ?? ''));
      }),
    );
  });
});
