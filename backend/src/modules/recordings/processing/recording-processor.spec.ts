import { describe, expect, it } from 'vitest';
import { outcomeOfFailure, RECORDING_QUEUE_SETTINGS } from './recording-processor';

describe('outcomeOfFailure', () => {
  it('fails a recording at once when the file itself is at fault', () => {
    expect(outcomeOfFailure(true, 0, 2)).toBe('fail');
  });

  it('retries other faults a bounded number of times, then fails', () => {
    const limit = RECORDING_QUEUE_SETTINGS.retryLimit;
    expect(limit).toBe(2);
    const outcomes = [0, 1, 2].map((retryCount) => outcomeOfFailure(false, retryCount, limit));
    expect(outcomes).toEqual(['retry', 'retry', 'fail']);
  });
});
