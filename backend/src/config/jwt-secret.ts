import { randomBytes } from 'node:crypto';
import { chmodSync, linkSync, mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';

export const JWT_SECRET_FILE = 'jwt-secret';

/**
 * Returns the secret kept in `<storageDir>/jwt-secret`, creating it on first use so that tokens
 * survive restarts without anyone having to choose a secret. The file is readable by its owner only.
 */
export function readOrCreateJwtSecret(storageDir: string): string {
  const file = join(storageDir, JWT_SECRET_FILE);
  mkdirSync(storageDir, { recursive: true });
  const secret = randomBytes(48).toString('base64url');
  // Written whole under a name of this process's own, then linked into place: the link fails when
  // the file exists, so processes starting together keep one secret, and none can read the file
  // between its creation and its content (as it could with an exclusive create and a write).
  const draft = `${file}.${process.pid}.${randomBytes(4).toString('hex')}`;
  writeFileSync(draft, `${secret}\n`, { flag: 'wx', mode: 0o600 });
  try {
    linkSync(draft, file);
    return secret;
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code !== 'EEXIST') throw error;
  } finally {
    rmSync(draft, { force: true });
  }
  // An older file may have been created with a looser mode by hand; tighten it.
  chmodSync(file, 0o600);
  const existing = readFileSync(file, 'utf8').trim();
  if (existing.length < 16) {
    throw new Error(`${file} holds a secret shorter than 16 characters; delete it to generate a new one`);
  }
  return existing;
}
