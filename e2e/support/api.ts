import { baseUrl } from './browser';

/** A refusal from the API, with its status and body, so a test can tell a 404 from a 409. */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly body: string,
    what: string,
  ) {
    super(`${what}: HTTP ${status} ${body.slice(0, 400)}`);
  }
}

/**
 * One call to the API as a test sets data up or reads it back (the browser does the work being
 * tested): JSON or a FormData body, the answer parsed, a refusal thrown as ApiError. `origin`
 * names another server process than the one the browser tests run against.
 */
export async function api<T>(token: string | null, method: string, route: string, body?: unknown, origin = baseUrl): Promise<T> {
  const isForm = body instanceof FormData;
  const response = await fetch(`${origin}/api${route}`, {
    method,
    headers: { ...(token ? { authorization: `Bearer ${token}` } : {}), ...(body !== undefined && !isForm ? { 'content-type': 'application/json' } : {}) },
    body: body === undefined ? undefined : isForm ? body : JSON.stringify(body),
  });
  const text = await response.text();
  const where = origin === baseUrl ? route : `${origin}/api${route}`;
  if (!response.ok) throw new ApiError(response.status, text, `${method} ${where}`);
  return (text ? JSON.parse(text) : undefined) as T;
}
