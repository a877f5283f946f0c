import {
  parseReading,
  sameReading,
  type MismatchCell,
  type Reading,
  type ReadingParseOptions,
  type Resolution,
  type SheetRow,
} from '@dialsheet/common';

// The sheet table's model: rows × channels, each cell holding what the viewer may see of pass 1
// and pass 2. Ten thousand rows of six channels are 60 000 cells; parsing every typed text up
// front costs about as much as the whole render budget, so the comparison uses the server's parsed
// value and flag and falls back to the exact decimal comparison only for equal values typed
// differently ("12.5" and "12.50"). Cell states are worked out for the rows on screen only; the
// filters walk every row when someone picks one.

/** How a cell reads in the table. 'entered' is a single visible pass with a number (nothing to compare with). */
export type CellState = 'agree' | 'mismatch' | 'missing' | 'flagged' | 'resolved' | 'entered';

export type SheetFilter = 'all' | 'flagged' | 'mismatched' | 'warnings';

export interface SheetGrid {
  rows: SheetRow[];
  channelIds: string[];
  /** Readings by row × channel position; null when the viewer may not see that pass. */
  pass1: (Reading | undefined)[] | null;
  pass2: (Reading | undefined)[] | null;
  resolutions: Map<string, Resolution>;
  parseOptions: ReadingParseOptions;
}

export const cellKey = (rowIndex: number, channelId: string): string => `${rowIndex}:${channelId}`;

function place(list: Reading[] | null | undefined, rowCount: number, columns: Map<string, number>): (Reading | undefined)[] | null {
  if (!list) return null;
  const width = columns.size;
  const out = new Array<Reading | undefined>(rowCount * width);
  for (const reading of list) {
    const col = columns.get(reading.channelId);
    if (col === undefined || reading.rowIndex < 0 || reading.rowIndex >= rowCount) continue;
    out[reading.rowIndex * width + col] = reading;
  }
  return out;
}

export function buildSheetGrid({
  rows,
  channelIds,
  pass1,
  pass2,
  mismatches,
  parseOptions,
}: {
  rows: SheetRow[];
  channelIds: string[];
  pass1: Reading[] | null | undefined;
  pass2: Reading[] | null | undefined;
  mismatches: MismatchCell[] | null | undefined;
  parseOptions: ReadingParseOptions;
}): SheetGrid {
  const columns = new Map(channelIds.map((id, i) => [id, i]));
  return attachResolutions(
    {
      rows,
      channelIds,
      pass1: place(pass1, rows.length, columns),
      pass2: place(pass2, rows.length, columns),
      resolutions: new Map(),
      parseOptions,
    },
    mismatches,
  );
}

/** The same grid with the resolutions of a (newer) mismatch list; the entries are not placed again. */
export function attachResolutions(grid: SheetGrid, mismatches: MismatchCell[] | null | undefined): SheetGrid {
  const resolutions = new Map<string, Resolution>();
  for (const cell of mismatches ?? []) {
    if (cell.resolution) resolutions.set(cellKey(cell.rowIndex, cell.channelId), cell.resolution);
  }
  return { ...grid, resolutions };
}

export function readingAt(grid: SheetGrid, pass: 1 | 2, rowIndex: number, col: number): Reading | undefined {
  const list = pass === 1 ? grid.pass1 : grid.pass2;
  return list?.[rowIndex * grid.channelIds.length + col];
}

/** Whether two entries agree after normalising ("12.50" and "12.5" do; a flag never does). */
export function entriesAgree(a: Reading, b: Reading, options: ReadingParseOptions): boolean {
  if (a.flag !== null || b.flag !== null || a.value === null || b.value === null) return false;
  // Different doubles come from different exact decimals; equal doubles may not (too many digits).
  if (a.value !== b.value) return false;
  if (a.rawText.trim() === b.rawText.trim()) return true;
  return sameReading(parseReading(a.rawText, options), parseReading(b.rawText, options));
}

export function cellState(grid: SheetGrid, rowIndex: number, col: number): CellState {
  if (grid.resolutions.has(cellKey(rowIndex, grid.channelIds[col]))) return 'resolved';
  const r1 = readingAt(grid, 1, rowIndex, col);
  const r2 = readingAt(grid, 2, rowIndex, col);
  const both = grid.pass1 !== null && grid.pass2 !== null;
  if (both) {
    if (!r1 || !r2) return 'missing';
    if (entriesAgree(r1, r2, grid.parseOptions)) return 'agree';
    return r1.flag !== null || r2.flag !== null ? 'flagged' : 'mismatch';
  }
  const only = grid.pass1 !== null ? r1 : grid.pass2 !== null ? r2 : undefined;
  if (grid.pass1 === null && grid.pass2 === null) return 'missing';
  if (!only) return 'missing';
  return only.flag !== null ? 'flagged' : 'entered';
}

function cellMatches(grid: SheetGrid, filter: Exclude<SheetFilter, 'all'>, rowIndex: number, col: number): boolean {
  const r1 = readingAt(grid, 1, rowIndex, col);
  const r2 = readingAt(grid, 2, rowIndex, col);
  switch (filter) {
    case 'flagged':
      return (r1?.flag ?? null) !== null || (r2?.flag ?? null) !== null;
    case 'warnings':
      return (r1?.warnings.length ?? 0) > 0 || (r2?.warnings.length ?? 0) > 0;
    case 'mismatched':
      // A resolved cell was a mismatch: it stays in view with its resolution.
      return r1 !== undefined && r2 !== undefined && !entriesAgree(r1, r2, grid.parseOptions);
  }
}

/** The rows with at least one cell the filter picks, in sheet order. */
export function filterRows(grid: SheetGrid, filter: SheetFilter): SheetRow[] {
  if (filter === 'all') return grid.rows;
  const width = grid.channelIds.length;
  return grid.rows.filter((row) => {
    for (let col = 0; col < width; col++) if (cellMatches(grid, filter, row.index, col)) return true;
    return false;
  });
}

/** Whether one cell is what the filter looks for (the table marks those cells in a filtered view). */
export function cellPicked(grid: SheetGrid, filter: SheetFilter, rowIndex: number, col: number): boolean {
  return filter !== 'all' && cellMatches(grid, filter, rowIndex, col);
}
