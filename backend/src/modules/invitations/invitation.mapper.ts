import type { Invitation, InvitationStatus } from '@dialsheet/common';
import { sortRoles } from '../campaigns/campaign.mapper';
import type { InvitationEntity } from './invitation.entity';

export function invitationStatus(entity: InvitationEntity, now: Date): InvitationStatus {
  if (entity.acceptedAt) return 'accepted';
  if (entity.revokedAt) return 'revoked';
  if (entity.expiresAt.getTime() <= now.getTime()) return 'expired';
  return 'pending';
}

export function toInvitation(entity: InvitationEntity, now: Date = new Date()): Invitation {
  return {
    id: entity.id,
    campaignId: entity.campaignId,
    email: entity.email,
    roles: sortRoles(entity.roles),
    status: invitationStatus(entity, now),
    invitedBy: entity.invitedById,
    expiresAt: entity.expiresAt.toISOString(),
    createdAt: entity.createdAt.toISOString(),
  };
}
