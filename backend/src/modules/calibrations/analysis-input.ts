import { BadRequestException, ConflictException } from '@nestjs/common';

/**
 * The computations in common throw AnalysisError / UnitError (both RangeError) with a message
 * that says what to change: that is the caller's input, so a 400 with that message, never a 500.
 */
export function asBadRequest<T>(work: () => T): T {
  try {
    return work();
  } catch (error) {
    if (error instanceof RangeError) throw new BadRequestException(error.message);
    throw error;
  }
}

/** A change that names a stored version other than the one stored: 409 with what is there now. */
export function staleVersion(what: string, current: unknown): ConflictException {
  return new ConflictException({
    message: `This ${what} was changed by someone else since you loaded it; reload it and make your change again`,
    current,
  });
}

/** baseVersion must match the stored version (a first write may omit it). */
export function checkBaseVersion(what: string, stored: { version: number } | null, baseVersion: number | null | undefined, current: unknown): void {
  if (stored === null) {
    if (baseVersion !== undefined && baseVersion !== null) throw staleVersion(what, null);
    return;
  }
  if (baseVersion !== stored.version) throw staleVersion(what, current);
}

/** Plain JSON object (not null, not an array). */
export function isPlainObject(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

export const iso = (d: Date | string): string => (d instanceof Date ? d.toISOString() : new Date(d).toISOString());
