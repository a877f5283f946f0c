import 'reflect-metadata';
import type { INestApplicationContext } from '@nestjs/common';
import { NestFactory } from '@nestjs/core';
import { createHash } from 'node:crypto';
import { copyFileSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { DataSource } from 'typeorm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildDataSourceOptions } from '../../src/database/data-source-options';
import { DEMO_ACCOUNTS, DEMO_CAMPAIGN_NAME, DEMO_RUNS, seedDemo } from '../../src/database/seed/demo-seed';
import { ingestDemoVideos } from '../../src/database/seed/demo-videos';
import { SeedModule } from '../../src/database/seed/seed.module';
import { loadConfig } from '../../src/config/env';
import { RecordingsService } from '../../src/modules/recordings/recordings.service';
import { RunsService } from '../../src/modules/runs/runs.service';
import { TestMedia } from '../helpers/media';
import { PasswordHasher } from '../../src/modules/users/password-hasher.service';
import { scratchDir, testDatabaseUrl } from '../helpers/test-app';

const DEMO_PASSWORD = 'dialsheet-demo';

async function counts(db: DataSource) {
  const [row] = await db.query(`
    SELECT (SELECT count(*) FROM users WHERE email LIKE '%@demo.test')::int AS users,
           (SELECT count(*) FROM campaigns WHERE name = $1)::int AS campaigns,
           (SELECT count(*) FROM campaign_members m JOIN campaigns c ON c.id = m.campaign_id WHERE c.name = $1)::int AS members,
           (SELECT count(*) FROM audit_entries a JOIN campaigns c ON c.id = a.campaign_id WHERE c.name = $1)::int AS audit`,
    [DEMO_CAMPAIGN_NAME]);
  return row as { users: number; campaigns: number; members: number; audit: number };
}

describe('demo seed', () => {
  let db: DataSource;
  beforeAll(async () => {
    db = await new DataSource(buildDataSourceOptions(testDatabaseUrl())).initialize();
  });
  afterAll(() => db.destroy());

  it('creates the five accounts and the campaign, and a second run changes nothing', async () => {
    const first = await seedDemo(db, DEMO_PASSWORD);
    expect(first).toEqual({ usersCreated: 5, campaignCreated: true, membersAdded: 4, runsCreated: 3 });
    const after1 = await counts(db);
    expect(after1).toEqual({ users: 5, campaigns: 1, members: 4, audit: 8 });

    const hashes1 = await db.query(`SELECT email, password_hash, updated_at FROM users WHERE email LIKE '%@demo.test' ORDER BY email`);
    const second = await seedDemo(db, DEMO_PASSWORD);
    expect(second).toEqual({ usersCreated: 0, campaignCreated: false, membersAdded: 0, runsCreated: 0 });
    expect(await counts(db)).toEqual(after1);
    expect(await db.query(`SELECT email, password_hash, updated_at FROM users WHERE email LIKE '%@demo.test' ORDER BY email`)).toEqual(hashes1);
  });

  it('gives each account its role; the administrator is not a member', async () => {
    const rows: Array<{ email: string; name: string; is_admin: boolean; roles: string[] | null; password_hash: string }> =
      await db.query(
        `SELECT u.email, u.name, u.is_admin, m.roles, u.password_hash
           FROM users u
           LEFT JOIN campaign_members m ON m.user_id = u.id
                AND m.campaign_id = (SELECT id FROM campaigns WHERE name = $1)
          WHERE u.email LIKE '%@demo.test'`,
        [DEMO_CAMPAIGN_NAME],
      );
    const byEmail = new Map(rows.map((r) => [r.email, r]));
    for (const account of DEMO_ACCOUNTS) {
      const row = byEmail.get(account.email);
      expect(row, account.email).toBeDefined();
      expect(row?.is_admin).toBe(account.isAdmin);
      expect(row?.roles).toEqual(account.role ? [account.role] : null);
      expect(await new PasswordHasher().verify(DEMO_PASSWORD, row?.password_hash ?? '')).toBe(true);
    }
    expect(byEmail.get('admin@demo.test')?.name).toBe('Ada Admin');
    const [campaign] = await db.query('SELECT description, status FROM campaigns WHERE name = $1', [DEMO_CAMPAIGN_NAME]);
    expect(campaign.status).toBe('active');
    expect(campaign.description).toMatch(/heat-recovery core/);
    expect(campaign.description).toMatch(/mass-flow meter/);
  });

  it('gives the demo campaign its three runs with their configurations', async () => {
    const runs: Array<{ name: string; configuration: string; run_date: string }> = await db.query(
      `SELECT r.name, r.configuration, to_char(r.run_date, 'YYYY-MM-DD') AS run_date
         FROM runs r JOIN campaigns c ON c.id = r.campaign_id WHERE c.name = $1 ORDER BY r.created_at, r.name`,
      [DEMO_CAMPAIGN_NAME],
    );
    expect(runs.map((r) => r.name)).toEqual(DEMO_RUNS.map((r) => r.name));
    expect(runs.map((r) => r.name)).toEqual([
      'Run 1 — meter on warm stream',
      'Run 2 — meter on cool stream',
      'Run 3 — repeat, meter on warm stream',
    ]);
    expect(runs[1].configuration).toMatch(/cool stream/);
    expect(runs.every((r) => r.run_date === '2025-03-14')).toBe(true);
  });

  describe('demo videos', () => {
    const media = new TestMedia();
    let app: INestApplicationContext;
    let dir: string;

    beforeAll(async () => {
      dir = join(media.dir, 'demo');
      mkdirSync(dir);
      // The generator's layout: run-<n>.mp4 beside run-<n>.truth.json. Run 3 is not there yet.
      for (const n of [1, 2]) {
        copyFileSync(await media.unique(media.clip()), join(dir, `run-${n}.mp4`));
        writeFileSync(join(dir, `run-${n}.truth.json`), JSON.stringify({ run: n, startMarkerVideoTime: 0.5 + n / 10, updates: [] }));
      }
      const config = loadConfig({ DATABASE_URL: testDatabaseUrl(), STORAGE_DIR: scratchDir('seed'), WORKER: 'off' });
      app = await NestFactory.createApplicationContext(SeedModule.forRoot(config), { logger: ['error'] });
      await app.init();
    });
    afterAll(async () => {
      await app.close();
      media.remove();
      // Their files lived in this test's scratch storage: leave neither rows nor jobs for the
      // worker of a later test file to find.
      await db.query(`DELETE FROM pgboss.job WHERE name = 'recording.process' AND state = 'created'`);
      await db.query(`DELETE FROM recordings WHERE campaign_id = (SELECT id FROM campaigns WHERE name = $1)`, [DEMO_CAMPAIGN_NAME]);
    });

    const services = () => ({ dataSource: app.get(DataSource), recordings: app.get(RecordingsService), runs: app.get(RunsService) });

    it('stores each run’s video through the upload path once, sets its sync from the truth file and queues processing', async () => {
      const first = await ingestDemoVideos(dir, services());
      expect(first).toEqual({ ingested: [DEMO_RUNS[0].name, DEMO_RUNS[1].name], skipped: [DEMO_RUNS[2].name] });
      const rows: Array<{ name: string; status: string; original_name: string; sync: unknown; sha256: string }> = await db.query(
        `SELECT u.name, r.status, r.original_name, r.sha256, u.sync
           FROM recordings r JOIN runs u ON u.id = r.run_id JOIN campaigns c ON c.id = u.campaign_id
          WHERE c.name = $1 ORDER BY u.name`,
        [DEMO_CAMPAIGN_NAME],
      );
      expect(rows).toHaveLength(2);
      expect(rows[0]).toMatchObject({
        name: DEMO_RUNS[0].name,
        status: 'uploaded',
        original_name: 'run-1.mp4',
        sha256: createHash('sha256').update(readFileSync(join(dir, 'run-1.mp4'))).digest('hex'),
        sync: { first: { videoTime: 0.6, testTime: 0 } },
      });
      expect(rows[1].sync).toEqual({ first: { videoTime: 0.7, testTime: 0 } });
      const [jobs] = await db.query(
        `SELECT count(*)::int AS n FROM pgboss.job j JOIN recordings r ON j.data->>'recordingId' = r.id::text
          WHERE j.name = 'recording.process' AND j.state = 'created'`,
      );
      expect(jobs.n).toBeGreaterThanOrEqual(2);
      const [audit] = await db.query(
        `SELECT count(*)::int AS n FROM audit_entries a JOIN users u ON u.id = a.actor_id
          WHERE u.email = 'lead@demo.test' AND a.entity_type = 'recording' AND a.action = 'create'`,
      );
      expect(audit.n).toBe(2);

      const again = await ingestDemoVideos(dir, services());
      expect(again).toEqual({ ingested: [], skipped: DEMO_RUNS.map((r) => r.name) });
    });
  });
});
