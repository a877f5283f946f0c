import { describe, expect, it } from 'vitest';
import { layOutSheetGrid, type Reading, type Resolution, type SheetRow } from '@dialsheet/common';
import { makeReading, makeResolution, makeRows, makeSheetGrid, makeSheetGridWire } from '@/testing/sheet-fixtures';
import { buildTableGrid, cellState, entriesAgree, entryAt, filterRows, withReading, withResolution } from './sheet-grid';

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

/** The table's model of a server answer laid out from these readings. */
function tableOf(opts: {
  rows: SheetRow[];
  channelIds: string[];
  pass1: Reading[] | null;
  pass2: Reading[] | null;
  resolutions?: Resolution[] | null;
  columns?: string[];
}) {
  const { columns, ...wire } = opts;
  return buildTableGrid({ grid: makeSheetGrid(wire), channelIds: columns ?? opts.channelIds, parseOptions: point });
}

describe('sheet grid', () => {
  const rows = makeRows(4);
  const pass1 = [reading(1, 0, T1, '20.1'), reading(1, 1, T1, '20.8'), reading(1, 2, T1, '21.5'), reading(1, 0, T2, '3.1')];
  const pass2 = [reading(2, 0, T1, '20.10'), reading(2, 1, T1, '20.9'), reading(2, 2, T1, '#ambiguous'), reading(2, 0, T2, '3.1')];
  const warned = { ...reading(1, 3, T2, '99.0'), warnings: [{ code: 'above-plausible' as const, message: '99 is above the plausible maximum of 90; check the frame' }] };

  it('states each cell for a viewer who sees both passes', () => {
    const grid = tableOf({
      rows,
      channelIds: [T1, T2],
      pass1: [...pass1, warned],
      pass2,
      resolutions: [makeResolution({ rowIndex: 1, channelId: T1, rawText: '20.8' })],
    });
    expect([0, 1, 2, 3].map((row) => cellState(grid, row, 0))).toEqual(['agree', 'resolved', 'flagged', 'missing']);
    expect([0, 1, 2, 3].map((row) => cellState(grid, row, 1))).toEqual(['agree', 'missing', 'missing', 'missing']);
    expect(filterRows(grid, 'mismatched').map((r) => r.index)).toEqual([1, 2]);
    expect(filterRows(grid, 'flagged').map((r) => r.index)).toEqual([2]);
    expect(filterRows(grid, 'warnings').map((r) => r.index)).toEqual([3]);
    // 'all' hands back the model's own row list: no walk over ten thousand rows.
    expect(filterRows(grid, 'all')).toBe(grid.rows);
    expect(grid.rows).toEqual(rows);
  });

  it('shows one pass alone without comparing it to anything', () => {
    const grid = tableOf({ rows, channelIds: [T1, T2], pass1: null, pass2 });
    expect([0, 1, 2, 3].map((row) => cellState(grid, row, 0))).toEqual(['entered', 'entered', 'flagged', 'missing']);
    expect(filterRows(grid, 'mismatched')).toEqual([]);
    expect(filterRows(grid, 'flagged').map((r) => r.index)).toEqual([2]);
  });

  it('reads the server’s cells in the page’s channel order, and nothing outside the sheet', () => {
    // The server sends T2 before T1; the table's columns are T1, T2, and a channel it does not know.
    const grid = tableOf({ rows, channelIds: [T2, T1], pass1, pass2: null, columns: [T1, T2, 'gone'] });
    expect(entryAt(grid, 1, 0, 0)?.rawText).toBe('20.1');
    expect(entryAt(grid, 1, 0, 1)?.rawText).toBe('3.1');
    expect(entryAt(grid, 1, 0, 2)).toBeUndefined();
    expect(entryAt(grid, 1, 4, 0)).toBeUndefined();
    expect(entryAt(grid, 1, -1, 0)).toBeUndefined();
    expect(cellState(grid, 0, 2)).toBe('missing');
    expect(grid.rows).toEqual(rows);
  });

  it('keeps a resolution only while its cell is a mismatch, as the mismatch list does', () => {
    // Row 0 agrees now (the reader corrected pass 1 after a lead resolved it): no longer shown.
    const grid = tableOf({
      rows,
      channelIds: [T1, T2],
      pass1,
      pass2,
      resolutions: [makeResolution({ rowIndex: 0, channelId: T1, rawText: '20.1' }), makeResolution({ rowIndex: 2, channelId: T1, rawText: '21.5' })],
    });
    expect([...grid.resolutions.keys()]).toEqual([`2:${T1}`]);
    expect(cellState(grid, 0, 0)).toBe('agree');
    expect(cellState(grid, 2, 0)).toBe('resolved');
  });

  it('gets from the route’s answer, laid out, the grid the table reads (the two fixtures agree)', () => {
    const limits = [{ plausibleMin: 0, plausibleMax: 90 }, { plausibleMin: 0, plausibleMax: 90 }];
    const plan = { rows, channelIds: [T1, T2], pass1: [...pass1, { ...warned, value: 99 }], pass2, editPass: 2 as const };
    expect(layOutSheetGrid(makeSheetGridWire({ ...plan, limits }))).toEqual(makeSheetGrid(plan));
  });

  it('puts a saved reading and a saved resolution into the server’s grid without touching the rest', () => {
    const wire = makeSheetGrid({ rows, channelIds: [T1, T2], pass1, pass2, editPass: 2 });
    const saved = { ...reading(2, 1, T1, '20.8'), version: 2, warnings: [{ code: 'above-plausible' as const, message: 'check the frame' }] };
    const next = withReading(wire, saved);
    expect(next.pass2?.rawText[2]).toBe('20.8');
    expect(next.pass2?.edit?.version[2]).toBe(2);
    expect(entryAt(buildTableGrid({ grid: next, channelIds: [T1, T2], parseOptions: point }), 2, 1, 0)).toMatchObject({ version: 2, frameTime: 2.5 });
    // Pass 1 is not the viewer's to change: it carries no versions, and a reading put in keeps it so.
    expect(withReading(next, { ...reading(1, 0, T1, '20.2'), version: 2 }).pass1?.edit).toBeNull();
    expect(next.pass2?.warnings[2]).toEqual(saved.warnings);
    expect(wire.pass2?.rawText[2]).toBe('20.9');
    expect(next.pass1).toBe(wire.pass1);
    const table = buildTableGrid({ grid: next, channelIds: [T1, T2], parseOptions: point });
    expect(cellState(table, 1, 0)).toBe('agree');
    expect(filterRows(table, 'warnings').map((r) => r.index)).toEqual([1]);
    // A pass the viewer does not see, or a channel off the sheet, leaves the grid as it was.
    const blind = makeSheetGrid({ rows, channelIds: [T1, T2], pass1: null, pass2 });
    expect(withReading(blind, reading(1, 0, T1, '1.0'))).toBe(blind);
    expect(withReading(wire, reading(1, 0, 'gone', '1.0'))).toBe(wire);

    const first = makeResolution({ rowIndex: 2, channelId: T1, rawText: '21.5' });
    const withOne = withResolution({ ...wire, resolutions: [] }, first);
    expect(withOne.resolutions).toEqual([first]);
    const changed = { ...first, rawText: '21.6', version: 2 };
    expect(withResolution(withOne, changed).resolutions).toEqual([changed]);
    expect(withResolution(wire, first)).toBe(wire);
  });
});
