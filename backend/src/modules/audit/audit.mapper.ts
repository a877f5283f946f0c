import type { AuditEntry } from '@dialsheet/common';
import type { AuditEntryEntity } from './audit-entry.entity';

export function toAuditEntry(entity: AuditEntryEntity): AuditEntry {
  return {
    id: entity.id,
    seq: Number(entity.seq),
    campaignId: entity.campaignId,
    actorId: entity.actorId,
    actorName: entity.actor?.name ?? null,
    entityType: entity.entityType,
    entityId: entity.entityId,
    action: entity.action,
    before: entity.before,
    after: entity.after,
    reason: entity.reason,
    createdAt: entity.createdAt.toISOString(),
  };
}
