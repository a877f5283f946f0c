import { BadRequestException, ForbiddenException, NotFoundException } from '@nestjs/common';
import { describe, expect, it } from 'vitest';
import { GENERIC_SERVER_ERROR, toApiError } from './all-exceptions.filter';

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
