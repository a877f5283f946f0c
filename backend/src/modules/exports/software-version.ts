import { readFileSync } from 'node:fs';
import { join } from 'node:path';

/**
 * The server's version as its package.json states it, written into every export's provenance.
 * This file sits three folders below the backend package both as source (src/modules/exports)
 * and compiled (dist/modules/exports), so the same relative path finds it.
 */
function readVersion(): string {
  try {
    const pkg = JSON.parse(readFileSync(join(__dirname, '..', '..', '..', 'package.json'), 'utf8')) as { version?: unknown };
    return typeof pkg.version === 'string' ? pkg.version : 'unknown';
  } catch {
    return 'unknown';
  }
}

export const SOFTWARE_VERSION = readVersion();
