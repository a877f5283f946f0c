import { describe, expect, it } from 'vitest';
import { FLAG_TOKENS } from './parse-value';
import { compareRows, mismatchRate } from './reconcile';

const DOT = { decimalComma: false };

describe('compareRows', () => {
  it('agrees on equal values however they were written', () => {
    expect(compareRows({ t1: '12.50', p1: '-0' }, { t1: '12.5', p1: '0' }, DOT)).toEqual({
      t1: { status: 'agree', reasons: [] },
      p1: { status: 'agree', reasons: [] },
    });
  });

  it('reports a value mismatch with both entries as typed', () => {
    expect(compareRows({ t1: ' 12.5' }, { t1: '12.6' }, DOT).t1).toEqual({
      status: 'mismatch',
      reasons: ['The passes differ: "12.5" (pass 1) and "12.6" (pass 2)'],
    });
  });

  it('makes every flag or invalid entry a mismatch, on either side or both', () => {
    const result = compareRows(
      { a: FLAG_TOKENS.unreadable, b: '3', c: '', d: '1.2.3' },
      { a: FLAG_TOKENS.unreadable, b: FLAG_TOKENS.ambiguous, c: '4', d: '1.2' },
      DOT,
    );
    expect(result.a).toEqual({
      status: 'mismatch',
      reasons: ['Pass 1 is flagged unreadable', 'Pass 2 is flagged unreadable'],
    });
    expect(result.b).toEqual({ status: 'mismatch', reasons: ['Pass 2 is flagged ambiguous (digits changing)'] });
    expect(result.c).toEqual({ status: 'mismatch', reasons: ['Pass 1 is flagged blank (nothing typed)'] });
    expect(result.d).toEqual({
      status: 'mismatch',
      reasons: ['Pass 1 is not a valid number: Only one decimal separator is allowed (no thousands separators)'],
    });
  });

  it('reports missing entries rather than comparing them', () => {
    const result = compareRows({ a: '1', b: null }, { a: null, c: '2' }, { ...DOT, channelIds: ['a', 'b', 'c', 'd'] });
    expect(result).toEqual({
      a: { status: 'missing', reasons: ['Pass 2 has no entry yet'] },
      b: { status: 'missing', reasons: ['Pass 1 has no entry yet', 'Pass 2 has no entry yet'] },
      c: { status: 'missing', reasons: ['Pass 1 has no entry yet'] },
      d: { status: 'missing', reasons: ['Pass 1 has no entry yet', 'Pass 2 has no entry yet'] },
    });
  });

  it('without a channel list, covers the channels of both passes in order', () => {
    expect(Object.keys(compareRows({ b: '1', a: '2' }, { c: '3', a: '2' }, DOT))).toEqual(['b', 'a', 'c']);
  });

  it('treats ids that look like built-in properties as plain channels', () => {
    const ids = ['constructor', 'toString', '__proto__'];
    const result = compareRows({}, JSON.parse('{"__proto__": "7"}'), { ...DOT, channelIds: ids });
    expect(Object.keys(result)).toEqual(ids);
    expect(Object.entries(result).map(([id, cell]) => [id, cell.status, cell.reasons.length])).toEqual([
      ['constructor', 'missing', 2],
      ['toString', 'missing', 2],
      ['__proto__', 'missing', 1],
    ]);
  });

  it('uses the campaign decimal separator', () => {
    expect(compareRows({ a: '12,5' }, { a: '12.50' }, { decimalComma: true }).a.status).toBe('agree');
    const dot = compareRows({ a: '12,5' }, { a: '12.50' }, DOT).a;
    expect(dot.status).toBe('mismatch');
    expect(dot.reasons).toEqual(["Pass 1 is not a valid number: Use '.' as the decimal separator in this campaign"]);
  });
});

describe('mismatchRate', () => {
  it('counts mismatches over compared cells and leaves missing ones out', () => {
    const cells = Object.values(
      compareRows({ a: '1', b: '2', c: '3', d: '4', e: null }, { a: '1', b: '2.0', c: '3.1', d: '', e: '5' }, DOT),
    );
    expect(mismatchRate(cells)).toEqual({ compared: 4, mismatches: 2, rate: 0.5 });
  });

  it('has no rate before anything is compared', () => {
    expect(mismatchRate([])).toEqual({ compared: 0, mismatches: 0, rate: null });
    expect(mismatchRate([{ status: 'missing' }])).toEqual({ compared: 0, mismatches: 0, rate: null });
  });

  it('works across rows', () => {
    const rows = [
      compareRows({ a: '1' }, { a: '1' }, DOT),
      compareRows({ a: '2' }, { a: '3' }, DOT),
      compareRows({ a: '4' }, { a: '4.00' }, DOT),
    ];
    expect(mismatchRate(rows.map((r) => r.a))).toEqual({ compared: 3, mismatches: 1, rate: 1 / 3 });
  });
});
