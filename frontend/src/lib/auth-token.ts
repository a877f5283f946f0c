// The access token lives in localStorage so a reload keeps the session; this tiny store lets
// React re-render (and route guards redirect) the moment the token is set or dropped.
const STORAGE_KEY = 'dialsheet.accessToken';

export type SessionEndReason = 'signed-out' | 'expired' | 'password-changed';

type Listener = () => void;
const listeners = new Set<Listener>();
let lastEndReason: SessionEndReason | null = null;

function read(): string | null {
  try {
    return window.localStorage.getItem(STORAGE_KEY);
  } catch {
    return null;
  }
}

let current: string | null = typeof window === 'undefined' ? null : read();

function emit(): void {
  for (const listener of listeners) listener();
}

export const authToken = {
  get(): string | null {
    return current;
  },
  set(token: string): void {
    current = token;
    lastEndReason = null;
    window.localStorage.setItem(STORAGE_KEY, token);
    emit();
  },
  clear(reason: SessionEndReason): void {
    current = null;
    lastEndReason = reason;
    window.localStorage.removeItem(STORAGE_KEY);
    emit();
  },
  /** Why the last session ended, so the sign-in page can say "your session expired". */
  lastEndReason(): SessionEndReason | null {
    return lastEndReason;
  },
  subscribe(listener: Listener): () => void {
    listeners.add(listener);
    return () => listeners.delete(listener);
  },
  /** Tests start each case from whatever localStorage holds. */
  reloadFromStorage(): void {
    current = read();
    lastEndReason = null;
    emit();
  },
};

// Another tab signing in or out changes this tab's session too.
if (typeof window !== 'undefined') {
  window.addEventListener('storage', (event) => {
    if (event.key === STORAGE_KEY) {
      current = event.newValue;
      emit();
    }
  });
}
