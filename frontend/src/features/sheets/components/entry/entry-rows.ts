import {
  checkLimits,
  frameIndexAt,
  parseReading,
  toVideoTime,
  type Channel,
  type LimitWarning,
  type ParsedReading,
  type Reading,
  type ReadingInput,
  type SheetRow,
  type SyncMarks,
} from '@dialsheet/common';
import type { QueueRowView } from '../../stores/save-queue';

// The entry screen's bookkeeping as plain functions: which frame a row shows, what each row's
// state is, where to resume, and the body a row is saved with.

/** Stored entries of the person's own pass: row → channel → reading. */
export type StoredReadings = ReadonlyMap<number, ReadonlyMap<string, Reading>>;

export type RowState = 'saved' | 'partial' | 'empty' | 'draft' | 'pending' | 'sending' | 'failed' | 'conflict';

export const ROW_STATE_LABELS: Record<RowState, string> = {
  saved: 'saved',
  partial: 'part saved',
  empty: 'not entered',
  draft: 'typed, not saved',
  pending: 'waiting to save',
  sending: 'saving',
  failed: 'not saved',
  conflict: 'changed elsewhere',
};

/**
 * The frame each row shows: the one on screen at the row's test time, mapped to video time through
 * the run's sync marks, looked up in the stored frame times (never time × nominal rate). Rows
 * before the first frame show the first; rows past the end show the last.
 */
export function rowFrameIndices(rows: readonly SheetRow[], sync: SyncMarks, times: readonly number[]): Int32Array {
  const out = new Int32Array(rows.length);
  if (times.length === 0) return out;
  for (let i = 0; i < rows.length; i++) {
    const videoTime = toVideoTime(sync, rows[i].testTime);
    out[i] = Math.min(Math.max(frameIndexAt(times, videoTime), 0), times.length - 1);
  }
  return out;
}

export function buildStoredReadings(readings: readonly Reading[]): Map<number, Map<string, Reading>> {
  const byRow = new Map<number, Map<string, Reading>>();
  for (const reading of readings) {
    let row = byRow.get(reading.rowIndex);
    if (!row) byRow.set(reading.rowIndex, (row = new Map()));
    row.set(reading.channelId, reading);
  }
  return byRow;
}

export function rowState(
  channelIds: readonly string[],
  stored: ReadonlyMap<string, Reading> | undefined,
  queued: QueueRowView | undefined,
  hasDraft: boolean,
): RowState {
  if (queued) return queued.status;
  if (hasDraft) return 'draft';
  const have = stored ? channelIds.filter((id) => stored.has(id)).length : 0;
  if (have === 0) return 'empty';
  return have === channelIds.length ? 'saved' : 'partial';
}

/** True when every channel of the row has an entry, stored or waiting to be sent. */
export function rowComplete(channelIds: readonly string[], stored: ReadonlyMap<string, Reading> | undefined, queued: QueueRowView | undefined): boolean {
  if (queued && queued.status !== 'failed') {
    const sent = new Set(queued.readings.map((r) => r.channelId));
    if (channelIds.every((id) => sent.has(id) || stored?.has(id))) return true;
  }
  return !!stored && channelIds.every((id) => stored.has(id));
}

/** Where a returning person starts: the first row without all entries (the last row when all have them). */
export function resumeRow(rowCount: number, channelIds: readonly string[], stored: StoredReadings, queued: ReadonlyMap<number, QueueRowView>): number {
  for (let row = 0; row < rowCount; row++) {
    if (!rowComplete(channelIds, stored.get(row), queued.get(row))) return row;
  }
  return Math.max(rowCount - 1, 0);
}

/** Rows that still lack an entry in some channel (what finishing the pass would refuse). */
export function incompleteRows(rowCount: number, channelIds: readonly string[], stored: StoredReadings, queued: ReadonlyMap<number, QueueRowView>): number[] {
  const out: number[] = [];
  for (let row = 0; row < rowCount; row++) {
    if (!rowComplete(channelIds, stored.get(row), queued.get(row))) out.push(row);
  }
  return out;
}

export interface CellCheck {
  parsed: ParsedReading;
  /** The parser's message when the text is not a reading; the row cannot be saved with one. */
  error: string | null;
  /** Outside the plausible range or operating limits: shown, never refused. */
  warnings: LimitWarning[];
}

export function checkCell(text: string, channel: Channel, decimalComma: boolean): CellCheck {
  const parsed = parseReading(text, { decimalComma });
  if (parsed.kind === 'error') return { parsed, error: parsed.message, warnings: [] };
  const warnings = parsed.kind === 'number' ? checkLimits(parsed.value, channel) : [];
  return { parsed, error: null, warnings };
}

/** One row's cells as the inputs hold them. */
export interface RowCells {
  texts: string[];
  /** Frame time each cell was read at (s), or null while not yet confirmed. */
  frames: (number | null)[];
}

/** What the inputs start with on a row: waiting (unsent) text first, else the stored entry, else empty. */
export function cellsForRow(channelIds: readonly string[], stored: ReadonlyMap<string, Reading> | undefined, queued: QueueRowView | undefined): RowCells {
  const waiting = new Map((queued?.readings ?? []).map((r) => [r.channelId, r]));
  return {
    texts: channelIds.map((id) => waiting.get(id)?.rawText ?? stored?.get(id)?.rawText ?? ''),
    frames: channelIds.map((id) => {
      const pending = waiting.get(id);
      if (pending) return pending.frameTime ?? null;
      return stored?.get(id)?.frameTime ?? null;
    }),
  };
}

/**
 * The row as it is saved: every channel, the text exactly as typed, the frame it was read at, and
 * the version of the stored entry it replaces (null for a first entry).
 */
export function rowBody(channelIds: readonly string[], cells: RowCells, stored: ReadonlyMap<string, Reading> | undefined, frameNow: number | null): ReadingInput[] {
  return channelIds.map((channelId, i) => ({
    channelId,
    rawText: cells.texts[i],
    frameTime: cells.frames[i] ?? frameNow,
    baseVersion: stored?.get(channelId)?.version ?? null,
  }));
}

/** True when saving the body would change nothing on the server (same text and frame in every cell). */
export function sameAsStored(body: readonly ReadingInput[], stored: ReadonlyMap<string, Reading> | undefined): boolean {
  if (!stored) return false;
  return body.every((input) => {
    const reading = stored.get(input.channelId);
    return !!reading && reading.rawText === input.rawText && reading.frameTime === (input.frameTime ?? null);
  });
}
