// Environment for the developer scripts, read and validated once so a typo in a port
// fails before anything is built or started.
import path from 'node:path';

/** The repository root: this file lives in scripts/lib/. */
export const repoRoot = path.resolve(__dirname, '..', '..');

export class ConfigError extends Error {}

export function readPort(env: NodeJS.ProcessEnv, name: string, fallback: number): number {
  const raw = env[name];
  if (raw === undefined || raw.trim() === '') return fallback;
  const text = raw.trim();
  const port = Number(text);
  if (!/^\d+$/.test(text) || !Number.isInteger(port) || port < 1 || port > 65535) {
    throw new ConfigError(`${name} must be a TCP port number between 1 and 65535 (got "${raw}")`);
  }
  return port;
}

function readText(env: NodeJS.ProcessEnv, name: string): string | undefined {
  const raw = env[name];
  return raw === undefined || raw.trim() === '' ? undefined : raw.trim();
}

function readUrl(env: NodeJS.ProcessEnv, name: string, protocols: string[]): string | undefined {
  const raw = readText(env, name);
  if (raw === undefined) return undefined;
  let url: URL;
  try {
    url = new URL(raw);
  } catch {
    throw new ConfigError(`${name} is not a valid URL (got "${raw}")`);
  }
  if (!protocols.includes(url.protocol)) {
    throw new ConfigError(`${name} must start with ${protocols.map((p) => `${p}//`).join(' or ')} (got "${raw}")`);
  }
  return raw;
}

/** Resolves a directory given in the environment; relative paths are taken from the repo root. */
export function readStorageDir(env: NodeJS.ProcessEnv): string {
  const raw = readText(env, 'STORAGE_DIR');
  return raw === undefined ? path.join(repoRoot, 'storage') : path.resolve(repoRoot, raw);
}

export interface StartConfig {
  port: number;
  host: string;
  pgPort: number;
  databaseUrl?: string;
  storageDir: string;
  smtpUrl?: string;
  mailCatcherPort: number;
  demoPassword: string;
  appUrl?: string;
}

export function readStartConfig(env: NodeJS.ProcessEnv = process.env): StartConfig {
  const config: StartConfig = {
    port: readPort(env, 'PORT', 3000),
    host: readText(env, 'HOST') ?? '127.0.0.1',
    pgPort: readPort(env, 'PG_PORT', 5433),
    databaseUrl: readUrl(env, 'DATABASE_URL', ['postgres:', 'postgresql:']),
    storageDir: readStorageDir(env),
    smtpUrl: readUrl(env, 'SMTP_URL', ['smtp:', 'smtps:']),
    mailCatcherPort: readPort(env, 'MAIL_CATCHER_PORT', 2525),
    demoPassword: readText(env, 'DEMO_PASSWORD') ?? 'dialsheet-demo',
    appUrl: readUrl(env, 'APP_URL', ['http:', 'https:']),
  };
  const used: Array<[string, number]> = [['PORT', config.port]];
  if (!config.databaseUrl) used.push(['PG_PORT', config.pgPort]);
  if (!config.smtpUrl) used.push(['MAIL_CATCHER_PORT', config.mailCatcherPort]);
  for (let i = 0; i < used.length; i++) {
    for (let j = i + 1; j < used.length; j++) {
      if (used[i][1] === used[j][1]) {
        throw new ConfigError(`${used[i][0]} and ${used[j][0]} are both ${used[i][1]}; give them different ports`);
      }
    }
  }
  return config;
}

export interface TestConfig {
  storageDir: string;
  pgTestPort: number;
  demoPassword: string;
  /** `E2E_ONLY`: run only the browser test files whose names contain these words (space-separated). */
  e2eOnly: string[];
}

export function readTestConfig(env: NodeJS.ProcessEnv = process.env): TestConfig {
  return {
    storageDir: readStorageDir(env),
    pgTestPort: readPort(env, 'PG_TEST_PORT', 5434),
    demoPassword: readText(env, 'DEMO_PASSWORD') ?? 'dialsheet-demo',
    e2eOnly: (readText(env, 'E2E_ONLY') ?? '').split(/\s+/).filter(Boolean),
  };
}

/** Host to reach a server that listens on `host` (a wildcard address is reached on loopback). */
export function reachableHost(host: string): string {
  if (host === '0.0.0.0' || host === '::' || host === '[::]') return '127.0.0.1';
  return host.includes(':') && !host.startsWith('[') ? `[${host}]` : host;
}
