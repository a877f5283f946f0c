import { NotFoundException, ParseUUIDPipe } from '@nestjs/common';

/**
 * Path ids that are not UUIDs cannot name anything, so they get the same 404 as an unknown id
 * (a 400 would tell a caller more about our id format than about their mistake).
 */
export function uuidParam(what: string): ParseUUIDPipe {
  return new ParseUUIDPipe({ exceptionFactory: () => new NotFoundException(`${what} not found`) });
}
