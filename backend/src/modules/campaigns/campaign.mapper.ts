import { CAMPAIGN_ROLES, type Campaign, type CampaignMember, type CampaignRole } from '@dialsheet/common';
import type { CampaignMemberEntity } from './campaign-member.entity';
import type { CampaignEntity } from './campaign.entity';

/** Roles in their canonical order, so clients and the audit trail see stable arrays. */
export function sortRoles(roles: readonly CampaignRole[]): CampaignRole[] {
  return CAMPAIGN_ROLES.filter((r) => roles.includes(r));
}

export function toCampaign(entity: CampaignEntity, myRoles: readonly CampaignRole[], memberCount: number): Campaign {
  return {
    id: entity.id,
    name: entity.name,
    description: entity.description,
    decimalComma: entity.decimalComma,
    status: entity.status,
    createdAt: entity.createdAt.toISOString(),
    updatedAt: entity.updatedAt.toISOString(),
    myRoles: sortRoles(myRoles),
    memberCount,
  };
}

/** Needs the member's `user` relation loaded. */
export function toCampaignMember(entity: CampaignMemberEntity): CampaignMember {
  if (!entity.user) throw new Error('toCampaignMember needs the user relation');
  return {
    userId: entity.userId,
    email: entity.user.email,
    name: entity.user.name,
    roles: sortRoles(entity.roles),
    joinedAt: entity.joinedAt.toISOString(),
  };
}

/** The fields of a campaign the audit trail records. */
export function campaignSnapshot(entity: CampaignEntity): Record<string, unknown> {
  return {
    name: entity.name,
    description: entity.description,
    decimalComma: entity.decimalComma,
    status: entity.status,
  };
}
