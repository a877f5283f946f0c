import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { ConfigError, reachableHost, readPort, readStartConfig, readTestConfig, repoRoot } from './config';

describe('readPort', () => {
  it('falls back when the variable is absent or blank', () => {
    expect(readPort({}, 'PORT', 3000)).toBe(3000);
    expect(readPort({ PORT: '  ' }, 'PORT', 3000)).toBe(3000);
  });

  it('accepts a port number with surrounding blanks', () => {
    expect(readPort({ PORT: ' 8080 ' }, 'PORT', 3000)).toBe(8080);
  });

  it.each(['0', '65536', '80a', '-1', '3.5', 'http'])('rejects %j naming the variable and the value', (value) => {
    expect(() => readPort({ PG_PORT: value }, 'PG_PORT', 5433)).toThrow(ConfigError);
    expect(() => readPort({ PG_PORT: value }, 'PG_PORT', 5433)).toThrow(`PG_PORT must be a TCP port number between 1 and 65535 (got "${value}")`);
  });
});

describe('readStartConfig', () => {
  it('has the documented defaults', () => {
    expect(readStartConfig({})).toEqual({
      port: 3000,
      host: '127.0.0.1',
      pgPort: 5433,
      databaseUrl: undefined,
      storageDir: path.join(repoRoot, 'storage'),
      smtpUrl: undefined,
      mailCatcherPort: 2525,
      demoPassword: 'dialsheet-demo',
      appUrl: undefined,
    });
  });

  it('resolves a relative STORAGE_DIR from the repository root', () => {
    expect(readStartConfig({ STORAGE_DIR: 'var/data' }).storageDir).toBe(path.join(repoRoot, 'var', 'data'));
  });

  it('rejects two services on one port', () => {
    expect(() => readStartConfig({ PORT: '5433' })).toThrow('PORT and PG_PORT are both 5433');
    expect(() => readStartConfig({ MAIL_CATCHER_PORT: '3000' })).toThrow('PORT and MAIL_CATCHER_PORT are both 3000');
  });

  it('ignores the ports of services that are not started', () => {
    const config = readStartConfig({ PORT: '5433', DATABASE_URL: 'postgres://u:p@db.internal:5432/dialsheet' });
    expect(config.port).toBe(5433);
    expect(config.databaseUrl).toBe('postgres://u:p@db.internal:5432/dialsheet');
  });

  it('rejects URLs of the wrong kind', () => {
    expect(() => readStartConfig({ DATABASE_URL: 'mysql://x' })).toThrow('DATABASE_URL must start with postgres:// or postgresql://');
    expect(() => readStartConfig({ SMTP_URL: 'not a url' })).toThrow('SMTP_URL is not a valid URL');
  });
});

describe('readTestConfig', () => {
  it('uses port 5434 for the throw-away cluster unless PG_TEST_PORT says otherwise', () => {
    expect(readTestConfig({}).pgTestPort).toBe(5434);
    expect(readTestConfig({ PG_TEST_PORT: '6000' }).pgTestPort).toBe(6000);
  });

  it('reads E2E_ONLY as a list of browser test file names, empty when unset or blank', () => {
    expect(readTestConfig({}).e2eOnly).toEqual([]);
    expect(readTestConfig({ E2E_ONLY: '   ' }).e2eOnly).toEqual([]);
    expect(readTestConfig({ E2E_ONLY: ' sheets  releases ' }).e2eOnly).toEqual(['sheets', 'releases']);
  });
});

describe('reachableHost', () => {
  it('reaches a wildcard listener on loopback and brackets IPv6 literals', () => {
    expect(reachableHost('0.0.0.0')).toBe('127.0.0.1');
    expect(reachableHost('127.0.0.1')).toBe('127.0.0.1');
    expect(reachableHost('::1')).toBe('[::1]');
  });
});
