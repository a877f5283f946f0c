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
