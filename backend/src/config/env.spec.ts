import { execFile } from 'node:child_process';
import { mkdtempSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { ConfigError, loadConfig, loadMailCatcherSettings, validateEnv } from './env';
import { DEFAULT_STORAGE_DIR } from './paths';

const DATABASE_URL = 'postgres://someone@127.0.0.1:5432/somewhere';

function problemsOf(fn: () => unknown): string[] {
  try {
    fn();
  } catch (error) {
    expect(error).toBeInstanceOf(ConfigError);
    return (error as ConfigError).problems;
  }
  throw new Error('expected a ConfigError');
}

describe('validateEnv', () => {
  it('fails clearly when DATABASE_URL is missing', () => {
    const problems = problemsOf(() => validateEnv({}));
    expect(problems).toEqual(['DATABASE_URL is required, e.g. postgres://user@127.0.0.1:5432/dialsheet']);
  });

  it('rejects a DATABASE_URL that is not a postgres URL', () => {
    expect(problemsOf(() => validateEnv({ DATABASE_URL: 'mysql://x/y' }))).toEqual([
      'DATABASE_URL must be a postgres:// connection URL, e.g. postgres://user@127.0.0.1:5432/dialsheet',
    ]);
  });

  it.each(['abc', '70000', '0', '3000.5'])('rejects PORT=%s', (port) => {
    expect(problemsOf(() => validateEnv({ DATABASE_URL, PORT: port }))).toContain(
      'PORT must be a whole number between 1 and 65535',
    );
  });

  it('lists every problem at once', () => {
    const problems = problemsOf(() =>
      validateEnv({ PORT: 'x', JWT_EXPIRES_IN: '5', APP_URL: 'not a url', SMTP_URL: 'http://mail' }),
    );
    expect(problems).toHaveLength(5);
    expect(problems.join('\n')).toMatch(/DATABASE_URL/);
    expect(problems.join('\n')).toMatch(/JWT_EXPIRES_IN must be at least 60 seconds/);
    expect(problems.join('\n')).toMatch(/APP_URL must be an http\(s\) URL/);
    expect(problems.join('\n')).toMatch(/SMTP_URL must look like smtp:/);
  });

  it('fills the documented defaults', () => {
    const s = validateEnv({ DATABASE_URL });
    expect(s).toMatchObject({
      port: 3000,
      host: '127.0.0.1',
      databaseUrl: DATABASE_URL,
      storageDir: DEFAULT_STORAGE_DIR,
      jwtExpiresIn: 43200,
      smtpUrl: 'smtp://127.0.0.1:2525',
      mailFrom: 'Dialsheet <no-reply@dialsheet.test>',
      appUrl: 'http://127.0.0.1:3000',
      demoPassword: 'dialsheet-demo',
      mailCatcherDir: join(DEFAULT_STORAGE_DIR, 'mail'),
      throttleLoginLimit: 10,
    });
    expect(s.jwtSecretFromEnv).toBeUndefined();
  });

  it('derives APP_URL from PORT, drops a trailing slash, treats empty variables as unset', () => {
    expect(validateEnv({ DATABASE_URL, PORT: '4100' }).appUrl).toBe('http://127.0.0.1:4100');
    expect(validateEnv({ DATABASE_URL, APP_URL: 'https://lab.example.org/' }).appUrl).toBe('https://lab.example.org');
    expect(validateEnv({ DATABASE_URL, PORT: '' }).port).toBe(3000);
  });
});

describe('recording settings', () => {
  it('defaults to local storage, an 8 GiB upload limit, 15-minute media links and an in-process worker', () => {
    expect(validateEnv({ DATABASE_URL })).toMatchObject({
      uploadMaxBytes: 8 * 1024 ** 3,
      storageDriver: 'local',
      s3: null,
      mediaUrlTtlSeconds: 900,
      worker: true,
      ffmpegPath: 'ffmpeg',
      ffprobePath: 'ffprobe',
    });
  });

  it('reads the S3 settings when STORAGE_DRIVER=s3', () => {
    const s = validateEnv({
      DATABASE_URL,
      STORAGE_DRIVER: 's3',
      S3_BUCKET: 'lab-videos',
      S3_ENDPOINT: 'http://127.0.0.1:9000/',
      S3_ACCESS_KEY_ID: 'id',
      S3_SECRET_ACCESS_KEY: 'secret',
      S3_FORCE_PATH_STYLE: 'true',
      WORKER: 'off',
      UPLOAD_MAX_BYTES: '1048576',
    });
    expect(s).toMatchObject({
      storageDriver: 's3',
      s3: {
        bucket: 'lab-videos',
        endpoint: 'http://127.0.0.1:9000',
        region: 'us-east-1',
        accessKeyId: 'id',
        secretAccessKey: 'secret',
        forcePathStyle: true,
      },
      worker: false,
      uploadMaxBytes: 1048576,
    });
  });

  it('names each bad recording variable', () => {
    const problems = problemsOf(() =>
      validateEnv({
        DATABASE_URL,
        STORAGE_DRIVER: 'ftp',
        UPLOAD_MAX_BYTES: '8GB',
        MEDIA_URL_TTL_SECONDS: '5',
        WORKER: 'yes',
        S3_FORCE_PATH_STYLE: '1',
        S3_ENDPOINT: 'minio:9000',
      }),
    );
    expect(problems).toEqual(
      expect.arrayContaining([
        'STORAGE_DRIVER must be local or s3',
        'UPLOAD_MAX_BYTES must be a whole number of bytes, e.g. 8589934592 for 8 GiB',
        'MEDIA_URL_TTL_SECONDS must be at least 10 seconds',
        'WORKER must be on or off',
        'S3_FORCE_PATH_STYLE must be true or false',
        'S3_ENDPOINT must be an http(s) URL such as http://127.0.0.1:9000',
      ]),
    );
    expect(problems).toHaveLength(6);
  });

  it('needs a bucket for S3 and both halves of a key pair', () => {
    expect(problemsOf(() => validateEnv({ DATABASE_URL, STORAGE_DRIVER: 's3', S3_ACCESS_KEY_ID: 'id' }))).toEqual([
      'S3_BUCKET is required when STORAGE_DRIVER=s3',
      'S3_ACCESS_KEY_ID and S3_SECRET_ACCESS_KEY must be set together (or both left unset for the default credentials)',
    ]);
    expect(problemsOf(() => validateEnv({ DATABASE_URL, S3_BUCKET: 'Bad_Bucket' }))).toEqual([
      'S3_BUCKET must be a bucket name: 3–63 lower-case letters, digits, dots and hyphens',
    ]);
  });
});

describe('loadConfig and the JWT secret', () => {
  let dir: string;
  beforeEach(() => {
    dir = mkdtempSync(join(tmpdir(), 'dialsheet-config-'));
  });
  afterEach(() => rmSync(dir, { recursive: true, force: true }));

  it('uses JWT_SECRET when given and writes no file', () => {
    const config = loadConfig({ DATABASE_URL, STORAGE_DIR: dir, JWT_SECRET: 'a-long-enough-secret-value' });
    expect(config.jwtSecret).toBe('a-long-enough-secret-value');
    expect(() => statSync(join(dir, 'jwt-secret'))).toThrow();
  });

  it('generates a secret once, keeps it in STORAGE_DIR/jwt-secret with mode 600, and reuses it', () => {
    const first = loadConfig({ DATABASE_URL, STORAGE_DIR: dir });
    const file = join(dir, 'jwt-secret');
    expect(statSync(file).mode & 0o777).toBe(0o600);
    expect(readFileSync(file, 'utf8').trim()).toBe(first.jwtSecret);
    expect(first.jwtSecret.length).toBeGreaterThanOrEqual(32);
    expect(loadConfig({ DATABASE_URL, STORAGE_DIR: dir }).jwtSecret).toBe(first.jwtSecret);
  });

  it('gives processes starting together one secret, each reading it whole, and leaves no drafts', async () => {
    const module = pathToFileURL(join(__dirname, 'jwt-secret.ts')).href;
    // The backend is CommonJS: imported from ESM, its exports sit under `default`.
    const script = `import(${JSON.stringify(module)}).then((m) => process.stdout.write((m.readOrCreateJwtSecret ?? m.default.readOrCreateJwtSecret)(${JSON.stringify(dir)})))`;
    const one = () =>
      new Promise<string>((resolve, reject) =>
        execFile(process.execPath, ['--import', 'tsx', '-e', script], (error, stdout, stderr) => (error ? reject(new Error(stderr || error.message)) : resolve(stdout))),
      );
    const secrets = await Promise.all(Array.from({ length: 6 }, one));
    expect(new Set(secrets).size).toBe(1);
    expect(secrets[0].length).toBeGreaterThanOrEqual(32);
    expect(readdirSync(dir)).toEqual(['jwt-secret']);
  }, 60_000);

  it('refuses a too-short JWT_SECRET and a truncated secret file', () => {
    expect(problemsOf(() => loadConfig({ DATABASE_URL, STORAGE_DIR: dir, JWT_SECRET: 'short' }))).toEqual([
      'JWT_SECRET must be at least 16 characters (leave it unset to generate one)',
    ]);
    writeFileSync(join(dir, 'jwt-secret'), 'tiny\n');
    expect(() => loadConfig({ DATABASE_URL, STORAGE_DIR: dir })).toThrow(/shorter than 16 characters/);
  });
});

describe('loadMailCatcherSettings', () => {
  it('needs no database and defaults to port 2525 and STORAGE_DIR/mail', () => {
    expect(loadMailCatcherSettings({ STORAGE_DIR: '/srv/x' })).toEqual({ port: 2525, dir: '/srv/x/mail' });
    expect(loadMailCatcherSettings({ MAIL_CATCHER_PORT: '2600', MAIL_CATCHER_DIR: '/srv/m' })).toEqual({
      port: 2600,
      dir: '/srv/m',
    });
  });

  it('rejects a bad port', () => {
    expect(problemsOf(() => loadMailCatcherSettings({ MAIL_CATCHER_PORT: 'smtp' }))).toEqual([
      'MAIL_CATCHER_PORT must be a whole number between 1 and 65535',
    ]);
  });
});
