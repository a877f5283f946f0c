import type { DataLock, Sheet } from '@dialsheet/common';
import { sheetRowCount } from './sheet-rules';
import type { SheetEntity } from './sheet.entity';

/** The plan fields a client may set, in the order the wire type lists them. */
export const SHEET_FIELDS = ['name', 'startTime', 'endTime', 'interval', 'channelIds'] as const;

/** Cells of each pass that hold an entry, counted within the sheet's current rows and channels. */
export interface SheetDone {
  pass1: number;
  pass2: number;
}

/** `channelIds` in entry order; `done` absent means no entries yet (a sheet just planned). */
export function toSheet(entity: SheetEntity, channelIds: string[], done: SheetDone = { pass1: 0, pass2: 0 }, lock: DataLock | null = null): Sheet {
  const rowCount = sheetRowCount(entity.startTime, entity.endTime, entity.interval);
  const total = rowCount * channelIds.length;
  return {
    id: entity.id,
    campaignId: entity.campaignId,
    runId: entity.runId,
    name: entity.name,
    startTime: entity.startTime,
    endTime: entity.endTime,
    interval: entity.interval,
    channelIds: [...channelIds],
    rowCount,
    readerId: entity.readerId,
    checkerId: entity.checkerId,
    status: entity.readerId && entity.checkerId ? 'open' : 'draft',
    progress: { pass1: { done: done.pass1, total }, pass2: { done: done.pass2, total } },
    pass1FinishedAt: entity.pass1FinishedAt?.toISOString() ?? null,
    pass2FinishedAt: entity.pass2FinishedAt?.toISOString() ?? null,
    lock,
    createdAt: entity.createdAt.toISOString(),
    updatedAt: entity.updatedAt.toISOString(),
  };
}

/** The fields of a sheet the audit trail records. */
export function sheetSnapshot(entity: Pick<SheetEntity, 'name' | 'startTime' | 'endTime' | 'interval'>, channelIds: string[]): Record<string, unknown> {
  return {
    name: entity.name,
    startTime: entity.startTime,
    endTime: entity.endTime,
    interval: entity.interval,
    channelIds: [...channelIds],
  };
}
