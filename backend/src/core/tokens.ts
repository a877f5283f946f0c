import { createHash, randomBytes } from 'node:crypto';

/** 256 random bits, URL-safe: goes into e-mailed links only; the database keeps its hash. */
export function newToken(): string {
  return randomBytes(32).toString('base64url');
}

/** A plain SHA-256 is enough here: the token already has full entropy, unlike a password. */
export function hashToken(token: string): string {
  return createHash('sha256').update(token, 'utf8').digest('hex');
}
