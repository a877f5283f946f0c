import type { DataLock } from '@dialsheet/common';
import { ConflictException } from '@nestjs/common';
import type { EntityManager } from 'typeorm';
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

/**
 * A calibration turns the raw readings of every run that reads the channel into engineering
 * values, so it may not change while any of those runs is inside a release. Callers hold the
 * campaign row lock (as signing does), so a release cannot be signed in between.
 */
export async function refuseIfChannelLocked(manager: EntityManager, channelId: string): Promise<void> {
  const [locked] = (await manager.query(
    `SELECT c.symbol, r.name, r.locked_release_number AS number
       FROM channels c
       JOIN sheet_channels sc ON sc.channel_id = c.id
       JOIN sheets s ON s.id = sc.sheet_id
       JOIN runs r ON r.id = s.run_id
      WHERE c.id = $1 AND r.locked_release_id IS NOT NULL
      ORDER BY r.locked_release_number, r.name
      LIMIT 1`,
    [channelId],
  )) as Array<{ symbol: string; name: string; number: number }>;
  if (locked) {
    throw new ConflictException(
      `Channel ${locked.symbol} is read in run “${locked.name}”, which is locked by release ${locked.number}: its calibration can no longer change; a correction needs a new release version`,
    );
  }
}
