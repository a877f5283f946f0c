import { randomUUID } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { toApiError } from '../../../core/filters/all-exceptions.filter';
import { duplicateRecordingError } from './duplicate';

describe('duplicateRecordingError', () => {
  it('is a 409 naming the run that already holds the file, and the body reaches the client whole', () => {
    const duplicateOf = { runId: randomUUID(), runName: 'Run 2 — meter on cool stream', recordingId: randomUUID() };
    const error = duplicateRecordingError(duplicateOf);
    expect(error.getStatus()).toBe(409);
    expect(toApiError(error)).toEqual({
      statusCode: 409,
      error: 'Conflict',
      message: 'This file is already the recording of run Run 2 — meter on cool stream',
      duplicateOf,
    });
  });

  it('copies only the three link fields', () => {
    const error = duplicateRecordingError({ runId: 'r', runName: 'n', recordingId: 'c', sha256: 'x' } as never);
    expect((toApiError(error) as unknown as { duplicateOf: unknown }).duplicateOf).toEqual({ runId: 'r', runName: 'n', recordingId: 'c' });
  });
});
