import { describe, expect, it } from 'vitest';
import { InvitationEntity } from './invitation.entity';
import { invitationStatus, toInvitation } from './invitation.mapper';

const now = new Date('2025-05-10T12:00:00.000Z');

function invitation(overrides: Partial<InvitationEntity> = {}): InvitationEntity {
  return Object.assign(new InvitationEntity(), {
    id: 'i1',
    campaignId: 'c1',
    email: 'new@x.test',
    roles: ['lead', 'reader'],
    tokenHash: 'f'.repeat(64),
    invitedById: 'u1',
    expiresAt: new Date('2025-05-17T12:00:00.000Z'),
    acceptedAt: null,
    acceptedById: null,
    revokedAt: null,
    createdAt: new Date('2025-05-10T11:00:00.000Z'),
    ...overrides,
  });
}

describe('invitationStatus', () => {
  it.each([
    ['pending', {}],
    ['accepted', { acceptedAt: now }],
    ['revoked', { revokedAt: now }],
    ['expired', { expiresAt: now }],
    ['accepted', { acceptedAt: now, expiresAt: new Date(0) }],
  ] as const)('%s', (expected, overrides) => {
    expect(invitationStatus(invitation(overrides), now)).toBe(expected);
  });
});

describe('toInvitation', () => {
  it('maps the wire fields and never the token hash', () => {
    const wire = toInvitation(invitation(), now);
    expect(wire).toEqual({
      id: 'i1',
      campaignId: 'c1',
      email: 'new@x.test',
      roles: ['reader', 'lead'],
      status: 'pending',
      invitedBy: 'u1',
      expiresAt: '2025-05-17T12:00:00.000Z',
      createdAt: '2025-05-10T11:00:00.000Z',
    });
    expect(JSON.stringify(wire)).not.toContain('fff');
  });
});
