import { describe, expect, it } from 'vitest';
import { UserEntity } from '../users/user.entity';
import { AuditEntryEntity } from './audit-entry.entity';
import { toAuditEntry } from './audit.mapper';

describe('toAuditEntry', () => {
  const base = Object.assign(new AuditEntryEntity(), {
    id: 'a0f3e1c2-1111-4222-8333-944455566677',
    seq: '9007199254740',
    campaignId: 'b1f3e1c2-1111-4222-8333-944455566677',
    actorId: 'c2f3e1c2-1111-4222-8333-944455566677',
    entityType: 'campaign',
    entityId: 'b1f3e1c2-1111-4222-8333-944455566677',
    action: 'update' as const,
    before: { name: 'Old' },
    after: { name: 'New' },
    reason: 'typo',
    createdAt: new Date('2025-06-01T12:00:00.000Z'),
  });

  it('turns the bigint sequence into a number and names the actor', () => {
    const entry = toAuditEntry(
      Object.assign(new AuditEntryEntity(), base, { actor: Object.assign(new UserEntity(), { name: 'Lena Lead' }) }),
    );
    expect(entry).toEqual({
      id: base.id,
      seq: 9007199254740,
      campaignId: base.campaignId,
      actorId: base.actorId,
      actorName: 'Lena Lead',
      entityType: 'campaign',
      entityId: base.entityId,
      action: 'update',
      before: { name: 'Old' },
      after: { name: 'New' },
      reason: 'typo',
      createdAt: '2025-06-01T12:00:00.000Z',
    });
  });

  it('gives a null actor name when the actor is not loaded or absent', () => {
    expect(toAuditEntry(Object.assign(new AuditEntryEntity(), base, { actor: null })).actorName).toBeNull();
  });
});
