import 'reflect-metadata';
import type { INestApplicationContext } from '@nestjs/common';
import { NestFactory } from '@nestjs/core';
import { createHash } from 'node:crypto';
import { copyFileSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { DataSource } from 'typeorm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildDataSourceOptions } from '../../src/database/data-source-options';
import { compileChain } from '@dialsheet/common/dist/analysis';
import { standardDensity } from '@dialsheet/common/dist/units';
import { DEMO_ACCOUNTS, DEMO_CAMPAIGN_NAME, DEMO_RUNS, seedDemo } from '../../src/database/seed/demo-seed';
import { DEMO_SHEET, ingestDemoVideos } from '../../src/database/seed/demo-videos';
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
           (SELECT count(*) FROM channels h JOIN campaigns c ON c.id = h.campaign_id WHERE c.name = $1)::int AS channels,
           (SELECT count(*) FROM display_regions d JOIN runs r ON r.id = d.run_id JOIN campaigns c ON c.id = r.campaign_id WHERE c.name = $1)::int AS regions,
           (SELECT count(*) FROM sheets s JOIN campaigns c ON c.id = s.campaign_id WHERE c.name = $1)::int AS sheets,
           (SELECT count(*) FROM sheet_channels sc JOIN sheets s ON s.id = sc.sheet_id JOIN campaigns c ON c.id = s.campaign_id WHERE c.name = $1)::int AS "sheetChannels",
           (SELECT count(*) FROM audit_entries a JOIN campaigns c ON c.id = a.campaign_id WHERE c.name = $1)::int AS audit`,
    [DEMO_CAMPAIGN_NAME]);
  return row as { users: number; campaigns: number; members: number; channels: number; regions: number; sheets: number; sheetChannels: number; audit: number };
}

/** Digit windows as the generator writes them (fractions of a 1280×720 frame), in panel order. */
const TRUTH_DISPLAYS = [
  { key: 'T1', label: 'T1 warm in', region: { x: 116 / 1280, y: 196 / 720, w: 240 / 1280, h: 124 / 720 } },
  { key: 'T2', label: 'T2 warm out', region: { x: 386 / 1280, y: 196 / 720, w: 240 / 1280, h: 124 / 720 } },
  { key: 'T3', label: 'T3 cool in', region: { x: 656 / 1280, y: 196 / 720, w: 240 / 1280, h: 124 / 720 } },
  { key: 'T4', label: 'T4 cool out', region: { x: 926 / 1280, y: 196 / 720, w: 240 / 1280, h: 124 / 720 } },
  { key: 'V', label: 'V flow meter', region: { x: 116 / 1280, y: 456 / 720, w: 370 / 1280, h: 120 / 720 } },
  { key: 'P', label: 'P gauge', region: { x: 580 / 1280, y: 456 / 720, w: 260 / 1280, h: 120 / 720 } },
];

describe('demo seed', () => {
  let db: DataSource;
  beforeAll(async () => {
    db = await new DataSource(buildDataSourceOptions(testDatabaseUrl())).initialize();
  });
  afterAll(() => db.destroy());

  it('creates the five accounts and the campaign, and a second run changes nothing', async () => {
    const first = await seedDemo(db, DEMO_PASSWORD);
    expect(first).toEqual({ usersCreated: 5, campaignCreated: true, membersAdded: 4, runsCreated: 3, channelsCreated: 6, analysisSetupCreated: 3 });
    const after1 = await counts(db);
    // Audit: campaign, four memberships, three runs, six channels, the flow meter's calibration, the
    // steady rule and the heat-rate derived channel. Without videos, no regions or sheets.
    expect(after1).toEqual({ users: 5, campaigns: 1, members: 4, channels: 6, regions: 0, sheets: 0, sheetChannels: 0, audit: 17 });

    const hashes1 = await db.query(`SELECT email, password_hash, updated_at FROM users WHERE email LIKE '%@demo.test' ORDER BY email`);
    const second = await seedDemo(db, DEMO_PASSWORD);
    expect(second).toEqual({ usersCreated: 0, campaignCreated: false, membersAdded: 0, runsCreated: 0, channelsCreated: 0, analysisSetupCreated: 0 });
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
    expect(campaign.description).toMatch(/Caution: .*under pressure/);
  });

  it('gives the demo campaign the panel’s six channels in panel order, each audited once', async () => {
    const channels: Array<Record<string, unknown>> = await db.query(
      `SELECT h.name, h.symbol, h.quantity, h.raw_unit AS "rawUnit", h.resolution, h.range_min AS "rangeMin", h.range_max AS "rangeMax",
              h.full_scale AS "fullScale", h.operating_min AS "operatingMin", h.operating_max AS "operatingMax", h.accuracy,
              h.plausible_min AS "plausibleMin", h.plausible_max AS "plausibleMax", h.position
         FROM channels h JOIN campaigns c ON c.id = h.campaign_id WHERE c.name = $1 ORDER BY h.position`,
      [DEMO_CAMPAIGN_NAME],
    );
    expect(channels.map((c) => c.symbol)).toEqual(['T1', 'T2', 'T3', 'T4', 'V', 'P']);
    expect(channels.map((c) => c.position)).toEqual([0, 1, 2, 3, 4, 5]);
    expect(channels[0]).toEqual({
      name: 'Warm stream inlet temperature',
      symbol: 'T1',
      quantity: 'temperature',
      rawUnit: '°C',
      resolution: 0.1,
      rangeMin: -50,
      rangeMax: 200,
      fullScale: null,
      operatingMin: -50,
      operatingMax: 200,
      accuracy: { percentOfReading: 0.5, digits: 3 },
      plausibleMin: 5,
      plausibleMax: 60,
      position: 0,
    });
    // The resolutions are what the generated displays show (scripts/demo/scenario.ts, DISPLAYS).
    expect(channels.map((c) => c.resolution)).toEqual([0.1, 0.1, 0.1, 0.1, 0.001, 0.5]);
    expect(channels[4]).toMatchObject({ rawUnit: 'V', fullScale: 5, accuracy: { percentOfReading: 0.05, digits: 2 } });
    expect(channels[5]).toMatchObject({ rawUnit: 'kPa', rangeMin: 0, rangeMax: 10, fullScale: 10, accuracy: { percentOfFullScale: 1.6 } });
    const audit: Array<{ after: Record<string, unknown>; actor: string }> = await db.query(
      `SELECT a.after, u.email AS actor FROM audit_entries a JOIN users u ON u.id = a.actor_id
        WHERE a.campaign_id = (SELECT id FROM campaigns WHERE name = $1) AND a.entity_type = 'channel' AND a.action = 'create'`,
      [DEMO_CAMPAIGN_NAME],
    );
    expect(audit).toHaveLength(6);
    expect(audit.every((a) => a.actor === 'lead@demo.test')).toBe(true);
    expect(audit.map((a) => a.after.symbol).sort()).toEqual(['P', 'T1', 'T2', 'T3', 'T4', 'V']);
  });

  it('adds a missing demo channel after the channels already there, and leaves an archived campaign alone', async () => {
    const campaignId = (await db.query('SELECT id FROM campaigns WHERE name = $1', [DEMO_CAMPAIGN_NAME]))[0].id as string;
    await db.query(`DELETE FROM channels WHERE campaign_id = $1 AND symbol = 'T2'`, [campaignId]);
    await db.query(`UPDATE channels SET position = position - 1 WHERE campaign_id = $1 AND position > 1`, [campaignId]);
    expect((await seedDemo(db, DEMO_PASSWORD)).channelsCreated).toBe(1);
    const order = await db.query('SELECT symbol FROM channels WHERE campaign_id = $1 ORDER BY position', [campaignId]);
    expect(order.map((c: { symbol: string }) => c.symbol)).toEqual(['T1', 'T3', 'T4', 'V', 'P', 'T2']);

    await db.query(`DELETE FROM channels WHERE campaign_id = $1 AND symbol = 'T2'`, [campaignId]);
    await db.query(`UPDATE campaigns SET status = 'archived' WHERE id = $1`, [campaignId]);
    try {
      expect((await seedDemo(db, DEMO_PASSWORD)).channelsCreated).toBe(0);
    } finally {
      await db.query(`UPDATE campaigns SET status = 'active' WHERE id = $1`, [campaignId]);
    }
    // Back to panel order for the tests below, as an engineer would put it.
    expect((await seedDemo(db, DEMO_PASSWORD)).channelsCreated).toBe(1);
    const ids = await db.query(
      `SELECT id FROM channels WHERE campaign_id = $1 ORDER BY array_position(ARRAY['T1','T2','T3','T4','V','P'], symbol)`,
      [campaignId],
    );
    for (const [position, { id }] of (ids as Array<{ id: string }>).entries()) {
      await db.query('UPDATE channels SET position = $2 + 100 WHERE id = $1', [id, position]);
    }
    await db.query('UPDATE channels SET position = position - 100 WHERE campaign_id = $1', [campaignId]);
  });

  it('gives the flow meter its chain to g/min, the steady-outlet rule and the warm-stream heat rate, by the demo engineer', async () => {
    const campaignId = (await db.query('SELECT id FROM campaigns WHERE name = $1', [DEMO_CAMPAIGN_NAME]))[0].id as string;
    const [cal] = await db.query(
      `SELECT cc.chain, cc.engineering_unit, cc.version, u.email FROM channel_calibrations cc JOIN channels c ON c.id = cc.channel_id
         JOIN users u ON u.id = cc.updated_by WHERE c.campaign_id = $1 AND c.symbol = 'V'`,
      [campaignId],
    );
    expect(cal).toMatchObject({ engineering_unit: 'g/min', version: 1, email: 'engineer@demo.test' });
    const chain = compileChain(cal.chain, 'V');
    // 5 V is the full 200 standard L/min; dry air at 0 °C, 101.325 kPa is 1.2922 kg/m³ as an ideal
    // gas (Wikipedia "Density of air"; Engineers Edge; shared/reference/air-standard-density.json),
    // so 200 L/min ≈ 258.4 g/min.
    expect(chain.apply(5)).toBeCloseTo(200 * standardDensity('0C'), 9);
    expect(chain.apply(5)).toBeCloseTo(200 * 1.2922, 1);
    // ±1.5 % of 200 standard L/min, as a rectangular ± on the first step (common practice).
    expect(cal.chain.steps[0].uncertainty).toMatchObject({ basis: 'absolute', value: 3 });
    const rules = await db.query('SELECT name, window_seconds, slope_limit_per_minute, channel_id FROM stability_rules WHERE campaign_id = $1', [campaignId]);
    expect(rules).toEqual([{ name: 'Steady outlet', window_seconds: 300, slope_limit_per_minute: 0.05, channel_id: null }]);
    const derived = await db.query('SELECT symbol, unit, expression, constants, inputs FROM derived_channels WHERE campaign_id = $1', [campaignId]);
    expect(derived).toEqual([{ symbol: 'Q_warm', unit: 'W', expression: 'V / 60 * cp * (T1 - T2)', constants: { cp: 1.006 }, inputs: ['T1', 'T2', 'V'] }]);
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
      // The generator's layout: run-<n>.mp4 beside run-<n>.truth.json. Run 3 is not there yet;
      // run 2's truth file is from a generator before display regions were written.
      for (const n of [1, 2]) {
        copyFileSync(await media.unique(media.clip()), join(dir, `run-${n}.mp4`));
        const truth = { run: n, durationSec: n === 1 ? 40 : 20.7, startMarkerVideoTime: 0.5 + n / 10, updates: [] };
        writeFileSync(join(dir, `run-${n}.truth.json`), JSON.stringify(n === 1 ? { ...truth, displays: TRUTH_DISPLAYS } : truth));
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

    let before: Awaited<ReturnType<typeof counts>>;

    it('stores each run’s video through the upload path once, sets its sync from the truth file and queues processing', async () => {
      before = await counts(db);
      const first = await ingestDemoVideos(dir, services());
      expect(first).toEqual({
        ingested: [DEMO_RUNS[0].name, DEMO_RUNS[1].name],
        skipped: [DEMO_RUNS[2].name],
        regionsSet: [DEMO_RUNS[0].name],
        sheetsCreated: [DEMO_RUNS[0].name, DEMO_RUNS[1].name],
      });
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

    });

    it('gives a run one region per channel from the truth file’s digit windows, audited as the regions route does', async () => {
      const regions: Array<{ run: string; symbol: string; x: number; y: number; width: number; height: number }> = await db.query(
        `SELECT r.name AS run, h.symbol, d.x, d.y, d.width, d.height
           FROM display_regions d JOIN runs r ON r.id = d.run_id JOIN channels h ON h.id = d.channel_id
           JOIN campaigns c ON c.id = r.campaign_id
          WHERE c.name = $1 ORDER BY r.name, h.position`,
        [DEMO_CAMPAIGN_NAME],
      );
      // Run 2's truth file has no regions, so only run 1 gets them.
      expect(regions.map((r) => r.run)).toEqual(Array(6).fill(DEMO_RUNS[0].name));
      expect(regions.map(({ symbol, x, y, width, height }) => ({ key: symbol, x, y, w: width, h: height }))).toEqual(
        TRUTH_DISPLAYS.map(({ key, region }) => ({ key, ...region })),
      );
      const audit: Array<{ entity_id: string; before: unknown; after: { regions: Array<{ channelId: string }> } }> = await db.query(
        `SELECT a.entity_id, a.before, a.after FROM audit_entries a JOIN users u ON u.id = a.actor_id
          WHERE u.email = 'lead@demo.test' AND a.entity_type = 'display-region' AND a.action = 'update'`,
      );
      expect(audit).toHaveLength(1);
      // Other test files make runs with the same name in their own campaigns: look in the demo's.
      const [run1] = await db.query('SELECT r.id FROM runs r JOIN campaigns c ON c.id = r.campaign_id WHERE r.name = $1 AND c.name = $2', [
        DEMO_RUNS[0].name,
        DEMO_CAMPAIGN_NAME,
      ]);
      expect(audit[0].entity_id).toBe(run1.id);
      expect(audit[0].before).toEqual({ regions: [] });
      expect(audit[0].after.regions).toHaveLength(6);
    });

    it('plans one sheet per run every 5 s over the whole recording, panel order, assigned to the demo reader and checker', async () => {
      const sheets: Array<{ run: string; name: string; start_time: number; end_time: number; interval: number; reader: string; checker: string; symbols: string[] }> =
        await db.query(
          `SELECT r.name AS run, s.name, s.start_time, s.end_time, s.interval, ur.email AS reader, uc.email AS checker,
                  (SELECT array_agg(h.symbol ORDER BY sc.position) FROM sheet_channels sc JOIN channels h ON h.id = sc.channel_id
                    WHERE sc.sheet_id = s.id) AS symbols
             FROM sheets s JOIN runs r ON r.id = s.run_id JOIN campaigns c ON c.id = s.campaign_id
             JOIN users ur ON ur.id = s.reader_id JOIN users uc ON uc.id = s.checker_id
            WHERE c.name = $1 ORDER BY r.name`,
          [DEMO_CAMPAIGN_NAME],
        );
      const common = { name: DEMO_SHEET.name, start_time: 0, interval: 5, reader: 'reader@demo.test', checker: 'checker@demo.test', symbols: ['T1', 'T2', 'T3', 'T4', 'V', 'P'] };
      // Run 1: 40 s of video from the start marker at 0.6 s is test time 39.4 s; run 2: 20.7 s
      // from 0.7 s ends at test time 20 s, and the last row stays strictly inside the video.
      expect(sheets).toEqual([
        { run: DEMO_RUNS[0].name, ...common, end_time: 35 },
        { run: DEMO_RUNS[1].name, ...common, end_time: 15 },
      ]);
      const audit: Array<{ action: string; before: unknown; after: Record<string, unknown>; reason: string }> = await db.query(
        `SELECT a.action, a.before, a.after, a.reason FROM audit_entries a JOIN users u ON u.id = a.actor_id
          WHERE u.email = 'lead@demo.test' AND a.entity_type = 'sheet'
            AND a.campaign_id = (SELECT id FROM campaigns WHERE name = $1) ORDER BY a.seq`,
        [DEMO_CAMPAIGN_NAME],
      );
      expect(audit.map((a) => a.action)).toEqual(['create', 'update', 'create', 'update']);
      expect(audit[0].after).toMatchObject({ name: DEMO_SHEET.name, startTime: 0, endTime: 35, interval: 5 });
      expect(audit[0].after.channelIds).toHaveLength(6);
      const [people] = await db.query(
        `SELECT (SELECT id FROM users WHERE email = 'reader@demo.test') AS reader, (SELECT id FROM users WHERE email = 'checker@demo.test') AS checker`,
      );
      expect(audit[1]).toMatchObject({ before: { readerId: null, checkerId: null }, after: { readerId: people.reader, checkerId: people.checker } });
      // The sheet waits for the reader: no readings are seeded.
      const [readings] = await db.query(
        `SELECT count(*)::int AS n FROM readings g JOIN sheets s ON s.id = g.sheet_id JOIN campaigns c ON c.id = s.campaign_id WHERE c.name = $1`,
        [DEMO_CAMPAIGN_NAME],
      );
      expect(readings.n).toBe(0);
    });

    it('adds nothing the second time', async () => {
      const after = await counts(db);
      // Audit: per stored video its recording and its sync; one set of regions; per sheet its creation and assignment.
      expect(after).toEqual({ ...before, regions: 6, sheets: 2, sheetChannels: 12, audit: before.audit + 2 * 2 + 1 + 2 * 2 });
      const again = await ingestDemoVideos(dir, services());
      expect(again).toEqual({ ingested: [], skipped: DEMO_RUNS.map((r) => r.name), regionsSet: [], sheetsCreated: [] });
      expect(await counts(db)).toEqual(after);
      expect(await seedDemo(db, DEMO_PASSWORD)).toMatchObject({ channelsCreated: 0, runsCreated: 0 });
      expect(await counts(db)).toEqual(after);
    });
  });
});
