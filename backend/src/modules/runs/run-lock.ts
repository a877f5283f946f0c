import type { DataLock } from '@dialsheet/common';
import { ConflictException } from '@nestjs/common';
import type { RunEntity } from './run.entity';

/** The release lock on a run's data, as the wire types carry it; null while the run is open. */
export function runLock(run: Pick<RunEntity, 'lockedReleaseId' | 'lockedReleaseNumber'>): DataLock | null {
  if (!run.lockedReleaseId || run.lockedReleaseNumber === null) return null;
  return { releaseId: run.lockedReleaseId, releaseNumber: run.lockedReleaseNumber };
}

export function lockedMessage(run: Pick<RunEntity, 'name'>, lock: DataLock): string {
  return `Run “${run.name}” is locked by release ${lock.releaseNumber}: its data can no longer change; a correction needs a new release version`;
}

/**
 * Released data never changes: every route that writes readings, resolutions, sheets or the run
 * itself calls this with the run read in the same transaction.
 */
export function refuseIfLocked(run: Pick<RunEntity, 'name' | 'lockedReleaseId' | 'lockedReleaseNumber'>): void {
  const lock = runLock(run);
  if (lock) throw new ConflictException(lockedMessage(run, lock));
}
