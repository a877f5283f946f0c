import { describe, expect, it } from 'vitest';
import { makeMismatchCell, makeReading, makeResolution, makeRows } from '@/testing/sheet-fixtures';
import { buildSheetGrid, cellState, entriesAgree, filterRows } from './sheet-grid';

const T1 = 't1';
const T2 = 't2';
const comma = { decimalComma: true };
const point = { decimalComma: false };

function reading(pass: 1 | 2, rowIndex: number, channelId: string, rawText: string, value?: number) {
  return makeReading({ pass, rowIndex, channelId, rawText, ...(value !== undefined ? { value } : {}) });
}

describe('entriesAgree', () => {
  it('agrees on the same exact decimal typed differently', () => {
    expect(entriesAgree(reading(1, 0, T1, '12.50'), reading(2, 0, T1, '12.5'), point)).toBe(true);
    expect(entriesAgree(reading(1, 0, T1, '1.25e1', 12.5), reading(2, 0, T1, '12.5'), point)).toBe(true);
    expect(entriesAgree(reading(1, 0, T1, '12,5', 12.5), reading(2, 0, T1, '12.50'), comma)).toBe(true);
  });

  it('does not let equal doubles hide different readings', () => {
    // Both round to the same double; a reader who typed more digits than the display has is caught.
    const long = reading(1, 0, T1, '0.1000000000000000000001', 0.1);
    expect(long.value).toBe(0.1);
    expect(entriesAgree(long, reading(2, 0, T1, '0.1'), point)).toBe(false);
  });

  it('never agrees on a flag, even the same flag twice', () => {
    expect(entriesAgree(reading(1, 0, T1, '#unreadable'), reading(2, 0, T1, '#unreadable'), point)).toBe(false);
    expect(entriesAgree(reading(1, 0, T1, ''), reading(2, 0, T1, ''), point)).toBe(false);
  });

  it('sees different values as different', () => {
    expect(entriesAgree(reading(1, 0, T1, '21.5'), reading(2, 0, T1, '21.6'), point)).toBe(false);
  });
});

describe('sheet grid', () => {
  const rows = makeRows(4);
  const pass1 = [reading(1, 0, T1, '20.1'), reading(1, 1, T1, '20.8'), reading(1, 2, T1, '21.5'), reading(1, 0, T2, '3.1')];
  const pass2 = [reading(2, 0, T1, '20.10'), reading(2, 1, T1, '20.9'), reading(2, 2, T1, '#ambiguous'), reading(2, 0, T2, '3.1')];
  const warned = { ...reading(1, 3, T2, '99.0'), warnings: [{ code: 'above-plausible' as const, message: '99 is above the plausible maximum of 90; check the frame' }] };

  it('states each cell for a viewer who sees both passes', () => {
    const grid = buildSheetGrid({
      rows,
      channelIds: [T1, T2],
      pass1: [...pass1, warned],
      pass2,
      mismatches: [makeMismatchCell(pass1[1], pass2[1], makeResolution({ rowIndex: 1, channelId: T1, rawText: '20.8' }))],
      parseOptions: point,
    });
    expect([0, 1, 2, 3].map((row) => cellState(grid, row, 0))).toEqual(['agree', 'resolved', 'flagged', 'missing']);
    expect([0, 1, 2, 3].map((row) => cellState(grid, row, 1))).toEqual(['agree', 'missing', 'missing', 'missing']);
    expect(filterRows(grid, 'mismatched').map((r) => r.index)).toEqual([1, 2]);
    expect(filterRows(grid, 'flagged').map((r) => r.index)).toEqual([2]);
    expect(filterRows(grid, 'warnings').map((r) => r.index)).toEqual([3]);
    expect(filterRows(grid, 'all')).toBe(rows);
  });

  it('shows one pass alone without comparing it to anything', () => {
    const grid = buildSheetGrid({ rows, channelIds: [T1, T2], pass1: null, pass2, mismatches: null, parseOptions: point });
    expect([0, 1, 2, 3].map((row) => cellState(grid, row, 0))).toEqual(['entered', 'entered', 'flagged', 'missing']);
    expect(filterRows(grid, 'mismatched')).toEqual([]);
    expect(filterRows(grid, 'flagged').map((r) => r.index)).toEqual([2]);
  });

  it('ignores readings outside the sheet’s rows and channels', () => {
    const stray = [reading(1, 9, T1, '1.0'), reading(1, 0, 'gone', '1.0')];
    const grid = buildSheetGrid({ rows, channelIds: [T1], pass1: stray, pass2: [], mismatches: null, parseOptions: point });
    expect(grid.pass1?.filter(Boolean)).toEqual([]);
  });
});
