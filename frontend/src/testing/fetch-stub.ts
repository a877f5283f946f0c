import { vi } from 'vitest';

/** What a handler answers: a status (200 by default) and a JSON body (none for 204). */
export interface StubResponse {
  status?: number;
  body?: unknown;
}

export interface StubRequest {
  method: string;
  path: string;
  params: Record<string, string>;
  query: URLSearchParams;
  body: unknown;
  headers: Headers;
}

export type StubHandler = StubResponse | ((request: StubRequest) => StubResponse | Promise<StubResponse>);

/** Keys look like "GET /api/campaigns/:campaignId/members". */
export type StubRoutes = Record<string, StubHandler>;

interface CompiledRoute {
  method: string;
  pattern: RegExp;
  names: string[];
  handler: StubHandler;
}

function compile(routes: StubRoutes): CompiledRoute[] {
  return Object.entries(routes).map(([key, handler]) => {
    const [method, path] = key.split(' ');
    const names: string[] = [];
    const source = path.replace(/[.*+?^${}()|[\]\\]/g, '\\$&').replace(/\\?:([a-zA-Z]+)/g, (_, name: string) => {
      names.push(name);
      return '([^/]+)';
    });
    return { method, pattern: new RegExp(`^${source}$`), names, handler };
  });
}

/**
 * Replaces `fetch` (the network boundary) with a small route table, so components run their real
 * API client, query hooks and error handling against answers we choose. Unmatched requests
 * answer 404 and are recorded, so a test can assert the page asked for nothing unexpected.
 */
export function stubFetch(routes: StubRoutes) {
  const compiled = compile(routes);
  const calls: StubRequest[] = [];
  const unhandled: string[] = [];

  const fetchStub = vi.fn(async (input: RequestInfo | URL, init?: RequestInit): Promise<Response> => {
    const url = new URL(typeof input === 'string' ? input : input instanceof URL ? input.href : input.url, 'http://localhost');
    const method = (init?.method ?? 'GET').toUpperCase();
    const headers = new Headers(init?.headers);
    const body = typeof init?.body === 'string' ? (JSON.parse(init.body) as unknown) : undefined;

    for (const route of compiled) {
      if (route.method !== method) continue;
      const match = route.pattern.exec(url.pathname);
      if (!match) continue;
      const params = Object.fromEntries(route.names.map((name, i) => [name, decodeURIComponent(match[i + 1])]));
      const request: StubRequest = { method, path: url.pathname, params, query: url.searchParams, body, headers };
      calls.push(request);
      const answer = typeof route.handler === 'function' ? await route.handler(request) : route.handler;
      const status = answer.status ?? 200;
      if (status === 204 || answer.body === undefined) return new Response(null, { status: status === 200 ? 204 : status });
      return new Response(JSON.stringify(answer.body), { status, headers: { 'Content-Type': 'application/json' } });
    }

    unhandled.push(`${method} ${url.pathname}${url.search}`);
    return new Response(
      JSON.stringify({ statusCode: 404, error: 'Not Found', message: `No test route for ${method} ${url.pathname}` }),
      { status: 404, headers: { 'Content-Type': 'application/json' } },
    );
  });

  vi.stubGlobal('fetch', fetchStub);

  return {
    calls,
    unhandled,
    /** Requests made to one route key, e.g. "POST /api/campaigns". */
    callsTo(key: string): StubRequest[] {
      const route = compile({ [key]: {} })[0];
      return calls.filter((c) => c.method === route.method && route.pattern.test(c.path));
    },
  };
}

/** An error body shaped like the server's. */
export function apiError(statusCode: number, message: string): StubResponse {
  const error = { 400: 'Bad Request', 401: 'Unauthorized', 403: 'Forbidden', 404: 'Not Found', 409: 'Conflict' }[statusCode];
  return { status: statusCode, body: { statusCode, error: error ?? 'Error', message } };
}
