import type { CampaignRole } from './roles';

export type CampaignStatus = 'active' | 'archived';

export interface Campaign {
  id: string;
  name: string;
  description: string;
  /** Decimal separator readers type in this campaign: '.' always works, ',' only if allowed. */
  decimalComma: boolean;
  status: CampaignStatus;
  createdAt: string;
  updatedAt: string;
  /** The roles the requesting user holds in this campaign. */
  myRoles: CampaignRole[];
  memberCount: number;
}

export interface CreateCampaignRequest {
  name: string;
  description?: string;
  decimalComma?: boolean;
}

export interface UpdateCampaignRequest {
  name?: string;
  description?: string;
  decimalComma?: boolean;
  /** Optional reason stored in the audit trail. */
  reason?: string;
}

export interface CampaignMember {
  userId: string;
  email: string;
  name: string;
  roles: CampaignRole[];
  joinedAt: string;
}

export interface UpdateMemberRolesRequest {
  roles: CampaignRole[];
  reason?: string;
}

export type InvitationStatus = 'pending' | 'accepted' | 'revoked' | 'expired';

export interface Invitation {
  id: string;
  campaignId: string;
  email: string;
  roles: CampaignRole[];
  status: InvitationStatus;
  invitedBy: string;
  expiresAt: string;
  createdAt: string;
}

export interface CreateInvitationRequest {
  email: string;
  roles: CampaignRole[];
}

/** What the invitee sees when following the link (no account needed). */
export interface InvitationPreview {
  /** Lets the web app open the campaign right after the invitee accepts. */
  campaignId: string;
  campaignName: string;
  email: string;
  roles: CampaignRole[];
  invitedByName: string;
  expiresAt: string;
  /** True when an account with this e-mail already exists: the invitee signs in instead of setting a password. */
  accountExists: boolean;
}

export interface AcceptInvitationRequest {
  token: string;
  /** Required when no account exists for the invited e-mail. */
  name?: string;
  password?: string;
}
