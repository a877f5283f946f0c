import type { Reading, ReadingInput, ReadingPass, SaveRowRequest, SaveRowResponse } from '@dialsheet/common';

// The entry screen's outbox. A row typed and confirmed with Enter is written to the browser's
// persistent storage first and only then sent, so a reload, a dropped connection or a server
// restart loses nothing: the row waits, is retried with growing pauses, and is deleted from
// storage only once the server has acknowledged it. Saves are idempotent on the server (same text
// and frame again = no change), so sending a row twice is harmless. No React, no timers of its
// own making beyond setTimeout, no I/O except through the injected storage and sender, so the
// rules below are unit-tested with fake timers and an in-memory storage.

/** One row of one pass waiting to be sent, as kept in storage. */
export interface QueueRecord {
  /** `${userId}:${sheetId}:${pass}:${rowIndex}`: one record per row and pass, and per person (a
   * shared computer must never send one person's entries under another's name). */
  key: string;
  userId: string;
  sheetId: string;
  pass: ReadingPass;
  rowIndex: number;
  /** The whole row; each reading carries the version it replaces (baseVersion). */
  readings: ReadingInput[];
  /** Position in sending order (larger = typed later). */
  seq: number;
  /** When the row was confirmed (ms since the epoch). */
  savedAt: number;
  status: 'pending' | 'failed' | 'conflict';
  /** The server's message for a failed or conflicting row. */
  error: string | null;
  /** For a stale change (409): the cell that changed elsewhere and what is stored there now. */
  conflict: RowConflict | null;
}

export interface RowConflict {
  channelId: string;
  /** The reading stored now; null when the server holds none for that cell. */
  current: Reading | null;
}

/** Where waiting rows live between page loads (IndexedDB in the browser, a Map in tests). */
export interface QueueStorage {
  /** Every record whose key starts with `prefix`. */
  getAll(prefix: string): Promise<QueueRecord[]>;
  put(record: QueueRecord): Promise<void>;
  delete(key: string): Promise<void>;
}

export type SendRow = (sheetId: string, rowIndex: number, body: SaveRowRequest) => Promise<SaveRowResponse>;

export type RowQueueStatus = 'pending' | 'sending' | 'failed' | 'conflict';

export interface QueueRowView {
  rowIndex: number;
  status: RowQueueStatus;
  readings: readonly ReadingInput[];
  error: string | null;
  conflict: RowConflict | null;
}

export interface QueueSnapshot {
  /** Rows not yet acknowledged, by row index. */
  rows: ReadonlyMap<number, QueueRowView>;
  /** Rows still to send (pending or sending). */
  waiting: number;
  failed: number;
  conflicts: number;
  /** When the next retry starts (ms since the epoch); null unless waiting after a failure. */
  retryAt: number | null;
  /** Why the last attempt did not go through, while retrying. */
  lastError: string | null;
  /** True once rows left from an earlier visit have been read back from storage. */
  restored: boolean;
  /** Set when the browser refused to store a row: it is still sent, but would not survive a reload. */
  storageProblem: string | null;
}

export interface BackoffOptions {
  /** First pause after a failure (ms). */
  initialMs: number;
  /** Longest pause (ms). */
  maxMs: number;
  /** ± share of the pause drawn at random, so many clients do not all return at the same instant. */
  jitter: number;
}

export interface SaveQueueOptions {
  userId: string;
  sheetId: string;
  pass: ReadingPass;
  storage: QueueStorage;
  send: SendRow;
  /** The server stored (or already held) these readings for a row. */
  onAck?: (rowIndex: number, readings: Reading[]) => void;
  backoff?: Partial<BackoffOptions>;
  /** 0 ≤ x < 1; Math.random unless a test fixes it. */
  random?: () => number;
  now?: () => number;
}

export const DEFAULT_BACKOFF: BackoffOptions = { initialMs: 1000, maxMs: 30_000, jitter: 0.2 };

/** What an error thrown by the sender looks like (the API client's ApiRequestError fits). */
interface ErrorLike {
  status?: unknown;
  message?: unknown;
  body?: unknown;
}

type Outcome =
  | { kind: 'ack'; readings: Reading[] }
  | { kind: 'retry'; message: string }
  | { kind: 'failed'; message: string }
  | { kind: 'conflict'; message: string; conflict: RowConflict };

/** Sorts a sender's error into retry (the server may take it later), failed or conflict. */
export function classifySendError(error: unknown, readings: readonly ReadingInput[]): Outcome {
  const e = (error ?? {}) as ErrorLike;
  const status = typeof e.status === 'number' ? e.status : 0;
  const message = typeof e.message === 'string' && e.message ? e.message : 'The row could not be saved.';
  // No answer at all (offline, server restarting), a timeout, too many requests, a server fault, or
  // an ended session (the person signs in again; the row waits in storage meanwhile).
  if (status === 0 || status === 401 || status === 408 || status === 429 || status >= 500) {
    return { kind: 'retry', message };
  }
  if (status === 409) {
    const body = (e.body ?? null) as { current?: unknown } | null;
    // A stale change carries the stored reading (or null) in `current`; a 409 without it is a
    // refusal of the whole pass (finished, released, archived), which no retry will change.
    if (body && typeof body === 'object' && 'current' in body) {
      const current = (body.current ?? null) as Reading | null;
      const channelId = current?.channelId ?? readings.find((r) => r.baseVersion !== null && r.baseVersion !== undefined)?.channelId ?? readings[0]?.channelId ?? '';
      return { kind: 'conflict', message, conflict: { channelId, current } };
    }
  }
  return { kind: 'failed', message };
}

export function queueKeyPrefix(userId: string, sheetId: string, pass: ReadingPass): string {
  return `${userId}:${sheetId}:${pass}:`;
}

function copyReadings(readings: readonly ReadingInput[]): ReadingInput[] {
  return readings.map((r) => ({ channelId: r.channelId, rawText: r.rawText, frameTime: r.frameTime ?? null, baseVersion: r.baseVersion ?? null }));
}

type Listener = () => void;

export class SaveQueue {
  private readonly options: SaveQueueOptions;
  private readonly backoff: BackoffOptions;
  private readonly prefix: string;
  private readonly random: () => number;
  private readonly now: () => number;
  private readonly records = new Map<number, QueueRecord>();
  /** Row typed again while its previous version is on the wire: sent once that one is answered. */
  private readonly successors = new Map<number, QueueRecord>();
  /** Storage writes not finished yet, per row: a row is never sent before it is stored. */
  private readonly persisting = new Map<number, Promise<void>>();
  private readonly listeners = new Set<Listener>();
  private inFlight: number | null = null;
  private running = false;
  private disposed = false;
  private seq = 0;
  private failures = 0;
  private retryTimer: ReturnType<typeof setTimeout> | null = null;
  private retryAt: number | null = null;
  private lastError: string | null = null;
  private restored = false;
  private storageProblem: string | null = null;
  private snapshot: QueueSnapshot;

  constructor(options: SaveQueueOptions) {
    this.options = options;
    this.backoff = { ...DEFAULT_BACKOFF, ...options.backoff };
    this.prefix = queueKeyPrefix(options.userId, options.sheetId, options.pass);
    this.random = options.random ?? Math.random;
    this.now = options.now ?? Date.now;
    this.snapshot = this.buildSnapshot();
  }

  subscribe = (listener: Listener): (() => void) => {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  };

  getSnapshot = (): QueueSnapshot => this.snapshot;

  /**
   * Reads back rows an earlier visit left unsent and starts sending them. Returns them so the
   * screen can show them over the server's values. Rows typed before this resolves are kept.
   */
  async restore(): Promise<QueueRecord[]> {
    let stored: QueueRecord[] = [];
    try {
      stored = await this.options.storage.getAll(this.prefix);
    } catch (error) {
      this.storageProblem = `Rows waiting from an earlier visit could not be read back: ${error instanceof Error ? error.message : String(error)}`;
    }
    if (this.disposed) return stored;
    stored.sort((a, b) => a.seq - b.seq);
    for (const record of stored) {
      this.seq = Math.max(this.seq, record.seq);
      // A row typed in this visit already is newer than what storage held.
      if (!this.records.has(record.rowIndex)) this.records.set(record.rowIndex, { ...record, readings: copyReadings(record.readings) });
    }
    this.restored = true;
    this.emit();
    void this.pump();
    return stored;
  }

  /**
   * Queues a confirmed row (the whole row, each reading with the version it replaces). It is
   * written to storage before it is sent. A row still waiting is replaced by this newer version.
   */
  enqueue(rowIndex: number, readings: readonly ReadingInput[]): void {
    if (this.disposed) return;
    const { userId, sheetId, pass } = this.options;
    const previous = this.records.get(rowIndex);
    const record: QueueRecord = {
      key: `${this.prefix}${rowIndex}`,
      userId,
      sheetId,
      pass,
      rowIndex,
      readings: copyReadings(readings),
      seq: ++this.seq,
      savedAt: this.now(),
      // A conflict stays until the person chooses which value stands; new text alone does not decide it.
      status: previous?.status === 'conflict' ? 'conflict' : 'pending',
      error: previous?.status === 'conflict' ? previous.error : null,
      conflict: previous?.status === 'conflict' ? previous.conflict : null,
    };
    if (this.inFlight === rowIndex) this.successors.set(rowIndex, record);
    else this.records.set(rowIndex, record);
    this.persist(record);
    this.emit();
    void this.pump();
  }

  /**
   * Settles a stale change. 'mine' sends the typed value again over the stored version; 'stored'
   * takes the stored reading for that cell (the rest of the row is still sent).
   */
  resolveConflict(rowIndex: number, choice: 'mine' | 'stored'): void {
    const record = this.records.get(rowIndex);
    if (!record || record.status !== 'conflict' || !record.conflict) return;
    const { channelId, current } = record.conflict;
    const readings = record.readings.map((r) => {
      if (r.channelId !== channelId) return r;
      if (choice === 'mine') return { ...r, baseVersion: current?.version ?? null };
      return current
        ? { channelId, rawText: current.rawText, frameTime: current.frameTime, baseVersion: current.version }
        : { ...r, baseVersion: null };
    });
    if (choice === 'stored' && current) this.options.onAck?.(rowIndex, [current]);
    const next: QueueRecord = { ...record, readings, status: 'pending', error: null, conflict: null };
    this.records.set(rowIndex, next);
    this.persist(next);
    this.emit();
    void this.pump();
  }

  /** Sends a failed row again (after the person fixed what the server refused, or to try once more). */
  resend(rowIndex: number): void {
    const record = this.records.get(rowIndex);
    if (!record || record.status !== 'failed') return;
    const next: QueueRecord = { ...record, status: 'pending', error: null };
    this.records.set(rowIndex, next);
    this.persist(next);
    this.emit();
    void this.pump();
  }

  /** Skips the current pause (the connection came back, or the person asked). */
  retryNow(): void {
    if (this.retryTimer === null) return;
    clearTimeout(this.retryTimer);
    this.retryTimer = null;
    this.retryAt = null;
    this.emit();
    void this.pump();
  }

  /** Stops sending; waiting rows stay in storage for the next visit. */
  dispose(): void {
    this.disposed = true;
    if (this.retryTimer !== null) clearTimeout(this.retryTimer);
    this.retryTimer = null;
    this.listeners.clear();
  }

  private persist(record: QueueRecord): void {
    const before = this.persisting.get(record.rowIndex) ?? Promise.resolve();
    const write = before
      .then(() => this.options.storage.put(record))
      .then(
        () => {
          if (this.storageProblem?.startsWith('This browser')) this.storageProblem = null;
        },
        (error: unknown) => {
          // The row is still sent from memory; only a reload before it is acknowledged would lose it.
          this.storageProblem = `This browser refused to keep unsent rows (${error instanceof Error ? error.message : String(error)}); keep this page open until every row is saved`;
          this.emit();
        },
      );
    this.persisting.set(record.rowIndex, write);
    void write.then(() => {
      if (this.persisting.get(record.rowIndex) === write) this.persisting.delete(record.rowIndex);
    });
  }

  private remove(key: string, rowIndex: number): void {
    const before = this.persisting.get(rowIndex) ?? Promise.resolve();
    const write = before.then(() => this.options.storage.delete(key)).catch(() => undefined);
    this.persisting.set(rowIndex, write);
    void write.then(() => {
      if (this.persisting.get(rowIndex) === write) this.persisting.delete(rowIndex);
    });
  }

  /** The next row to send: the oldest pending one. */
  private next(): QueueRecord | null {
    let best: QueueRecord | null = null;
    for (const record of this.records.values()) {
      if (record.status === 'pending' && (!best || record.seq < best.seq)) best = record;
    }
    return best;
  }

  /** Sends rows one at a time, in the order they were typed, until none is left or a pause is due. */
  private async pump(): Promise<void> {
    if (this.running || this.disposed || this.retryTimer !== null || !this.restored) return;
    this.running = true;
    try {
      for (let record = this.next(); record && !this.disposed; record = this.next()) {
        await this.persisting.get(record.rowIndex);
        // The row may have been replaced while its storage write finished.
        const sending = this.records.get(record.rowIndex);
        if (!sending || sending.status !== 'pending') continue;
        this.inFlight = sending.rowIndex;
        this.emit();
        const body: SaveRowRequest = { pass: sending.pass, readings: copyReadings(sending.readings) };
        let outcome: Outcome;
        try {
          const response = await this.options.send(sending.sheetId, sending.rowIndex, body);
          outcome = { kind: 'ack', readings: response.readings };
        } catch (error) {
          outcome = classifySendError(error, sending.readings);
        }
        this.inFlight = null;
        const stop = this.settle(sending, outcome);
        this.emit();
        if (stop) return;
      }
    } finally {
      this.running = false;
    }
  }

  /** Applies the answer for one row; true when sending must pause (the server is unreachable). */
  private settle(sent: QueueRecord, outcome: Outcome): boolean {
    const successor = this.successors.get(sent.rowIndex);
    this.successors.delete(sent.rowIndex);
    if (outcome.kind === 'ack') {
      this.failures = 0;
      this.lastError = null;
      this.options.onAck?.(sent.rowIndex, outcome.readings);
      if (successor) {
        // The newer version was typed over the one just stored: it replaces that version now.
        const acked = new Map(outcome.readings.map((r) => [r.channelId, r.version]));
        const sentBase = new Map(sent.readings.map((r) => [r.channelId, r.baseVersion ?? null]));
        const readings = successor.readings.map((r) =>
          acked.has(r.channelId) && (r.baseVersion ?? null) === sentBase.get(r.channelId) ? { ...r, baseVersion: acked.get(r.channelId) ?? null } : r,
        );
        const next = { ...successor, readings };
        this.records.set(sent.rowIndex, next);
        this.persist(next);
      } else {
        this.records.delete(sent.rowIndex);
        this.remove(sent.key, sent.rowIndex);
      }
      return false;
    }
    if (outcome.kind === 'retry') {
      // Keep the newest text; it goes out when the server answers again.
      if (successor) this.records.set(sent.rowIndex, successor);
      this.failures += 1;
      this.lastError = outcome.message;
      this.scheduleRetry();
      return true;
    }
    const base = successor ?? sent;
    const next: QueueRecord =
      outcome.kind === 'conflict'
        ? { ...base, status: 'conflict', error: outcome.message, conflict: outcome.conflict }
        : // A newer version typed meanwhile may fix what the server refused: send it.
          successor
          ? { ...successor, status: 'pending' }
          : { ...sent, status: 'failed', error: outcome.message };
    this.records.set(sent.rowIndex, next);
    this.persist(next);
    return false;
  }

  private scheduleRetry(): void {
    if (this.disposed) return;
    const { initialMs, maxMs, jitter } = this.backoff;
    const plain = Math.min(maxMs, initialMs * 2 ** Math.min(this.failures - 1, 30));
    const delay = Math.max(0, Math.round(plain * (1 - jitter + 2 * jitter * this.random())));
    this.retryAt = this.now() + delay;
    this.retryTimer = setTimeout(() => {
      this.retryTimer = null;
      this.retryAt = null;
      this.emit();
      void this.pump();
    }, delay);
  }

  private buildSnapshot(): QueueSnapshot {
    const rows = new Map<number, QueueRowView>();
    let waiting = 0;
    let failed = 0;
    let conflicts = 0;
    for (const record of this.records.values()) {
      const successor = this.successors.get(record.rowIndex);
      const shown = successor ?? record;
      const status: RowQueueStatus = this.inFlight === record.rowIndex ? 'sending' : record.status;
      rows.set(record.rowIndex, { rowIndex: record.rowIndex, status, readings: shown.readings, error: record.error, conflict: record.conflict });
      if (status === 'pending' || status === 'sending') waiting += 1;
      else if (status === 'failed') failed += 1;
      else conflicts += 1;
    }
    return {
      rows,
      waiting,
      failed,
      conflicts,
      retryAt: this.retryAt,
      lastError: this.retryAt !== null ? this.lastError : null,
      restored: this.restored,
      storageProblem: this.storageProblem,
    };
  }

  private emit(): void {
    this.snapshot = this.buildSnapshot();
    for (const listener of this.listeners) listener();
  }
}
