import { ConflictException } from '@nestjs/common';
import type { EntityManager } from 'typeorm';

/**
 * Readings are the record and they point into a run's recording by time: once any reading exists,
 * the run, its recording and its sheets stay (the foreign keys would otherwise cascade them away).
 */
export async function refuseIfRunHasReadings(manager: EntityManager, runId: string, action: string): Promise<void> {
  const [{ readings }] = (await manager.query(
    'SELECT count(*)::int AS readings FROM readings r JOIN sheets s ON s.id = r.sheet_id WHERE s.run_id = $1',
    [runId],
  )) as Array<{ readings: number }>;
  if (readings > 0) {
    throw new ConflictException(
      `This run has ${readings} reading${readings === 1 ? '' : 's'} typed from its recording; readings are never deleted, so you cannot ${action}`,
    );
  }
}
