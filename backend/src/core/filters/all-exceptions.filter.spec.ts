import { BadRequestException, ForbiddenException, NotFoundException, type ArgumentsHost } from '@nestjs/common';
import { createServer, type AddressInfo, type Server } from 'node:net';
import { DatabaseError, Pool } from 'pg';
import { QueryFailedError } from 'typeorm';
import { describe, expect, it } from 'vitest';
import {
  AllExceptionsFilter,
  DATABASE_UNAVAILABLE,
  GENERIC_SERVER_ERROR,
  RETRY_AFTER_SECONDS,
  STORAGE_FULL,
  isDatabaseUnavailable,
  toApiError,
} from './all-exceptions.filter';

/** A pg error as the server sends it: DatabaseError with the SQLSTATE and severity filled in. */
function serverError(message: string, code: string, severity = 'ERROR'): DatabaseError {
  return Object.assign(new DatabaseError(message, message.length, 'error'), { code, severity });
}

/** What TypeORM throws for a query whose driver call failed with `driverError`. */
const queryFailed = (driverError: Error) => new QueryFailedError('SELECT 1', [], driverError);

/** A port that was free a moment ago, so connecting to it is refused. */
async function closedPort(): Promise<number> {
  const server = createServer();
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const { port } = server.address() as AddressInfo;
  await new Promise<void>((resolve) => server.close(() => resolve()));
  return port;
}

/** Runs pg-pool's connect against `port` and returns what it rejects with. */
async function connectError(port: number, connectionTimeoutMillis = 2000): Promise<unknown> {
  const pool = new Pool({ host: '127.0.0.1', port, user: 'x', database: 'x', connectionTimeoutMillis });
  try {
    const client = await pool.connect();
    client.release();
    return undefined;
  } catch (error) {
    return error;
  } finally {
    await pool.end();
  }
}

describe('toApiError', () => {
  it('keeps the status and message of HTTP exceptions', () => {
    expect(toApiError(new NotFoundException('Campaign not found'))).toEqual({
      statusCode: 404,
      error: 'Not Found',
      message: 'Campaign not found',
    });
    expect(toApiError(new ForbiddenException())).toMatchObject({ statusCode: 403, error: 'Forbidden' });
  });

  it('passes validation messages through as a list', () => {
    const e = new BadRequestException(['email must be an email', 'password should not be empty']);
    expect(toApiError(e)).toEqual({
      statusCode: 400,
      error: 'Bad Request',
      message: ['email must be an email', 'password should not be empty'],
    });
  });

  it('names a malformed JSON body instead of echoing the parser error', () => {
    const parserError = Object.assign(new SyntaxError('Unexpected token } in JSON at position 7'), {
      status: 400,
      expose: true,
      type: 'entity.parse.failed',
    });
    const expected = { statusCode: 400, error: 'Bad Request', message: 'The request body is not valid JSON' };
    expect(toApiError(parserError)).toEqual(expected);
    // As the Express adapter hands it over: wrapped, with the parser error as the cause.
    expect(toApiError(new BadRequestException(parserError.message, { cause: parserError }))).toEqual(expected);
  });

  it('hides everything about unexpected errors', () => {
    const body = toApiError(new Error('relation "users" does not exist at /srv/app/x.js:1'));
    expect(body).toEqual({ statusCode: 500, error: 'Internal Server Error', message: GENERIC_SERVER_ERROR });
    expect(JSON.stringify(body)).not.toContain('users');
  });

  it('does not trust a 5xx status carried by a foreign error', () => {
    expect(toApiError({ status: 503, expose: true, message: 'secret detail' }).message).toBe(GENERIC_SERVER_ERROR);
  });
});

describe('database outages and a full disk', () => {
  const expect503 = (error: unknown) =>
    expect(toApiError(error)).toEqual({ statusCode: 503, error: 'Service Unavailable', message: DATABASE_UNAVAILABLE });

  it('a refused connection from the real pool (PostgreSQL stopped) → 503', async () => {
    const error = await connectError(await closedPort());
    expect((error as { code?: string }).code).toBe('ECONNREFUSED');
    expect503(error);
  });

  it('a server that accepts and never answers (pool connection timeout from the real pool) → 503', async () => {
    const silent: Server = createServer(() => undefined);
    await new Promise<void>((resolve) => silent.listen(0, '127.0.0.1', resolve));
    try {
      const error = await connectError((silent.address() as AddressInfo).port, 150);
      expect((error as Error).message).toBe('Connection terminated due to connection timeout');
      expect503(error);
    } finally {
      silent.close();
    }
  });

  it('a connection cut mid-query, as TypeORM wraps it → 503', () => {
    expect503(queryFailed(new Error('Connection terminated unexpectedly')));
    expect503(queryFailed(Object.assign(new Error('read ECONNRESET'), { code: 'ECONNRESET', syscall: 'read' })));
    expect503(new Error('timeout exceeded when trying to connect'));
    expect503(queryFailed(new Error('Client has encountered a connection error and is not queryable')));
  });

  it('PostgreSQL shutting down, starting up or full of clients (SQLSTATE 57P01, 57P03, 53300, 08006) → 503', () => {
    expect503(queryFailed(serverError('terminating connection due to administrator command', '57P01', 'FATAL')));
    expect503(serverError('the database system is starting up', '57P03', 'FATAL'));
    expect503(serverError('sorry, too many clients already', '53300', 'FATAL'));
    expect503(queryFailed(serverError('connection failure', '08006')));
  });

  it('queries that ran and failed stay a generic 500 (bugs, constraints, timeouts of our own making)', () => {
    const generic = { statusCode: 500, error: 'Internal Server Error', message: GENERIC_SERVER_ERROR };
    expect(toApiError(queryFailed(serverError('relation "users" does not exist', '42P01')))).toEqual(generic);
    expect(toApiError(queryFailed(serverError('duplicate key value violates unique constraint', '23505')))).toEqual(generic);
    expect(toApiError(queryFailed(serverError('canceling statement due to statement timeout', '57014')))).toEqual(generic);
    expect(toApiError(queryFailed(serverError('protocol violation', '08P01')))).toEqual(generic);
    expect(toApiError(new TypeError("Cannot read properties of undefined (reading 'id')"))).toEqual(generic);
    // A SQLSTATE-looking code on something the server did not send, and a near-miss of pg's wording.
    expect(toApiError({ code: '57P01', message: 'x' })).toEqual(generic);
    expect(toApiError(new Error('Connection terminated unexpectedly; retried'))).toEqual(generic);
  });

  it('an unreachable S3 store is not reported as the database', () => {
    const s3 = Object.assign(new Error('connect ECONNREFUSED 127.0.0.1:9000'), { code: 'ECONNREFUSED', $metadata: { attempts: 3 } });
    expect(isDatabaseUnavailable(s3)).toBe(false);
    expect(toApiError(s3).statusCode).toBe(500);
  });

  it('a write that hit a full disk (ENOSPC, EDQUOT), bare or as a cause → 507 saying so', () => {
    const enospc = Object.assign(new Error('ENOSPC: no space left on device, write'), { code: 'ENOSPC', syscall: 'write' });
    const full = { statusCode: 507, error: 'Insufficient Storage', message: STORAGE_FULL };
    expect(toApiError(enospc)).toEqual(full);
    expect(toApiError(new Error('could not store the upload', { cause: enospc }))).toEqual(full);
    expect(toApiError(Object.assign(new Error('EDQUOT: disk quota exceeded'), { code: 'EDQUOT' }))).toEqual(full);
    expect(JSON.stringify(toApiError(enospc))).not.toContain('write');
  });

  it('answers 503 with Retry-After, and no Retry-After on other errors', () => {
    const answer = (exception: unknown) => {
      const headers: Record<string, string> = {};
      const sent: { status?: number; body?: unknown } = {};
      const res = {
        headersSent: false,
        setHeader: (name: string, value: string) => (headers[name.toLowerCase()] = value),
        status(code: number) {
          sent.status = code;
          return this;
        },
        json(body: unknown) {
          sent.body = body;
        },
      };
      const host = {
        switchToHttp: () => ({ getResponse: () => res, getRequest: () => ({ method: 'PUT', originalUrl: '/api/sheets/x/rows/1' }) }),
      } as unknown as ArgumentsHost;
      const filter = new AllExceptionsFilter();
      (filter as unknown as { logger: { warn: () => void; error: () => void } }).logger = { warn: () => undefined, error: () => undefined };
      filter.catch(exception, host);
      return { headers, ...sent };
    };
    const down = answer(queryFailed(new Error('Connection terminated unexpectedly')));
    expect(down).toMatchObject({ status: 503, headers: { 'retry-after': String(RETRY_AFTER_SECONDS) } });
    expect((down.body as { message: string }).message).toBe(DATABASE_UNAVAILABLE);
    expect(answer(new Error('boom')).headers).toEqual({});
    expect(answer(new NotFoundException('Sheet not found')).headers).toEqual({});
  });
});
