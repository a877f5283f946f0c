import {
  parseReading,
  sameReading,
  type LimitWarning,
  type Reading,
  type ReadingFlag,
  type ReadingParseOptions,
  type Resolution,
  type SheetGrid,
  type SheetGridPass,
  type SheetRow,
} from '@dialsheet/common';

// The sheet table's model: rows × channels, each cell holding what the viewer may see of pass 1
// and pass 2. The server sends each pass as column-wise arrays in row × channel order
// (`GET /sheets/:id/grid`), and the table reads them in place: nothing is done per cell up front,
// so ten thousand rows of six channels open as fast as the answer is parsed. Cell states are
// worked out for the rows on screen only; the filters walk every row when someone picks one. The
// comparison uses the server's flag and the typed texts, and parses only texts that differ
// (most cells are typed alike), to compare their exact decimals ("12.5" and "12.50" agree).

/** How a cell reads in the table. 'entered' is a single visible pass with a number (nothing to compare with). */
export type CellState = 'agree' | 'mismatch' | 'missing' | 'flagged' | 'resolved' | 'entered';

export type SheetFilter = 'all' | 'flagged' | 'mismatched' | 'warnings';

/** One pass's entry of one cell, as the table shows and changes it. */
export interface GridEntry {
  rawText: string;
  flag: ReadingFlag | null;
  /** The stored version and frame, known only in a pass the viewer may change (null otherwise). */
  version: number | null;
  frameTime: number | null;
  warnings: LimitWarning[];
}

export interface TableGrid {
  rows: SheetRow[];
  /** The table's columns: the page's channels, in entry order. */
  channelIds: string[];
  /** Where each of the table's columns is in the server's row × channel order (-1: not there). */
  serverCols: number[];
  /** Channels per row in the server's arrays. */
  serverWidth: number;
  /** The server's columns of each pass; null when the viewer may not see that pass. */
  pass1: SheetGridPass | null;
  pass2: SheetGridPass | null;
  /** Resolutions of cells that are mismatches now, by `cellKey`. */
  resolutions: Map<string, Resolution>;
  parseOptions: ReadingParseOptions;
}

export const cellKey = (rowIndex: number, channelId: string): string => `${rowIndex}:${channelId}`;

const NO_WARNINGS: LimitWarning[] = [];

function entryOf(pass: SheetGridPass | null, i: number): GridEntry | undefined {
  const rawText = pass?.rawText[i];
  if (!pass || rawText === null || rawText === undefined) return undefined;
  return {
    rawText,
    flag: pass.flag[i] ?? null,
    version: pass.edit?.version[i] ?? null,
    frameTime: pass.edit?.frameTime[i] ?? null,
    warnings: pass.warnings[i] ?? NO_WARNINGS,
  };
}

/**
 * The table's model of the server's grid; `rows` alone (no pass visible) when there is none. A
 * resolution is kept only while its cell is a mismatch, as the mismatch list keeps it.
 */
export function buildTableGrid({
  grid,
  channelIds,
  rows,
  parseOptions,
}: {
  grid: SheetGrid | null | undefined;
  /** The table's columns (the page's channels); the server's order is followed through them. */
  channelIds: string[];
  /** The rows to show when there is no grid (a viewer who may see neither pass). */
  rows?: SheetRow[];
  parseOptions: ReadingParseOptions;
}): TableGrid {
  if (!grid) {
    return { rows: rows ?? [], channelIds, serverCols: channelIds.map(() => -1), serverWidth: 0, pass1: null, pass2: null, resolutions: new Map(), parseOptions };
  }
  const width = grid.channelIds.length;
  const columns = new Map(grid.channelIds.map((id, i) => [id, i]));
  const resolutions = new Map<string, Resolution>();
  for (const resolution of grid.resolutions ?? []) {
    const col = columns.get(resolution.channelId);
    if (col === undefined || resolution.rowIndex < 0 || resolution.rowIndex >= grid.testTimes.length) continue;
    const i = resolution.rowIndex * width + col;
    const a = entryOf(grid.pass1, i);
    const b = entryOf(grid.pass2, i);
    if (a && b && !entriesAgree(a, b, parseOptions)) resolutions.set(cellKey(resolution.rowIndex, resolution.channelId), resolution);
  }
  return {
    rows: grid.testTimes.map((testTime, index) => ({ index, testTime })),
    channelIds,
    serverCols: channelIds.map((id) => columns.get(id) ?? -1),
    serverWidth: width,
    pass1: grid.pass1,
    pass2: grid.pass2,
    resolutions,
    parseOptions,
  };
}

/** The position in the server's arrays of a table cell; -1 when the server has no such cell. */
function serverIndex(grid: TableGrid, rowIndex: number, col: number): number {
  const at = grid.serverCols[col] ?? -1;
  if (at < 0 || rowIndex < 0 || rowIndex >= grid.rows.length) return -1;
  return rowIndex * grid.serverWidth + at;
}

export function entryAt(grid: TableGrid, pass: 1 | 2, rowIndex: number, col: number): GridEntry | undefined {
  const i = serverIndex(grid, rowIndex, col);
  return i < 0 ? undefined : entryOf(pass === 1 ? grid.pass1 : grid.pass2, i);
}

type Comparable = Pick<GridEntry, 'rawText' | 'flag'>;

/** Whether two entries agree after normalising ("12.50" and "12.5" do; a flag never does). */
export function entriesAgree(a: Comparable, b: Comparable, options: ReadingParseOptions): boolean {
  if (a.flag !== null || b.flag !== null) return false;
  // The same text is the same number (both were parsed by the same rules when saved).
  if (a.rawText.trim() === b.rawText.trim()) return true;
  // Compared as exact decimals, never as doubles: too many digits can round to the same double.
  return sameReading(parseReading(a.rawText, options), parseReading(b.rawText, options));
}

export function cellState(grid: TableGrid, rowIndex: number, col: number): CellState {
  if (grid.resolutions.has(cellKey(rowIndex, grid.channelIds[col]))) return 'resolved';
  const r1 = entryAt(grid, 1, rowIndex, col);
  const r2 = entryAt(grid, 2, rowIndex, col);
  const both = grid.pass1 !== null && grid.pass2 !== null;
  if (both) {
    if (!r1 || !r2) return 'missing';
    if (entriesAgree(r1, r2, grid.parseOptions)) return 'agree';
    return r1.flag !== null || r2.flag !== null ? 'flagged' : 'mismatch';
  }
  const only = grid.pass1 !== null ? r1 : grid.pass2 !== null ? r2 : undefined;
  if (!only) return 'missing';
  return only.flag !== null ? 'flagged' : 'entered';
}

function cellMatches(grid: TableGrid, filter: Exclude<SheetFilter, 'all'>, rowIndex: number, col: number): boolean {
  const i = serverIndex(grid, rowIndex, col);
  if (i < 0) return false;
  switch (filter) {
    case 'flagged':
      return (grid.pass1?.flag[i] ?? null) !== null || (grid.pass2?.flag[i] ?? null) !== null;
    case 'warnings':
      return (grid.pass1?.warnings[i]?.length ?? 0) > 0 || (grid.pass2?.warnings[i]?.length ?? 0) > 0;
    case 'mismatched': {
      // A resolved cell was a mismatch: it stays in view with its resolution.
      const r1 = entryOf(grid.pass1, i);
      const r2 = entryOf(grid.pass2, i);
      return r1 !== undefined && r2 !== undefined && !entriesAgree(r1, r2, grid.parseOptions);
    }
  }
}

/** The rows with at least one cell the filter picks, in sheet order. */
export function filterRows(grid: TableGrid, filter: SheetFilter): SheetRow[] {
  if (filter === 'all') return grid.rows;
  const width = grid.channelIds.length;
  return grid.rows.filter((row) => {
    for (let col = 0; col < width; col++) if (cellMatches(grid, filter, row.index, col)) return true;
    return false;
  });
}

/** Whether one cell is what the filter looks for (the table marks those cells in a filtered view). */
export function cellPicked(grid: TableGrid, filter: SheetFilter, rowIndex: number, col: number): boolean {
  return filter !== 'all' && cellMatches(grid, filter, rowIndex, col);
}

function replaced<T>(list: T[], i: number, value: T): T[] {
  const copy = list.slice();
  copy[i] = value;
  return copy;
}

/**
 * The server's grid with one stored reading put in its cell (after a save or a refused stale
 * change), so the table shows it without asking for the whole sheet again. Unchanged when the
 * viewer does not see that pass or the cell is not on the sheet.
 */
export function withReading(grid: SheetGrid, reading: Reading): SheetGrid {
  const key = reading.pass === 1 ? 'pass1' : 'pass2';
  const pass = grid[key];
  const col = grid.channelIds.indexOf(reading.channelId);
  if (!pass || col < 0 || reading.rowIndex < 0 || reading.rowIndex >= grid.testTimes.length) return grid;
  const i = reading.rowIndex * grid.channelIds.length + col;
  const warnings = { ...pass.warnings };
  if (reading.warnings.length > 0) warnings[i] = reading.warnings;
  else delete warnings[i];
  return {
    ...grid,
    [key]: {
      rawText: replaced(pass.rawText, i, reading.rawText),
      flag: replaced(pass.flag, i, reading.flag),
      edit: pass.edit && { version: replaced(pass.edit.version, i, reading.version), frameTime: replaced(pass.edit.frameTime, i, reading.frameTime) },
      warnings,
    },
  };
}

/** The server's grid with a saved resolution in place of the one it replaces; unchanged when the viewer gets none. */
export function withResolution(grid: SheetGrid, resolution: Resolution): SheetGrid {
  if (grid.resolutions === null) return grid;
  const others = grid.resolutions.filter((r) => r.rowIndex !== resolution.rowIndex || r.channelId !== resolution.channelId);
  return { ...grid, resolutions: [...others, resolution] };
}
