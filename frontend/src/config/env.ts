// Read once at start-up so a wrong build-time value fails loudly instead of half-working.
function readApiBase(): string {
  const raw = (import.meta.env.VITE_API_BASE as string | undefined) ?? '/api';
  if (!raw.startsWith('/') && !/^https?:\/\//.test(raw)) {
    throw new Error(`VITE_API_BASE must be a path or an http(s) URL, got "${raw}"`);
  }
  return raw.replace(/\/+$/, '');
}

export const env = {
  apiBase: readApiBase(),
  appName: 'Dialsheet',
} as const;
