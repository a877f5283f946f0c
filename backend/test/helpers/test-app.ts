import type { CampaignRole, CapturedMail, LoginResponse } from '@dialsheet/common';
import type { NestExpressApplication } from '@nestjs/platform-express';
import { mkdirSync, mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import request from 'supertest';
import { DataSource } from 'typeorm';
import { createApp } from '../../src/app.factory';
import { AppConfig } from '../../src/config/app-config';
import { loadConfig } from '../../src/config/env';
import { CampaignMemberEntity } from '../../src/modules/campaigns/campaign-member.entity';
import { MailCatcher } from '../../src/modules/mail/mail-catcher';
import { PasswordHasher } from '../../src/modules/users/password-hasher.service';
import { UserEntity } from '../../src/modules/users/user.entity';

/** supertest bound to one app's HTTP server. */
export type Http = ReturnType<typeof request>;

export const TEST_APP_URL = 'http://127.0.0.1:3999';
export const PASSWORD = 'correct-horse-battery';

export function testDatabaseUrl(): string {
  const url = process.env.DATABASE_URL;
  if (!url) throw new Error('DATABASE_URL is not set');
  return url;
}

/** A fresh directory per app under STORAGE_DIR (when the test run sets one) or the OS temp dir. */
export function scratchDir(prefix: string): string {
  const base = process.env.STORAGE_DIR ?? tmpdir();
  mkdirSync(base, { recursive: true });
  return mkdtempSync(join(base, `${prefix}-`));
}

export interface TestApp {
  app: NestExpressApplication;
  http: Http;
  config: AppConfig;
  dataSource: DataSource;
  mailDir: string;
  close(): Promise<void>;
}

export interface TestAppOptions {
  env?: Record<string, string>;
  overrides?: Partial<AppConfig>;
}

/**
 * The real application (same factory as main.ts) on the real database, with its own storage
 * directory and an in-process mail catcher on a free port.
 */
export async function startTestApp(options: TestAppOptions = {}): Promise<TestApp> {
  const storageDir = scratchDir('app');
  const mailDir = join(storageDir, 'mail');
  const catcher = new MailCatcher(mailDir);
  const smtpPort = await catcher.start(0);
  const config = loadConfig(
    {
      DATABASE_URL: testDatabaseUrl(),
      STORAGE_DIR: storageDir,
      SMTP_URL: `smtp://127.0.0.1:${smtpPort}`,
      APP_URL: TEST_APP_URL,
      THROTTLE_LOGIN_LIMIT: '1000',
      ...options.env,
    },
    { frontendDir: join(storageDir, 'no-frontend'), ...options.overrides },
  );
  const app = await createApp(config, { logger: ['error', 'warn'] });
  await app.init();
  return {
    app,
    http: request(app.getHttpServer()),
    config,
    dataSource: app.get(DataSource),
    mailDir,
    async close() {
      await app.close();
      await catcher.stop();
    },
  };
}

let counter = 0;
/** E-mail addresses unique across the whole run, since all API tests share one database. */
export function uniqueEmail(label: string): string {
  counter += 1;
  return `${label}.${Date.now().toString(36)}${counter}@example.test`;
}

export async function createUser(
  dataSource: DataSource,
  fields: { email?: string; name?: string; password?: string; isAdmin?: boolean } = {},
): Promise<UserEntity> {
  const repo = dataSource.getRepository(UserEntity);
  return repo.save(
    repo.create({
      email: fields.email ?? uniqueEmail('user'),
      name: fields.name ?? 'Test Person',
      passwordHash: await new PasswordHasher().hash(fields.password ?? PASSWORD),
      isAdmin: fields.isAdmin ?? false,
    }),
  );
}

export async function addMember(
  dataSource: DataSource,
  campaignId: string,
  userId: string,
  roles: CampaignRole[],
): Promise<void> {
  await dataSource.getRepository(CampaignMemberEntity).insert({ campaignId, userId, roles });
}

export async function login(http: Http, email: string, password = PASSWORD): Promise<string> {
  const res = await http.post('/api/auth/login').send({ email, password });
  if (res.status !== 200) throw new Error(`login of ${email} failed: ${res.status} ${JSON.stringify(res.body)}`);
  return (res.body as LoginResponse).accessToken;
}

export const bearer = (token: string) => ({ Authorization: `Bearer ${token}` });

/** Polls the admin mailbox route until a message to `to` matching `subject` arrives. */
export async function waitForMail(
  http: Http,
  adminToken: string,
  to: string,
  subject: RegExp,
  timeoutMs = 5000,
): Promise<CapturedMail> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const res = await http.get('/api/admin/mail').set(bearer(adminToken));
    if (res.status !== 200) throw new Error(`admin mail list failed: ${res.status}`);
    const found = (res.body as CapturedMail[]).find((m) => m.to.includes(to) && subject.test(m.subject));
    if (found) return found;
    if (Date.now() > deadline) throw new Error(`no mail to ${to} matching ${subject} within ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 50));
  }
}

/** The token in the first link of a message that points at `path` under the app URL. */
export function tokenFromMail(mail: CapturedMail, path: string): string {
  const pattern = new RegExp(`${TEST_APP_URL.replace(/[.:/]/g, '\\$&')}${path}\\?token=([A-Za-z0-9_%-]+)`);
  const match = pattern.exec(mail.text);
  if (!match) throw new Error(`no ${path} link in mail: ${mail.text}`);
  return decodeURIComponent(match[1]);
}
