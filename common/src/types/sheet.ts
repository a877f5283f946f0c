// A sheet is the reading plan of a run: rows at a fixed interval of test time, from start to end,
// and the channels to read at each row, in the order the reader types them.

/** 'draft' until both a reader and a checker are assigned; then 'open' for entry. */
export type SheetStatus = 'draft' | 'open';

export interface PassProgress {
  /** Cells entered in this pass (row × channel). */
  done: number;
  /** rowCount × number of channels. */
  total: number;
}

export interface Sheet {
  id: string;
  campaignId: string;
  runId: string;
  name: string;
  /** Test time of the first row, seconds. */
  startTime: number;
  /** Test time of the last row at most, seconds (the last row falls on or before it). */
  endTime: number;
  /** Seconds of test time between rows. */
  interval: number;
  /** Channels read at each row, in entry order. */
  channelIds: string[];
  rowCount: number;
  /** Who types the first pass; null until assigned. */
  readerId: string | null;
  /** Who types the blind second pass; null until assigned. */
  checkerId: string | null;
  status: SheetStatus;
  progress: { pass1: PassProgress; pass2: PassProgress };
  /** When the reader marked pass 1 finished; a finished pass no longer changes (corrections are resolutions). */
  pass1FinishedAt: string | null;
  /** When the checker marked pass 2 finished; pass 1 becomes visible to the checker from then. */
  pass2FinishedAt: string | null;
  /** Set when the run's data is inside a signed-off release: nothing on the sheet may change. */
  lock: DataLock | null;
  createdAt: string;
  updatedAt: string;
}

export interface CreateSheetRequest {
  name: string;
  startTime: number;
  endTime: number;
  interval: number;
  channelIds: string[];
}

export interface UpdateSheetRequest extends Partial<CreateSheetRequest> {
  /** Optional reason stored in the audit trail. */
  reason?: string;
}

/** Absent: unchanged; null: nobody. */
export interface AssignSheetRequest {
  readerId?: string | null;
  checkerId?: string | null;
}

/** One timestamp of a sheet. */
export interface SheetRow {
  /** From 0. */
  index: number;
  /** Test time, seconds. */
  testTime: number;
}

/** A run's data inside a release cannot change; a change needs a new release version. */
export interface DataLock {
  releaseId: string;
  releaseNumber: number;
}
