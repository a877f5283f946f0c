import { ConflictException } from '@nestjs/common';
import { describe, expect, it } from 'vitest';
import { refuseIfLocked, runLock } from './run-lock';

describe('run lock', () => {
  it('is null while no release holds the run', () => {
    expect(runLock({ lockedReleaseId: null, lockedReleaseNumber: null })).toBeNull();
    expect(() => refuseIfLocked({ name: 'Run 1', lockedReleaseId: null, lockedReleaseNumber: null })).not.toThrow();
  });

  it('refuses with a 409 naming the release once a release holds the run', () => {
    const run = { name: 'Run 1', lockedReleaseId: '7b0c4a52-4a4c-4a52-9a1e-000000000001', lockedReleaseNumber: 3 };
    expect(runLock(run)).toEqual({ releaseId: run.lockedReleaseId, releaseNumber: 3 });
    expect(() => refuseIfLocked(run)).toThrow(ConflictException);
    expect(() => refuseIfLocked(run)).toThrow(/locked by release 3/);
  });
});
