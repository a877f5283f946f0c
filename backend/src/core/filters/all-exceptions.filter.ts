import type { ApiError } from '@dialsheet/common';
import { ArgumentsHost, Catch, ExceptionFilter, HttpException, HttpStatus, Logger } from '@nestjs/common';
import type { Request, Response } from 'express';
import { STATUS_CODES } from 'node:http';

export const GENERIC_SERVER_ERROR = 'Something went wrong on the server. Please try again; if it keeps happening, tell your administrator.';

export const DATABASE_UNAVAILABLE =
  'The server cannot reach its database just now, so this request was not carried out. Nothing saved before is lost; try again in a few seconds.';

export const STORAGE_FULL = "The server's storage is full, so this could not be saved and nothing of it was kept. Tell your administrator.";

/** Seconds a client should wait before trying again after a 503 (sent as Retry-After). */
export const RETRY_AFTER_SECONDS = 5;

/**
 * What node-postgres (pg, pg-pool) says when the connection itself failed: the server went away
 * mid-query, a pooled client broke, or no connection could be had in time. Matched exactly: these
 * are the libraries' fixed wordings, and a query that merely failed never carries them.
 */
const PG_CONNECTION_MESSAGES = new Set([
  'Connection terminated',
  'Connection terminated unexpectedly',
  'Connection terminated due to connection timeout',
  'timeout exceeded when trying to connect',
  'timeout expired',
  'Client has encountered a connection error and is not queryable',
  'Client was closed and is not queryable',
  'Cannot use a pool after calling end on the pool',
]);

/** Socket errors of a connection that could not be made or was cut (Node's system error codes). */
const NETWORK_CODES = new Set(['ECONNREFUSED', 'ECONNRESET', 'ECONNABORTED', 'ETIMEDOUT', 'EPIPE', 'EHOSTUNREACH', 'ENETUNREACH', 'ENOTFOUND', 'EAI_AGAIN']);

/**
 * SQLSTATEs the server sends when it cannot serve any query on this connection (PostgreSQL
 * documentation, appendix A "Error Codes"): class 08 connection exceptions (except 08P01, a protocol
 * violation, which is a bug), admin/crash shutdown, "the database system is starting up", and
 * "too many clients".
 */
const UNAVAILABLE_SQLSTATES = new Set(['08000', '08003', '08006', '08001', '08004', '57P01', '57P02', '57P03', '53300']);

interface ErrorFields {
  code?: unknown;
  message?: unknown;
  severity?: unknown;
  driverError?: unknown;
  cause?: unknown;
  $metadata?: unknown;
}

/** The error and what it wraps: TypeORM's QueryFailedError keeps pg's error as driverError, others use cause. */
function errorChain(error: unknown): ErrorFields[] {
  const chain: ErrorFields[] = [];
  let current: unknown = error;
  while (current && typeof current === 'object' && chain.length < 6 && !chain.includes(current as ErrorFields)) {
    const fields = current as ErrorFields;
    chain.push(fields);
    current = fields.driverError ?? fields.cause;
  }
  return chain;
}

/**
 * True when the request failed because PostgreSQL could not be reached or dropped the connection,
 * as opposed to a query that ran and failed (a bug, a constraint) which stays a 500.
 */
export function isDatabaseUnavailable(error: unknown): boolean {
  const chain = errorChain(error);
  // The S3 client's network errors carry $metadata; an unreachable store is not the database.
  if (chain.some((e) => e.$metadata !== undefined)) return false;
  return chain.some((e) => {
    if (typeof e.message === 'string' && PG_CONNECTION_MESSAGES.has(e.message)) return true;
    if (typeof e.code !== 'string') return false;
    if (NETWORK_CODES.has(e.code)) return true;
    // A SQLSTATE only counts on an error the server sent (pg's DatabaseError carries a severity).
    return typeof e.severity === 'string' && UNAVAILABLE_SQLSTATES.has(e.code);
  });
}

/** A write that failed because the disk (or the user's quota on it) is full. */
export function isStorageFull(error: unknown): boolean {
  return errorChain(error).some((e) => e.code === 'ENOSPC' || e.code === 'EDQUOT');
}

/** Errors raised by Express middleware (body parser) carry a status and say whether to expose it. */
interface MiddlewareError {
  status?: number;
  statusCode?: number;
  expose?: boolean;
  type?: string;
  message?: string;
}

/** Turns any thrown value into the ApiError body; details of unexpected errors stay in the log. */
const BODY_PARSER_MESSAGES: Record<string, string> = {
  'entity.parse.failed': 'The request body is not valid JSON',
  'entity.too.large': 'The request body is too large',
};

/**
 * Fields of an HttpException body that reach the client beside statusCode, error and message.
 * Listed one by one so nothing else an exception carries can leak out.
 */
const PASSTHROUGH_FIELDS = ['duplicateOf', 'current'] as const;

export function toApiError(exception: unknown): ApiError {
  // Express adapters wrap body-parser errors in an HttpException that keeps the parser's own
  // wording ("Unexpected end of JSON input"); say what is wrong in our terms instead.
  const origin = (exception instanceof HttpException ? exception.cause : exception) as MiddlewareError | undefined;
  const parserMessage = origin?.type ? BODY_PARSER_MESSAGES[origin.type] : undefined;
  const parserStatus = origin?.status ?? origin?.statusCode;
  if (parserMessage && typeof parserStatus === 'number' && parserStatus >= 400 && parserStatus < 500) {
    return { statusCode: parserStatus, error: STATUS_CODES[parserStatus] ?? 'Error', message: parserMessage };
  }
  if (exception instanceof HttpException) {
    const statusCode = exception.getStatus();
    const body = exception.getResponse();
    const error = STATUS_CODES[statusCode] ?? 'Error';
    if (typeof body === 'string') return { statusCode, error, message: body };
    const { message, error: name } = body as { message?: unknown; error?: unknown };
    const text =
      typeof message === 'string' || (Array.isArray(message) && message.every((m) => typeof m === 'string'))
        ? (message as string | string[])
        : exception.message;
    const result: ApiError = { statusCode, error: typeof name === 'string' ? name : error, message: text };
    for (const field of PASSTHROUGH_FIELDS) {
      const value = (body as Record<string, unknown>)[field];
      if (value !== undefined) Object.assign(result, { [field]: value });
    }
    return result;
  }
  const m = (exception ?? {}) as MiddlewareError;
  const status = m.status ?? m.statusCode;
  if (typeof status === 'number' && status >= 400 && status < 500 && m.expose) {
    return { statusCode: status, error: STATUS_CODES[status] ?? 'Error', message: m.message ?? 'Bad request' };
  }
  // Faults of the machinery rather than of the code: the client can tell the person what happened
  // and, for the database, try again by itself (the entry screen's save queue does).
  if (isDatabaseUnavailable(exception)) {
    return { statusCode: HttpStatus.SERVICE_UNAVAILABLE, error: STATUS_CODES[503] as string, message: DATABASE_UNAVAILABLE };
  }
  if (isStorageFull(exception)) {
    return { statusCode: HttpStatus.INSUFFICIENT_STORAGE, error: STATUS_CODES[507] as string, message: STORAGE_FULL };
  }
  return {
    statusCode: HttpStatus.INTERNAL_SERVER_ERROR,
    error: STATUS_CODES[500] as string,
    message: GENERIC_SERVER_ERROR,
  };
}

@Catch()
export class AllExceptionsFilter implements ExceptionFilter {
  private readonly logger = new Logger('Exceptions');

  catch(exception: unknown, host: ArgumentsHost): void {
    const ctx = host.switchToHttp();
    const res = ctx.getResponse<Response>();
    const req = ctx.getRequest<Request>();
    const body = toApiError(exception);
    if (body.statusCode === HttpStatus.SERVICE_UNAVAILABLE || body.statusCode === HttpStatus.INSUFFICIENT_STORAGE) {
      // One line per request: an outage makes many of these, and the stack says nothing new.
      const reason = exception instanceof Error ? exception.message : String(exception);
      this.logger.warn(`${req.method} ${req.originalUrl} answered ${body.statusCode}: ${reason}`);
    } else if (body.statusCode >= 500) {
      const detail = exception instanceof Error ? (exception.stack ?? exception.message) : String(exception);
      this.logger.error(`${req.method} ${req.originalUrl} failed: ${detail}`);
    }
    if (res.headersSent) {
      res.end();
      return;
    }
    if (body.statusCode === HttpStatus.SERVICE_UNAVAILABLE) res.setHeader('Retry-After', String(RETRY_AFTER_SECONDS));
    res.status(body.statusCode).json(body);
  }
}
