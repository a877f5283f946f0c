import type { DuplicateRecordingError } from '@dialsheet/common';
import { ConflictException } from '@nestjs/common';

export type DuplicateOf = DuplicateRecordingError['duplicateOf'];

/**
 * 409 for bytes that are already a recording in the campaign (same SHA-256). The body names the
 * run that holds them, so the client can offer a link to it instead of a second copy.
 */
export function duplicateRecordingError(found: DuplicateOf): ConflictException {
  const body: DuplicateRecordingError = {
    statusCode: 409,
    error: 'Conflict',
    message: `This file is already the recording of run ${found.runName}`,
    duplicateOf: { runId: found.runId, runName: found.runName, recordingId: found.recordingId },
  };
  return new ConflictException(body);
}
