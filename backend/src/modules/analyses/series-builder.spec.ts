import { describe, expect, it } from 'vitest';
import { findCycle } from '../calibrations/derived-channels.service';
import { resolveCells, type SeriesEntry } from './series-builder';

const sheet = { id: 's1', name: 'Sheet A', startTime: 10, endTime: 20, interval: 5 };
const entry = (rowIndex: number, pass: number, value: number | null, flag: SeriesEntry['flag'] = null, canonical?: string): SeriesEntry => ({
  sheetId: 's1',
  rowIndex,
  pass,
  value,
  flag,
  canonical: canonical ?? (value === null ? null : String(value)),
});

describe('resolveCells', () => {
  it('takes agreed values, a resolution over the passes, one pass alone as unchecked, and skips mismatches and flags', () => {
    const cells = resolveCells(
      [sheet],
      [entry(0, 1, 1.5), entry(0, 2, 1.5), entry(1, 1, 2.5), entry(1, 2, 2.6), entry(2, 1, 3.5)],
      [],
    );
    // Rows at 10, 15, 20 s (start + index × interval).
    expect(cells.t).toEqual([10, 20]);
    expect(cells.raw).toEqual([1.5, 3.5]);
    expect(cells.unchecked).toEqual([false, true]);
    expect(cells.skipped).toEqual([{ t: 15, reason: 'the two passes differ and the mismatch is not resolved yet (sheet “Sheet A”, row 2)' }]);

    const resolved = resolveCells([sheet], [entry(1, 1, 2.5), entry(1, 2, 2.6)], [{ sheetId: 's1', rowIndex: 1, value: 2.55, flag: null }]);
    expect(resolved).toEqual({ t: [15], raw: [2.55], unchecked: [false], skipped: [] });
  });

  it('compares exact decimals ("2.50" and "2.5" agree) and skips cells flagged in both passes or resolved as a flag', () => {
    const cells = resolveCells(
      [sheet],
      [entry(0, 1, 2.5, null, '2.5'), entry(0, 2, 2.5, null, '2.5'), entry(1, 1, null, 'unreadable'), entry(1, 2, null, 'unreadable'), entry(2, 1, 4), entry(2, 2, 5)],
      [{ sheetId: 's1', rowIndex: 2, value: null, flag: 'ambiguous' }],
    );
    expect(cells.t).toEqual([10]);
    expect(cells.skipped.map((s) => [s.t, s.reason.split(' (')[0]])).toEqual([
      [15, 'flagged unreadable in both passes'],
      [20, 'resolved as ambiguous'],
    ]);
  });

  it('orders cells of several sheets by test time and leaves untyped rows out', () => {
    const other = { id: 's2', name: 'Sheet B', startTime: 12, endTime: 13, interval: 1 };
    const cells = resolveCells([sheet, other], [entry(2, 1, 3), { ...entry(0, 1, 9), sheetId: 's2' }, { ...entry(1, 1, 8), sheetId: 's2' }], []);
    expect(cells.t).toEqual([12, 13, 20]);
    expect(cells.raw).toEqual([9, 8, 3]);
  });
});

describe('findCycle', () => {
  it('names the path back to the start, and none without one', () => {
    const graph = new Map<string, string[]>([
      ['A', ['T1', 'B']],
      ['B', ['C']],
      ['C', ['A']],
      ['D', ['T1']],
    ]);
    expect(findCycle('A', graph)).toEqual(['A', 'B', 'C', 'A']);
    expect(findCycle('D', graph)).toBeNull();
  });
});
