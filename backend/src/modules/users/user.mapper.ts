import type { AdminUser, User } from '@dialsheet/common';
import type { UserEntity } from './user.entity';

export function toUser(entity: UserEntity): User {
  return {
    id: entity.id,
    email: entity.email,
    name: entity.name,
    isAdmin: entity.isAdmin,
    createdAt: entity.createdAt.toISOString(),
  };
}

export function toAdminUser(entity: UserEntity): AdminUser {
  return { ...toUser(entity), disabled: entity.disabledAt !== null };
}

/** E-mail addresses are compared case-insensitively everywhere; we store them lower-cased. */
export function normalizeEmail(email: string): string {
  return email.trim().toLowerCase();
}
