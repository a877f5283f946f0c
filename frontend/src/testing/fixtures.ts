import type { Campaign, CampaignMember, Invitation, User } from '@dialsheet/common';

// Wire-shaped objects for component tests; each test overrides only what it is about.
const at = '2026-03-02T09:15:00.000Z';

export function makeUser(overrides: Partial<User> = {}): User {
  return {
    id: '00000000-0000-4000-8000-000000000001',
    email: 'lena.lead@example.org',
    name: 'Lena Lead',
    isAdmin: false,
    createdAt: at,
    ...overrides,
  };
}

export function makeCampaign(overrides: Partial<Campaign> = {}): Campaign {
  return {
    id: '10000000-0000-4000-8000-000000000001',
    name: 'Plate exchanger warm-up series',
    description: 'Warm-up behaviour of a plate exchanger at three flow rates.',
    decimalComma: false,
    status: 'active',
    createdAt: at,
    updatedAt: at,
    myRoles: ['lead'],
    memberCount: 2,
    ...overrides,
  };
}

export function makeMember(overrides: Partial<CampaignMember> = {}): CampaignMember {
  return {
    userId: '00000000-0000-4000-8000-000000000002',
    email: 'rudi.reader@example.org',
    name: 'Rudi Reader',
    roles: ['reader'],
    joinedAt: at,
    ...overrides,
  };
}

export function makeInvitation(overrides: Partial<Invitation> = {}): Invitation {
  return {
    id: '20000000-0000-4000-8000-000000000001',
    campaignId: '10000000-0000-4000-8000-000000000001',
    email: 'new.checker@example.org',
    roles: ['checker'],
    status: 'pending',
    invitedBy: '00000000-0000-4000-8000-000000000001',
    expiresAt: '2026-03-09T09:15:00.000Z',
    createdAt: at,
    ...overrides,
  };
}
