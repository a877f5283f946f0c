import type { ApiError } from '@dialsheet/common';
import { env } from '@/config/env';
import { authToken } from './auth-token';

/** An HTTP error from the API, carrying the server's own message. */
export class ApiRequestError extends Error {
  readonly status: number;
  readonly body: ApiError | null;

  constructor(status: number, message: string, body: ApiError | null) {
    super(message);
    this.name = 'ApiRequestError';
    this.status = status;
    this.body = body;
  }
}

export function isApiError(error: unknown, status?: number): error is ApiRequestError {
  return error instanceof ApiRequestError && (status === undefined || error.status === status);
}

/** The text to show a person for any thrown value. */
export function errorMessage(error: unknown): string {
  if (error instanceof Error && error.message) return error.message;
  return 'Something went wrong. Please try again.';
}

type Notifier = (message: string, status: number) => void;
let notifier: Notifier | null = null;

/** The provider registers antd's notification API here; until then errors are only thrown. */
export function setApiErrorNotifier(next: Notifier | null): void {
  notifier = next;
}

export type QueryParams = Record<string, string | number | boolean | null | undefined>;

export interface RequestOptions {
  body?: unknown;
  params?: QueryParams;
  signal?: AbortSignal;
  /**
   * Show the error as a notification. Defaults to true for changes (POST, PUT, PATCH, DELETE) and
   * false for reads, whose pages render their own error state. Forms that show the server's
   * message inline pass false.
   */
  notify?: boolean;
}

function buildUrl(path: string, params?: QueryParams): string {
  const query = new URLSearchParams();
  for (const [key, value] of Object.entries(params ?? {})) {
    if (value !== undefined && value !== null && value !== '') query.set(key, String(value));
  }
  const search = query.toString();
  return `${env.apiBase}${path}${search ? `?${search}` : ''}`;
}

/** The server's message for an error answer, or a plain one when it sent none. */
export function messageFrom(body: ApiError | null, status: number): string {
  if (body && body.message) {
    return Array.isArray(body.message) ? body.message.join('; ') : body.message;
  }
  if (status === 429) return 'Too many attempts. Wait a minute and try again.';
  if (status >= 500) return 'The server had a problem. Please try again.';
  return `Request failed (${status}).`;
}

async function request<T>(method: string, path: string, options: RequestOptions = {}): Promise<T> {
  const token = authToken.get();
  const headers: Record<string, string> = { Accept: 'application/json' };
  if (options.body !== undefined) headers['Content-Type'] = 'application/json';
  if (token) headers.Authorization = `Bearer ${token}`;
  const notify = options.notify ?? method !== 'GET';

  let response: Response;
  try {
    response = await fetch(buildUrl(path, options.params), {
      method,
      headers,
      body: options.body === undefined ? undefined : JSON.stringify(options.body),
      signal: options.signal,
    });
  } catch (cause) {
    if (cause instanceof DOMException && cause.name === 'AbortError') throw cause;
    const message = 'Cannot reach the server. Check your connection and try again.';
    if (notify) notifier?.(message, 0);
    throw new ApiRequestError(0, message, null);
  }

  if (response.ok) {
    // 202 and 204 carry no body.
    const text = await response.text();
    return (text ? JSON.parse(text) : undefined) as T;
  }

  let body: ApiError | null = null;
  try {
    body = (await response.json()) as ApiError;
  } catch {
    body = null;
  }
  const message = messageFrom(body, response.status);

  // A 401 on a request that carried a token means the session is over (expired, revoked, or
  // the password changed): drop the token and let the route guard send the person to sign-in.
  if (response.status === 401 && token) {
    authToken.clear('expired');
    throw new ApiRequestError(401, message, body);
  }
  if (notify) notifier?.(message, response.status);
  throw new ApiRequestError(response.status, message, body);
}

export const api = {
  get: <T>(path: string, options?: Omit<RequestOptions, 'body'>) => request<T>('GET', path, options),
  post: <T>(path: string, body?: unknown, options?: RequestOptions) => request<T>('POST', path, { ...options, body }),
  put: <T>(path: string, body?: unknown, options?: RequestOptions) => request<T>('PUT', path, { ...options, body }),
  patch: <T>(path: string, body?: unknown, options?: RequestOptions) => request<T>('PATCH', path, { ...options, body }),
  delete: <T = void>(path: string, options?: RequestOptions) => request<T>('DELETE', path, options),
};
