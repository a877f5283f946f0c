import type { ApiError } from '@dialsheet/common';
import { ArgumentsHost, Catch, ExceptionFilter, HttpException, HttpStatus, Logger } from '@nestjs/common';
import type { Request, Response } from 'express';
import { STATUS_CODES } from 'node:http';

export const GENERIC_SERVER_ERROR = 'Something went wrong on the server. Please try again; if it keeps happening, tell your administrator.';

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
    if (body.statusCode >= 500) {
      const detail = exception instanceof Error ? (exception.stack ?? exception.message) : String(exception);
      this.logger.error(`${req.method} ${req.originalUrl} failed: ${detail}`);
    }
    if (res.headersSent) {
      res.end();
      return;
    }
    res.status(body.statusCode).json(body);
  }
}
