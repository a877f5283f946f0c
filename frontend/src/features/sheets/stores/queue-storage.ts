import { createStore, del, entries, set, type UseStore } from 'idb-keyval';
import type { QueueRecord, QueueStorage } from './save-queue';

// Where unsent rows wait between page loads. IndexedDB survives reloads and browser restarts and
// holds far more than localStorage; localStorage is the fallback for a browser without it (or one
// that refuses it, as some private windows do). Tests use the in-memory store.

const DB_NAME = 'dialsheet';
const STORE_NAME = 'unsent-rows';
const LOCAL_PREFIX = 'dialsheet.unsent-row.';

/** Rows in a Map: for tests, and the last resort when the browser keeps nothing. */
export function createMemoryQueueStorage(initial: readonly QueueRecord[] = []): QueueStorage & { records: Map<string, QueueRecord> } {
  const records = new Map<string, QueueRecord>(initial.map((r) => [r.key, structuredClone(r)]));
  return {
    records,
    getAll: async (prefix) => [...records.values()].filter((r) => r.key.startsWith(prefix)).map((r) => structuredClone(r)),
    put: async (record) => {
      records.set(record.key, structuredClone(record));
    },
    delete: async (key) => {
      records.delete(key);
    },
  };
}

export function createLocalQueueStorage(storage: Storage): QueueStorage {
  return {
    getAll: async (prefix) => {
      const out: QueueRecord[] = [];
      for (let i = 0; i < storage.length; i++) {
        const key = storage.key(i);
        if (!key || !key.startsWith(LOCAL_PREFIX + prefix)) continue;
        try {
          out.push(JSON.parse(storage.getItem(key) ?? 'null') as QueueRecord);
        } catch {
          // A damaged entry cannot be sent; leave it for someone to look at rather than drop it.
        }
      }
      return out.filter((r) => r && typeof r === 'object');
    },
    put: async (record) => storage.setItem(LOCAL_PREFIX + record.key, JSON.stringify(record)),
    delete: async (key) => storage.removeItem(LOCAL_PREFIX + key),
  };
}

export function createIndexedDbQueueStorage(store: UseStore = createStore(DB_NAME, STORE_NAME)): QueueStorage {
  return {
    getAll: async (prefix) => {
      const all = await entries<string, QueueRecord>(store);
      return all.filter(([key]) => typeof key === 'string' && key.startsWith(prefix)).map(([, value]) => value);
    },
    put: (record) => set(record.key, record, store),
    delete: (key) => del(key, store),
  };
}

/**
 * IndexedDB when the browser opens it, else localStorage. The choice is made on first use: a
 * browser that lists IndexedDB but refuses to open it falls back instead of failing every save.
 */
function createBrowserQueueStorage(): QueueStorage {
  let chosen: Promise<QueueStorage> | null = null;
  const local = (): QueueStorage =>
    typeof window !== 'undefined' && window.localStorage ? createLocalQueueStorage(window.localStorage) : createMemoryQueueStorage();
  const choose = (): Promise<QueueStorage> => {
    if (!chosen) {
      if (typeof indexedDB === 'undefined') {
        chosen = Promise.resolve(local());
      } else {
        const idb = createIndexedDbQueueStorage();
        chosen = idb.getAll('\u0000probe').then(
          () => idb,
          () => local(),
        );
      }
    }
    return chosen;
  };
  return {
    getAll: async (prefix) => (await choose()).getAll(prefix),
    put: async (record) => (await choose()).put(record),
    delete: async (key) => (await choose()).delete(key),
  };
}

let browserStorage: QueueStorage | null = null;

/** The one store this tab uses for unsent rows. */
export function browserQueueStorage(): QueueStorage {
  browserStorage ??= createBrowserQueueStorage();
  return browserStorage;
}
