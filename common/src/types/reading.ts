// A reading is one value typed for a row, channel and pass. The typed text travels with every
// parsed form so nothing the reader typed is ever replaced by our interpretation of it.

/** First entry (reader) or blind second entry (checker). */
export type ReadingPass = 1 | 2;

/** Entries that are deliberately not numbers: nothing typed, a display that cannot be read, digits changing. */
export type ReadingFlag = 'blank' | 'unreadable' | 'ambiguous';

export interface ReadingParseOptions {
  /** The campaign accepts ',' as the decimal separator ('.' is always accepted). */
  decimalComma: boolean;
}

export interface NumberReading {
  kind: 'number';
  value: number;
  /** Digits after the decimal separator exactly as typed ("12.50" → 2, ".5" → 1, "12" → 0). */
  decimals: number;
  /**
   * The exact decimal value in one spelling per value ("12.50", "1.25e1" → "1.25e1"; "-0" → "0"),
   * computed from the digits, never from the binary double. Used to compare passes.
   */
  canonical: string;
  text: string;
}

export interface FlaggedReading {
  kind: 'flag';
  flag: ReadingFlag;
  text: string;
}

export interface ErrorReading {
  kind: 'error';
  /** Says what is wrong in words a reader can act on. */
  message: string;
  text: string;
}

export type ParsedReading = NumberReading | FlaggedReading | ErrorReading;

/** Plausible range and instrument operating limits of a channel; any may be absent. */
export interface ChannelLimits {
  plausibleMin?: number | null;
  plausibleMax?: number | null;
  operatingMin?: number | null;
  operatingMax?: number | null;
}

export type LimitWarningCode = 'below-plausible' | 'above-plausible' | 'outside-operating';

/** A value outside a limit is flagged for a second look, never refused. */
export interface LimitWarning {
  code: LimitWarningCode;
  message: string;
}

/**
 * How the two passes of one cell compare. 'missing' means at least one pass has no entry yet;
 * a blank entry is an entry (flagged), not a missing one.
 */
export type CellStatus = 'agree' | 'mismatch' | 'missing';

export interface CellComparison {
  status: CellStatus;
  /** Empty when the passes agree; otherwise one sentence per reason. */
  reasons: string[];
}

/** One stored entry of a cell (row × channel) in one pass, as the server sends it. */
export interface Reading {
  sheetId: string;
  rowIndex: number;
  channelId: string;
  pass: ReadingPass;
  /** Exactly as typed. */
  rawText: string;
  /** The parsed number; null when the entry is flagged. */
  value: number | null;
  flag: ReadingFlag | null;
  /** Presentation time (seconds of video) of the frame actually read; null when not sent. */
  frameTime: number | null;
  enteredBy: string;
  /** Starts at 1; each change of the text or frame adds 1. A change must name the version it replaces. */
  version: number;
  updatedAt: string;
  /** Limits the value falls outside; flagged for a second look, never refused. */
  warnings: LimitWarning[];
}

export interface ReadingInput {
  channelId: string;
  rawText: string;
  frameTime?: number | null;
  /** The version this entry replaces; null or absent for a first entry. */
  baseVersion?: number | null;
}

/** Saves one row of one pass; the row index is in the path (a body copy must match it). */
export interface SaveRowRequest {
  pass: ReadingPass;
  rowIndex?: number;
  readings: ReadingInput[];
}

export interface SaveRowResponse {
  /** In the order of the request. */
  readings: Reading[];
}

/** Body of a 409 on a stale change: the value stored now, so the screen can offer to reload it. */
export interface ReadingConflictError {
  statusCode: 409;
  message: string;
  current: Reading | null;
}

/** A pass marked finished by its owner. */
export interface PassFinish {
  sheetId: string;
  pass: ReadingPass;
  finishedAt: string;
}

/**
 * The agreed value of a mismatched cell, recorded against the frame by the checker or a lead,
 * always with a reason. The two passes are kept as typed; the resolution sits beside them.
 */
export interface Resolution {
  sheetId: string;
  rowIndex: number;
  channelId: string;
  /** The value as the resolver typed it (parsed by the same rules as an entry). */
  rawText: string;
  value: number | null;
  flag: ReadingFlag | null;
  reason: string;
  resolvedBy: string;
  resolvedAt: string;
  /** Starts at 1; a change must name the version it replaces. */
  version: number;
}

export interface ResolveCellRequest {
  rawText: string;
  /** Why this value: required, 1–500 characters. */
  reason: string;
  /** The version of the resolution this replaces; absent for a first resolution. */
  baseVersion?: number | null;
}

/** One cell where the passes differ after normalising, or where either entry is flagged. */
export interface MismatchCell {
  rowIndex: number;
  /** Test time of the row, seconds. */
  testTime: number;
  channelId: string;
  pass1: Reading;
  pass2: Reading;
  /** One sentence per reason the cell is listed. */
  reasons: string[];
  resolution: Resolution | null;
}

export interface MismatchRate {
  /** Cells with both passes entered. */
  compared: number;
  /** Of those, cells listed as mismatches. */
  mismatches: number;
  /** mismatches / compared, or null when nothing has been compared yet (not 0: nothing is known). */
  rate: number | null;
}

export interface ChannelMismatchRate extends MismatchRate {
  channelId: string;
}

/** One person's entries on the sheet (their pass) against the other pass. */
export interface PersonMismatchRate extends MismatchRate {
  userId: string;
  name: string;
  pass: ReadingPass;
  /** Resolved cells whose resolution differs from this person's entry. */
  wrong: number;
}

export interface SheetMismatches {
  sheetId: string;
  /** Both passes are finished: the list is complete. */
  complete: boolean;
  cells: MismatchCell[];
  /** Cells still waiting for a resolution. */
  open: number;
  resolved: number;
  byChannel: ChannelMismatchRate[];
  byPerson: PersonMismatchRate[];
}

/**
 * The entries of one pass for the sheet table, column-wise: element `i` of every array is the cell
 * of row `floor(i / channelIds.length)` and channel `channelIds[i % channelIds.length]`. Column-wise
 * arrays instead of one `Reading` per cell keep a 10 000-row sheet's answer small and quick to read.
 */
export interface SheetGridPass {
  /**
   * Exactly as typed; null when the cell has no entry in this pass. (The parsed number is left out:
   * the table shows the text and compares passes by it, parsing only texts that differ.)
   */
  rawText: (string | null)[];
  flag: (ReadingFlag | null)[];
  /**
   * What a change of a cell sends back (the version it replaces, the frame read), only when the
   * viewer may change this pass: its owner, until they finish it. Null otherwise.
   */
  edit: SheetGridEdit | null;
  /** Only the cells whose value falls outside a limit, by cell index as above. */
  warnings: Record<number, LimitWarning[]>;
}

/** Per cell, in the order of `SheetGridPass`; null where there is no entry. */
export interface SheetGridEdit {
  version: (number | null)[];
  /** Presentation time (seconds of video) of the frame read; null when not sent. */
  frameTime: (number | null)[];
}

/**
 * One pass as `GET /sheets/:id/grid` sends it: only the cells that have an entry, in no
 * particular order, element `k` of every array being the same entry. The database writes this
 * straight to JSON (nobody parses it on the way), and `layOutSheetGrid` puts it cell by cell.
 */
export interface SheetGridWirePass {
  /** Cell index of each entry: row × number of channels + channel position. */
  cell: number[];
  rawText: string[];
  /** [cell, flag] of the flagged entries (most have none); null when there are none. */
  flagged: Array<[number, ReadingFlag]> | null;
  /** Only for a pass the viewer may change (its owner, until they finish it); null otherwise. */
  version: number[] | null;
  frameTime: (number | null)[] | null;
  /** [cell, value] of the entries outside one of their channel's limits; null when there are none. */
  outside: Array<[number, number]> | null;
}

/** The grid route's answer; `layOutSheetGrid` turns it into the table's `SheetGrid`. */
export interface SheetGridWire {
  sheetId: string;
  testTimes: number[];
  channelIds: string[];
  /** Each channel's limits, in the order of `channelIds` (for the warnings of `outside`). */
  limits: ChannelLimits[];
  pass1: SheetGridWirePass | null;
  pass2: SheetGridWirePass | null;
  resolutions: Resolution[] | null;
}

/**
 * What the sheet table shows, in one answer: row times, channel order, the passes the viewer may
 * see and the resolutions when they may read the mismatch list. The same blind rules as the
 * readings and mismatch routes decide what is null here.
 */
export interface SheetGrid {
  sheetId: string;
  /** Test time of each row, seconds; the row index is the position. */
  testTimes: number[];
  /** The sheet's channels in entry order: the columns of the table. */
  channelIds: string[];
  /** Null when the viewer may not see pass 1 (the checker until pass 2 is finished). */
  pass1: SheetGridPass | null;
  /** Null when the viewer may not see pass 2 (the reader until the checker finishes it). */
  pass2: SheetGridPass | null;
  /** Every resolution of the sheet's cells; null when the viewer may not read the mismatch list. */
  resolutions: Resolution[] | null;
}
