import { describe, expect, it } from 'vitest';
import { normalizeEmail, toAdminUser, toUser } from './user.mapper';
import { UserEntity } from './user.entity';

function entity(overrides: Partial<UserEntity> = {}): UserEntity {
  return Object.assign(new UserEntity(), {
    id: '6f1c1d52-7d0b-4a43-9a55-7d0f4b8f3a10',
    email: 'rita@example.test',
    name: 'Rita Reader',
    passwordHash: '$2b$10$secret',
    isAdmin: false,
    disabledAt: null,
    tokenVersion: 3,
    createdAt: new Date('2025-03-04T05:06:07.000Z'),
    updatedAt: new Date('2025-03-05T00:00:00.000Z'),
    ...overrides,
  });
}

describe('toUser', () => {
  it('maps the wire fields and leaves the hash and token version on the server', () => {
    const user = toUser(entity());
    expect(user).toEqual({
      id: '6f1c1d52-7d0b-4a43-9a55-7d0f4b8f3a10',
      email: 'rita@example.test',
      name: 'Rita Reader',
      isAdmin: false,
      createdAt: '2025-03-04T05:06:07.000Z',
    });
    expect(JSON.stringify(user)).not.toContain('secret');
  });
});

describe('toAdminUser', () => {
  it('adds the disabled flag', () => {
    expect(toAdminUser(entity()).disabled).toBe(false);
    expect(toAdminUser(entity({ disabledAt: new Date() })).disabled).toBe(true);
  });
});

describe('normalizeEmail', () => {
  it('trims and lower-cases', () => {
    expect(normalizeEmail('  Lead@Demo.TEST ')).toBe('lead@demo.test');
  });
});
