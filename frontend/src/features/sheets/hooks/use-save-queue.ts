import { useCallback, useEffect, useRef, useState, useSyncExternalStore } from 'react';
import type { Reading, ReadingPass } from '@dialsheet/common';
import { saveRow } from '../api/save-row';
import { browserQueueStorage } from '../stores/queue-storage';
import { SaveQueue, type QueueSnapshot, type QueueStorage, type SendRow } from '../stores/save-queue';

const EMPTY: QueueSnapshot = {
  rows: new Map(),
  waiting: 0,
  failed: 0,
  conflicts: 0,
  retryAt: null,
  lastError: null,
  restored: false,
  storageProblem: null,
};

const noop = () => undefined;

export interface UseSaveQueueOptions {
  userId: string;
  sheetId: string;
  pass: ReadingPass;
  /** The server stored these readings of a row. */
  onAck: (rowIndex: number, readings: Reading[]) => void;
  /** Tests may pass their own; the browser's IndexedDB otherwise. */
  storage?: QueueStorage;
  send?: SendRow;
}

/**
 * The save queue of one person's pass on one sheet, for as long as the entry screen is open. Rows
 * left unsent by an earlier visit are read back and sent first; closing the screen leaves unsent
 * rows in storage for the next visit. A connection coming back ends the current pause at once.
 */
export function useSaveQueue({ userId, sheetId, pass, onAck, storage, send }: UseSaveQueueOptions) {
  const [queue, setQueue] = useState<SaveQueue | null>(null);
  const onAckRef = useRef(onAck);
  useEffect(() => {
    onAckRef.current = onAck;
  }, [onAck]);

  useEffect(() => {
    const created = new SaveQueue({
      userId,
      sheetId,
      pass,
      storage: storage ?? browserQueueStorage(),
      send: send ?? saveRow,
      onAck: (rowIndex, readings) => onAckRef.current(rowIndex, readings),
    });
    setQueue(created);
    void created.restore();
    const onOnline = () => created.retryNow();
    window.addEventListener('online', onOnline);
    return () => {
      window.removeEventListener('online', onOnline);
      created.dispose();
    };
  }, [pass, send, sheetId, storage, userId]);

  const subscribe = useCallback((listener: () => void) => (queue ? queue.subscribe(listener) : noop), [queue]);
  const getSnapshot = useCallback(() => (queue ? queue.getSnapshot() : EMPTY), [queue]);
  const snapshot = useSyncExternalStore(subscribe, getSnapshot, getSnapshot);

  // Rows the browser could not store live only in this tab: closing it would lose them, so the
  // browser asks first. (Stored rows need no such question; they are sent on the next visit.)
  const atRisk = snapshot.storageProblem !== null && snapshot.waiting + snapshot.failed + snapshot.conflicts > 0;
  useEffect(() => {
    if (!atRisk) return undefined;
    const onBeforeUnload = (event: BeforeUnloadEvent) => {
      event.preventDefault();
      event.returnValue = '';
    };
    window.addEventListener('beforeunload', onBeforeUnload);
    return () => window.removeEventListener('beforeunload', onBeforeUnload);
  }, [atRisk]);

  return { queue, snapshot };
}
