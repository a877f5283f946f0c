import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import type { Reading, ReadingInput, SaveRowRequest, SaveRowResponse } from '@dialsheet/common';
import { SaveQueue, classifySendError, type QueueStorage, type SendRow } from './save-queue';
import { createLocalQueueStorage, createMemoryQueueStorage } from './queue-storage';

const USER = 'u-reader';
const SHEET = 's-1';
const T1 = 'c-t1';
const T2 = 'c-t2';

interface Call {
  rowIndex: number;
  body: SaveRowRequest;
  /** What storage held for the row at the moment the request left. */
  storedBeforeSend: boolean;
  resolve: (response: SaveRowResponse) => void;
  reject: (error: unknown) => void;
}

function reading(rowIndex: number, input: ReadingInput, version: number): Reading {
  return {
    sheetId: SHEET,
    rowIndex,
    channelId: input.channelId,
    pass: 1,
    rawText: input.rawText,
    value: Number(input.rawText),
    flag: null,
    frameTime: input.frameTime ?? null,
    enteredBy: USER,
    version,
    updatedAt: '2026-03-02T09:15:00.000Z',
    warnings: [],
  };
}

/** A sender whose every request waits until the test answers it. */
function manualSender(storage: ReturnType<typeof createMemoryQueueStorage>) {
  const calls: Call[] = [];
  const send: SendRow = (_sheetId, rowIndex, body) =>
    new Promise<SaveRowResponse>((resolve, reject) => {
      const storedBeforeSend = [...storage.records.values()].some((r) => r.rowIndex === rowIndex);
      calls.push({ rowIndex, body, storedBeforeSend, resolve, reject });
    });
  const ack = (call: Call, version = 1) => call.resolve({ readings: call.body.readings.map((r) => reading(call.rowIndex, r, version)) });
  return { calls, send, ack };
}

const row = (text1: string, text2: string, baseVersion: number | null = null): ReadingInput[] => [
  { channelId: T1, rawText: text1, frameTime: 1.5, baseVersion },
  { channelId: T2, rawText: text2, frameTime: 1.5, baseVersion },
];

const networkDown = () => Object.assign(new Error('Cannot reach the server. Check your connection and try again.'), { status: 0, body: null });
const httpError = (status: number, message: string, body: unknown = { statusCode: status, message }) =>
  Object.assign(new Error(message), { status, body });

function makeQueue(storage: QueueStorage, send: SendRow, onAck?: (rowIndex: number, readings: Reading[]) => void, userId = USER) {
  return new SaveQueue({
    userId,
    sheetId: SHEET,
    pass: 1,
    storage,
    send,
    onAck,
    backoff: { initialMs: 1000, maxMs: 8000, jitter: 0.2 },
    // The middle of the jitter band: pauses are exactly 1 s, 2 s, 4 s, 8 s.
    random: () => 0.5,
    now: () => Date.now(),
  });
}

/** Lets storage writes and promise chains finish under fake timers. */
const settle = () => vi.advanceTimersByTimeAsync(0);

beforeEach(() => {
  vi.useFakeTimers();
  vi.setSystemTime(new Date('2026-03-02T09:15:00.000Z'));
});

afterEach(() => {
  vi.useRealTimers();
});

describe('SaveQueue', () => {
  it('stores each row before sending it and sends rows one at a time in the order they were typed', async () => {
    const storage = createMemoryQueueStorage();
    const { calls, send, ack } = manualSender(storage);
    const acked: number[] = [];
    const queue = makeQueue(storage, send, (rowIndex) => acked.push(rowIndex));
    await queue.restore();

    queue.enqueue(3, row('20.1', '1.234'));
    queue.enqueue(1, row('20.2', '1.235'));
    queue.enqueue(2, row('20.3', '1.236'));
    await settle();

    // One request on the wire at a time, and it left only after its row was in storage.
    expect(calls.map((c) => c.rowIndex)).toEqual([3]);
    expect(calls[0].storedBeforeSend).toBe(true);
    expect(calls[0].body).toEqual({ pass: 1, readings: row('20.1', '1.234') });
    expect(queue.getSnapshot().waiting).toBe(3);
    expect(queue.getSnapshot().rows.get(3)?.status).toBe('sending');

    ack(calls[0]);
    await settle();
    expect(calls.map((c) => c.rowIndex)).toEqual([3, 1]);
    ack(calls[1]);
    await settle();
    ack(calls[2]);
    await settle();

    expect(calls.map((c) => c.rowIndex)).toEqual([3, 1, 2]);
    expect(calls.every((c) => c.storedBeforeSend)).toBe(true);
    expect(acked).toEqual([3, 1, 2]);
    expect(queue.getSnapshot().waiting).toBe(0);
    expect(storage.records.size).toBe(0);
  });

  it('retries after a network failure with growing pauses, keeping the row stored meanwhile', async () => {
    const storage = createMemoryQueueStorage();
    const { calls, send, ack } = manualSender(storage);
    const queue = makeQueue(storage, send);
    await queue.restore();

    queue.enqueue(0, row('20.1', '1.234'));
    queue.enqueue(1, row('20.2', '1.235'));
    await settle();
    calls[0].reject(networkDown());
    await settle();

    const waiting = queue.getSnapshot();
    expect(waiting.retryAt).toBe(Date.now() + 1000);
    expect(waiting.lastError).toMatch(/Cannot reach the server/);
    expect(waiting.waiting).toBe(2);
    expect(storage.records.size).toBe(2);

    // Nothing is sent during the pause, and row 1 does not jump ahead of row 0.
    await vi.advanceTimersByTimeAsync(999);
    expect(calls).toHaveLength(1);
    await vi.advanceTimersByTimeAsync(1);
    expect(calls.map((c) => c.rowIndex)).toEqual([0, 0]);

    // A server restarting answers 503: the next pause is twice as long.
    calls[1].reject(httpError(503, 'Service Unavailable'));
    await settle();
    expect(queue.getSnapshot().retryAt).toBe(Date.now() + 2000);
    await vi.advanceTimersByTimeAsync(1999);
    expect(calls).toHaveLength(2);
    await vi.advanceTimersByTimeAsync(1);
    expect(calls).toHaveLength(3);

    ack(calls[2]);
    await settle();
    expect(calls.map((c) => c.rowIndex)).toEqual([0, 0, 0, 1]);
    // Success resets the pause: the next failure waits 1 s again.
    calls[3].reject(networkDown());
    await settle();
    expect(queue.getSnapshot().retryAt).toBe(Date.now() + 1000);
    queue.retryNow();
    await settle();
    expect(calls).toHaveLength(5);
    ack(calls[4]);
    await settle();
    expect(queue.getSnapshot().waiting).toBe(0);
    expect(storage.records.size).toBe(0);
  });

  it('resends a row whose answer was lost, and the server keeps one stored version', async () => {
    // A server that stores as the real one does: same text and frame again changes nothing.
    const server = new Map<string, Reading>();
    let dropNextAnswer = true;
    const send: SendRow = async (_sheetId, rowIndex, body) => {
      const out: Reading[] = [];
      for (const input of body.readings) {
        const key = `${rowIndex}:${input.channelId}`;
        const stored = server.get(key);
        if (stored && stored.rawText === input.rawText && stored.frameTime === (input.frameTime ?? null)) {
          out.push(stored);
          continue;
        }
        if (stored ? input.baseVersion !== stored.version : (input.baseVersion ?? null) !== null) {
          throw httpError(409, 'stale', { statusCode: 409, message: 'stale', current: stored ?? null });
        }
        const saved = reading(rowIndex, input, stored ? stored.version + 1 : 1);
        server.set(key, saved);
        out.push(saved);
      }
      if (dropNextAnswer) {
        dropNextAnswer = false;
        // Stored, but the answer never arrived (the connection broke on the way back).
        throw networkDown();
      }
      return { readings: out };
    };
    const storage = createMemoryQueueStorage();
    const acked: Reading[][] = [];
    const queue = makeQueue(storage, send, (_rowIndex, readings) => acked.push(readings));
    await queue.restore();

    queue.enqueue(4, row('20.1', '#ambiguous'));
    await settle();
    expect(queue.getSnapshot().rows.get(4)?.status).toBe('pending');
    await vi.advanceTimersByTimeAsync(1000);

    expect(queue.getSnapshot().waiting).toBe(0);
    expect(acked).toHaveLength(1);
    expect(acked[0].map((r) => [r.channelId, r.rawText, r.version])).toEqual([
      [T1, '20.1', 1],
      [T2, '#ambiguous', 1],
    ]);
    expect([...server.values()].map((r) => r.version)).toEqual([1, 1]);
    expect(storage.records.size).toBe(0);
  });

  it('survives a reload: rows left in storage are read back and sent, newest typing winning', async () => {
    const storage = createMemoryQueueStorage();
    const first = manualSender(storage);
    const before = makeQueue(storage, first.send);
    await before.restore();
    before.enqueue(7, row('21.0', '1.300'));
    before.enqueue(8, row('21.1', '1.301'));
    await settle();
    expect(first.calls).toHaveLength(1);
    // The tab closes with row 7 on the wire and row 8 not sent.
    before.dispose();

    const after = manualSender(storage);
    const acked: number[] = [];
    const queue = makeQueue(storage, after.send, (rowIndex) => acked.push(rowIndex));
    const restored = await queue.restore();
    expect(restored.map((r) => r.rowIndex)).toEqual([7, 8]);
    expect(queue.getSnapshot().rows.get(8)?.readings.map((r) => r.rawText)).toEqual(['21.1', '1.301']);
    await settle();
    expect(after.calls.map((c) => c.rowIndex)).toEqual([7]);
    after.ack(after.calls[0]);
    await settle();
    after.ack(after.calls[1]);
    await settle();
    expect(after.calls.map((c) => c.rowIndex)).toEqual([7, 8]);
    expect(after.calls[1].body.readings.map((r) => r.rawText)).toEqual(['21.1', '1.301']);
    expect(acked).toEqual([7, 8]);
    expect(storage.records.size).toBe(0);
  });

  it('never sends rows another person left on the same computer', async () => {
    const storage = createMemoryQueueStorage();
    const other = makeQueue(storage, () => new Promise(() => undefined), undefined, 'u-someone-else');
    await other.restore();
    other.enqueue(2, row('19.9', '1.111'));
    await settle();
    other.dispose();

    const { calls, send } = manualSender(storage);
    const queue = makeQueue(storage, send);
    expect(await queue.restore()).toEqual([]);
    await settle();
    expect(calls).toHaveLength(0);
    expect(storage.records.size).toBe(1);
  });

  it('stops retrying a row the server refuses (400, 403), says why, and sends the rows after it', async () => {
    const storage = createMemoryQueueStorage();
    const { calls, send, ack } = manualSender(storage);
    const queue = makeQueue(storage, send);
    await queue.restore();

    queue.enqueue(0, row('2O.1', '1.2'));
    queue.enqueue(1, row('20.2', '1.3'));
    queue.enqueue(2, row('20.3', '1.4'));
    await settle();
    calls[0].reject(httpError(400, 'readings.0.rawText (T1): "2O.1" is not a number', { statusCode: 400, message: ['readings.0.rawText (T1): "2O.1" is not a number'] }));
    await settle();

    const snapshot = queue.getSnapshot();
    expect(snapshot.rows.get(0)).toMatchObject({ status: 'failed', error: 'readings.0.rawText (T1): "2O.1" is not a number' });
    expect(snapshot.retryAt).toBeNull();
    expect(snapshot.failed).toBe(1);
    expect(calls.map((c) => c.rowIndex)).toEqual([0, 1]);

    calls[1].reject(httpError(403, 'Only the sheet’s assigned reader may enter or finish pass 1'));
    await settle();
    expect(queue.getSnapshot().rows.get(1)?.status).toBe('failed');
    ack(calls[2]);
    await settle();

    // No timer brings a refused row back.
    await vi.advanceTimersByTimeAsync(60_000);
    expect(calls).toHaveLength(3);
    // Failed rows stay stored until fixed.
    expect([...storage.records.values()].map((r) => [r.rowIndex, r.status])).toEqual([
      [0, 'failed'],
      [1, 'failed'],
    ]);

    // The reader fixes the value and confirms the row again: it goes out.
    queue.enqueue(0, row('20.1', '1.2'));
    await settle();
    expect(calls.map((c) => c.rowIndex)).toEqual([0, 1, 2, 0]);
    expect(calls[3].body.readings[0].rawText).toBe('20.1');
    ack(calls[3]);
    await settle();
    // A refused row can also be sent again as it is.
    queue.resend(1);
    await settle();
    expect(calls).toHaveLength(5);
    ack(calls[4]);
    await settle();
    expect(queue.getSnapshot().rows.size).toBe(0);
    expect(storage.records.size).toBe(0);
  });

  it('marks a stale change as a conflict with the stored value, then sends the choice made', async () => {
    const storage = createMemoryQueueStorage();
    const { calls, send, ack } = manualSender(storage);
    const acked: Array<[number, Reading[]]> = [];
    const queue = makeQueue(storage, send, (rowIndex, readings) => acked.push([rowIndex, readings]));
    await queue.restore();

    const current = reading(5, { channelId: T2, rawText: '1.250', frameTime: 2 }, 3);
    queue.enqueue(5, [
      { channelId: T1, rawText: '20.0', frameTime: 1.5, baseVersion: 1 },
      { channelId: T2, rawText: '1.240', frameTime: 1.5, baseVersion: 2 },
    ]);
    queue.enqueue(6, row('20.5', '1.3'));
    await settle();
    calls[0].reject(httpError(409, 'This value was changed elsewhere', { statusCode: 409, message: 'This value was changed elsewhere', current }));
    await settle();

    expect(queue.getSnapshot().rows.get(5)).toMatchObject({ status: 'conflict', conflict: { channelId: T2, current } });
    expect(queue.getSnapshot().conflicts).toBe(1);
    // Other rows are not held up, and no timer resends the conflict.
    expect(calls.map((c) => c.rowIndex)).toEqual([5, 6]);
    ack(calls[1]);
    await vi.advanceTimersByTimeAsync(60_000);
    expect(calls).toHaveLength(2);

    // Typing the row again does not decide the conflict by itself.
    queue.enqueue(5, [
      { channelId: T1, rawText: '20.0', frameTime: 1.5, baseVersion: 1 },
      { channelId: T2, rawText: '1.245', frameTime: 1.5, baseVersion: 2 },
    ]);
    await settle();
    expect(calls).toHaveLength(2);
    expect(queue.getSnapshot().rows.get(5)?.status).toBe('conflict');

    // Keep mine: the typed value goes over the stored version.
    queue.resolveConflict(5, 'mine');
    await settle();
    expect(calls[2].body.readings).toEqual([
      { channelId: T1, rawText: '20.0', frameTime: 1.5, baseVersion: 1 },
      { channelId: T2, rawText: '1.245', frameTime: 1.5, baseVersion: 3 },
    ]);
    calls[2].reject(httpError(409, 'changed again', { statusCode: 409, message: 'changed again', current: { ...current, version: 4, rawText: '1.260' } }));
    await settle();

    // Take the stored one: that cell becomes the stored reading, the rest of the row still goes.
    queue.resolveConflict(5, 'stored');
    await settle();
    expect(acked.at(-1)).toEqual([5, [{ ...current, version: 4, rawText: '1.260' }]]);
    expect(calls[3].body.readings[1]).toEqual({ channelId: T2, rawText: '1.260', frameTime: 2, baseVersion: 4 });
    ack(calls[3]);
    await settle();
    expect(queue.getSnapshot().rows.size).toBe(0);
  });

  it('treats a 409 without a stored value (pass finished, data released) as a refusal, not a conflict', () => {
    const outcome = classifySendError(httpError(409, 'Pass 1 is finished; corrections are resolutions'), row('1', '2'));
    expect(outcome).toEqual({ kind: 'failed', message: 'Pass 1 is finished; corrections are resolutions' });
    expect(classifySendError(httpError(401, 'Sign in again'), row('1', '2')).kind).toBe('retry');
    expect(classifySendError(httpError(429, 'Too many'), row('1', '2')).kind).toBe('retry');
    expect(classifySendError(httpError(404, 'Sheet not found'), row('1', '2')).kind).toBe('failed');
  });

  it('sends a row typed again while its first version is on the wire over the version just stored', async () => {
    const storage = createMemoryQueueStorage();
    const { calls, send, ack } = manualSender(storage);
    const queue = makeQueue(storage, send);
    await queue.restore();

    queue.enqueue(9, row('20.1', '1.2'));
    await settle();
    queue.enqueue(9, row('20.7', '1.2'));
    await settle();
    expect(calls).toHaveLength(1);
    expect(queue.getSnapshot().rows.get(9)?.readings[0].rawText).toBe('20.7');
    // Storage holds the newest text, so a reload now would still send it.
    expect([...storage.records.values()][0].readings[0].rawText).toBe('20.7');

    ack(calls[0], 1);
    await settle();
    expect(calls).toHaveLength(2);
    expect(calls[1].body.readings).toEqual([
      { channelId: T1, rawText: '20.7', frameTime: 1.5, baseVersion: 1 },
      { channelId: T2, rawText: '1.2', frameTime: 1.5, baseVersion: 1 },
    ]);
    ack(calls[1], 2);
    await settle();
    expect(storage.records.size).toBe(0);
  });

  it('keeps rows in localStorage when the browser has no IndexedDB', async () => {
    const storage = createLocalQueueStorage(window.localStorage);
    const queue = makeQueue(storage, () => new Promise(() => undefined));
    await queue.restore();
    queue.enqueue(3, row('20.1', '1.2'));
    await settle();
    queue.dispose();

    const again = createLocalQueueStorage(window.localStorage);
    const records = await again.getAll(`${USER}:${SHEET}:1:`);
    expect(records.map((r) => [r.rowIndex, r.readings.map((x) => x.rawText)])).toEqual([[3, ['20.1', '1.2']]]);
    await again.delete(records[0].key);
    expect(await again.getAll(`${USER}:${SHEET}:1:`)).toEqual([]);
  });
});
