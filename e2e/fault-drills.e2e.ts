import { execFile } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { promisify } from 'node:util';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page, Response } from 'playwright-core';
import {
  frameIndexAt,
  toVideoTime,
  type CampaignMember,
  type Channel,
  type LoginResponse,
  type Reading,
  type Recording,
  type RecordingFrames,
  type Sheet,
  type SheetRow,
  type SyncMarks,
} from '@dialsheet/common';
import { migrateAndSeed, startApp, type AppSettings } from '../scripts/lib/app';
import { databaseUrl, defineCluster, ensureDatabase, initCluster, query, startCluster, stopCluster, type Cluster } from '../scripts/lib/postgres';
import { freePort, Services, type Proc } from '../scripts/lib/processes';
import { browserStepSettings, launchBrowser, withFailureScreenshot } from './support/browser';

// Fault drills in a real browser against a server of their own: a throw-away PostgreSQL cluster and
// an app process on it (started and stopped here, so the shared test server is never touched).
// - PostgreSQL really stopped while a reader saves rows, then started again: the API answers 503
//   meanwhile, the rows wait in the browser, and the queue then delivers each of them once;
// - the browser's clock a day ahead or behind the server's: the reader still signs in and saves,
//   and what is stored carries the server's time and the frame's time, never the browser's;
// - the server killed with SIGKILL in the middle of a transcode: the next server finishes the job.

const run = promisify(execFile);
const DB_NAME = 'dialsheet_fault_drills';
const DAY_MS = 24 * 3600_000;

async function ffmpeg(args: string[]): Promise<void> {
  await run('ffmpeg', ['-hide_banner', '-nostdin', '-loglevel', 'error', '-y', ...args], { maxBuffer: 16 * 1024 * 1024 });
}

// ---------------------------------------------------------------------------------------------
// Our own cluster and server

interface Rig {
  cluster: Cluster;
  settings: AppSettings;
  origin: string;
  dir: string;
  log: string;
  services: Services;
  app?: Proc;
  unexpectedExit?: string;
}

let rig: Rig;

async function startRigApp(): Promise<void> {
  rig.app = await startApp(rig.services, rig.settings, { file: rig.log });
}

/** SIGKILL to the server and its ffmpeg children, as a container or a cgroup kill does it. */
async function killRigApp(): Promise<void> {
  const app = rig.app;
  if (!app) return;
  app.stopping = true;
  app.signal('SIGKILL');
  await app.exited;
  rig.app = undefined;
}

async function sql(text: string): Promise<string[][]> {
  const out = await query(rig.cluster, text, DB_NAME);
  return out ? out.split('\n').map((line) => line.split('|')) : [];
}

// ---------------------------------------------------------------------------------------------
// API on our server

class HttpError extends Error {
  constructor(
    readonly status: number,
    readonly body: string,
    what: string,
  ) {
    super(`${what}: HTTP ${status} ${body.slice(0, 400)}`);
  }
}

async function api<T>(token: string | null, method: string, route: string, body?: unknown): Promise<T> {
  const isForm = body instanceof FormData;
  const response = await fetch(`${rig.origin}/api${route}`, {
    method,
    headers: { ...(token ? { authorization: `Bearer ${token}` } : {}), ...(body !== undefined && !isForm ? { 'content-type': 'application/json' } : {}) },
    body: body === undefined ? undefined : isForm ? body : JSON.stringify(body),
  });
  const text = await response.text();
  if (!response.ok) throw new HttpError(response.status, text, `${method} ${route}`);
  return (text ? JSON.parse(text) : undefined) as T;
}

async function tokenFor(email: string): Promise<string> {
  const login = await api<LoginResponse>(null, 'POST', '/auth/login', { email, password: rig.settings.demoPassword });
  return login.accessToken;
}

async function uploadVideo(token: string, runId: string, file: string): Promise<Recording> {
  const form = new FormData();
  form.append('file', new Blob([fs.readFileSync(file)], { type: 'video/mp4' }), path.basename(file));
  return api<Recording>(token, 'POST', `/runs/${runId}/recording`, form);
}

async function recordingOf(token: string, runId: string): Promise<Recording | null> {
  return api<Recording>(token, 'GET', `/runs/${runId}/recording`).catch((error: unknown) => {
    if (error instanceof HttpError && error.status === 404) return null;
    throw error;
  });
}

async function waitForRecording(token: string, runId: string, done: (r: Recording) => boolean, timeoutMs: number, pollMs = 250): Promise<Recording> {
  const deadline = Date.now() + timeoutMs;
  let last: Recording | null = null;
  for (;;) {
    last = await recordingOf(token, runId).catch(() => last);
    if (last && done(last)) return last;
    if (Date.now() > deadline) throw new Error(`recording of run ${runId} not as expected within ${timeoutMs} ms (last: ${JSON.stringify(last)})`);
    await new Promise((resolve) => setTimeout(resolve, pollMs));
  }
}

// ---------------------------------------------------------------------------------------------
// The demo campaign on our server, with a short recording on run 1

interface Demo {
  campaignId: string;
  runIds: string[];
  channels: Channel[];
  members: CampaignMember[];
  sync: SyncMarks;
  frameTimes: number[];
  lead: string;
}

let demo: Demo;

async function loadDemo(): Promise<Demo> {
  const lead = await tokenFor('lead@demo.test');
  const campaigns = await api<Array<{ id: string; name: string }>>(lead, 'GET', '/campaigns');
  expect(campaigns).toHaveLength(1);
  const campaignId = campaigns[0].id;
  const runs = await api<Array<{ id: string; name: string }>>(lead, 'GET', `/campaigns/${campaignId}/runs`);
  const runIds = ['Run 1', 'Run 2'].map((prefix) => {
    const found = runs.find((r) => r.name.startsWith(prefix));
    if (!found) throw new Error(`the seed made no "${prefix}"`);
    return found.id;
  });
  const channels = await api<Channel[]>(lead, 'GET', `/campaigns/${campaignId}/channels`);
  const members = await api<CampaignMember[]>(lead, 'GET', `/campaigns/${campaignId}/members`);

  // 40 s at 5 fps is room for a sheet every 5 s; small, so it is ready in seconds.
  const clip = path.join(rig.dir, 'entry-clip.mp4');
  await ffmpeg(['-f', 'lavfi', '-i', 'testsrc2=s=160x120:r=5:d=40', '-c:v', 'libx264', '-preset', 'ultrafast', '-pix_fmt', 'yuv420p', clip]);
  await uploadVideo(lead, runIds[0], clip);
  const ready = await waitForRecording(lead, runIds[0], (r) => r.status === 'ready' || r.status === 'failed', 120_000);
  expect(ready.status).toBe('ready');
  const synced = await api<{ sync: SyncMarks }>(lead, 'PUT', `/runs/${runIds[0]}/sync`, { first: { videoTime: 1, testTime: 0 } });
  const frames = await api<RecordingFrames>(lead, 'GET', `/recordings/${ready.id}/frames`);
  return { campaignId, runIds, channels, members, sync: synced.sync, frameTimes: frames.times, lead };
}

/** A sheet on run 1, rows every 5 s from 0 to `endTime`, over the first two channels, for the demo reader. */
async function drillSheet(name: string, endTime: number): Promise<{ sheet: Sheet; rows: SheetRow[]; channels: Channel[] }> {
  const channels = demo.channels.slice(0, 2);
  const sheet = await api<Sheet>(demo.lead, 'POST', `/runs/${demo.runIds[0]}/sheets`, {
    name,
    startTime: 0,
    endTime,
    interval: 5,
    channelIds: channels.map((c) => c.id),
  });
  const memberId = (email: string) => demo.members.find((m) => m.email === email)!.userId;
  await api<Sheet>(demo.lead, 'PUT', `/sheets/${sheet.id}/assignment`, { readerId: memberId('reader@demo.test'), checkerId: memberId('checker@demo.test') });
  const rows = await api<SheetRow[]>(demo.lead, 'GET', `/sheets/${sheet.id}/rows`);
  return { sheet, rows, channels };
}

/** A text per cell that no other cell of the sheet has, so each can be found exactly once. */
const cellText = (rowIndex: number, channelIndex: number) => (20 + rowIndex * 1.5 + channelIndex * 0.25).toFixed(2);

// ---------------------------------------------------------------------------------------------
// Browser helpers (as in sheets.e2e.ts)

function entryPath(sheetId: string): string {
  return `/campaigns/${demo.campaignId}/sheets/${sheetId}/entry`;
}

async function signIn(page: Page, email: string, next: string): Promise<void> {
  await page.goto(`${rig.origin}/sign-in?next=${encodeURIComponent(next)}`);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(rig.settings.demoPassword);
  await page.keyboard.press('Enter');
  await page.waitForURL((url) => url.pathname === next);
  await page.getByTestId('entry-screen').waitFor({ timeout: 30_000 });
}

const inputLabel = (channel: Channel) => `${channel.symbol} ${channel.name} (${channel.rawUnit})`;

async function atRow(page: Page, rowIndex: number, first: Channel): Promise<void> {
  await expect.poll(() => page.getByTestId('entry-row-title').innerText()).toMatch(new RegExp(`^Row ${rowIndex + 1}\\b`));
  await expect.poll(() => page.evaluate(() => document.activeElement?.getAttribute('aria-label') ?? null)).toBe(inputLabel(first));
}

async function typeRow(page: Page, rowIndex: number, channels: Channel[], { afterFrame = false } = {}): Promise<void> {
  await atRow(page, rowIndex, channels[0]);
  if (afterFrame) {
    // A reader types what the row's frame shows, so only once it is on screen (the reading then
    // stores that frame's time; typed before any frame is shown, it rightly stores none). The
    // outage drill does not wait: its point is the typed text while the database is down.
    const frame = frameIndexAt(demo.frameTimes, toVideoTime(demo.sync, rowIndex * 5));
    await expect.poll(() => page.getByTestId('entry-frame-index').innerText(), { timeout: 15_000 }).toBe(String(frame));
  }
  for (let i = 0; i < channels.length; i += 1) {
    await page.keyboard.type(cellText(rowIndex, i));
    await page.keyboard.press('Enter');
  }
}

const rowState = (page: Page, rowIndex: number) => page.getByTestId(`entry-row-${rowIndex}`).getAttribute('data-state');

/** The readings of a sheet's first pass as the database holds them, with their audit entries counted. */
async function storedReadings(sheetId: string): Promise<Array<{ rowIndex: number; channelId: string; rawText: string; version: number; audits: number }>> {
  const rows = await sql(
    `SELECT r.row_index, r.channel_id, r.raw_text, r.version,
            (SELECT count(*) FROM audit_entries a WHERE a.entity_type = 'reading' AND a.entity_id = r.id)
       FROM readings r WHERE r.sheet_id = '${sheetId}' AND r.pass = 1 ORDER BY r.row_index, r.channel_id`,
  );
  return rows.map(([rowIndex, channelId, rawText, version, audits]) => ({
    rowIndex: Number(rowIndex),
    channelId,
    rawText,
    version: Number(version),
    audits: Number(audits),
  }));
}

// ---------------------------------------------------------------------------------------------

describe('fault drills on a server and database of their own', () => {
  beforeAll(async () => {
    const shared = browserStepSettings();
    const dir = path.join(path.dirname(shared.storageDir), 'fault-drills');
    fs.rmSync(dir, { recursive: true, force: true });
    fs.mkdirSync(dir, { recursive: true });
    const cluster = await defineCluster({ dir: path.join(dir, 'pg'), port: await freePort(), throwaway: true });
    await initCluster(cluster);
    await startCluster(cluster);
    await ensureDatabase(cluster, DB_NAME);
    const port = await freePort();
    const settings: AppSettings = {
      port,
      host: '127.0.0.1',
      databaseUrl: databaseUrl(cluster, DB_NAME),
      storageDir: path.join(dir, 'storage'),
      smtpUrl: shared.smtpUrl,
      mailCatcherDir: shared.mailCatcherDir,
      demoPassword: shared.demoPassword,
      appUrl: `http://127.0.0.1:${port}`,
    };
    const log = path.join(dir, 'app.log');
    rig = {
      cluster,
      settings,
      origin: settings.appUrl,
      dir,
      log,
      services: new Services((proc, exit) => {
        rig.unexpectedExit = `${proc.name} exited (${JSON.stringify(exit)}); see ${path.relative(process.cwd(), log)}`;
      }),
    };
    await migrateAndSeed(settings, () => ({ file: log }));
    await startRigApp();
    demo = await loadDemo();
  }, 240_000);

  afterAll(async () => {
    if (!rig) return;
    await rig.services.stopAll();
    await stopCluster(rig.cluster, 'immediate').catch(() => undefined);
  }, 60_000);

  it('PostgreSQL stopped while a reader saves: 503 meanwhile, rows wait in the browser, then each arrives once', async () => {
    const { sheet, rows, channels } = await drillSheet('Database outage drill', 25);
    expect(rows).toHaveLength(6);
    const session = await launchBrowser();
    const { page } = session;
    const saves: Array<{ status: number; retryAfter: string | undefined; message: string | undefined }> = [];
    const onResponse = async (response: Response) => {
      if (response.request().method() !== 'PUT' || !/\/api\/sheets\/[^/]+\/rows\/\d+$/.test(new URL(response.url()).pathname)) return;
      const body = (await response.json().catch(() => null)) as { message?: string } | null;
      saves.push({ status: response.status(), retryAfter: response.headers()['retry-after'], message: body?.message });
    };
    page.on('response', (response) => void onResponse(response));
    try {
      await withFailureScreenshot(page, 'fault-drills-database', async () => {
        await signIn(page, 'reader@demo.test', entryPath(sheet.id));
        for (const i of [0, 1]) await typeRow(page, i, channels);
        for (const i of [0, 1]) await expect.poll(() => rowState(page, i)).toBe('saved');

        // PostgreSQL goes down for real (pg_ctl stop); the app keeps running and says so.
        await stopCluster(rig.cluster, 'fast');
        const health = await fetch(`${rig.origin}/api/health`);
        expect(health.status).toBe(503);

        for (const i of [2, 3, 4]) await typeRow(page, i, channels);
        await atRow(page, 5, channels[0]);
        for (const i of [2, 3, 4]) await expect(rowState(page, i)).resolves.toMatch(/^(pending|sending)$/);
        const status = page.getByTestId('entry-queue-status');
        await expect.poll(() => status.innerText(), { timeout: 20_000 }).toMatch(/3 rows waiting/);
        // The server's own words reach the reader, with the promise that the rows are kept.
        await expect.poll(() => status.innerText()).toContain('cannot reach its database');
        await expect(status.innerText()).resolves.toContain('Typed rows are kept in this browser');
        await expect(page.getByTestId('entry-progress').innerText()).resolves.toBe('2 of 6 rows saved');
        const refused = saves.filter((s) => s.status !== 200);
        expect(refused.length).toBeGreaterThan(0);
        for (const s of refused) expect(s).toMatchObject({ status: 503, retryAfter: '5', message: expect.stringContaining('cannot reach its database') });

        // Back up: the queue retries by itself and every row arrives.
        await startCluster(rig.cluster);
        for (const i of [2, 3, 4]) await expect.poll(() => rowState(page, i), { timeout: 90_000 }).toBe('saved');
        await expect.poll(() => status.innerText()).toBe('All rows saved');
        await expect(page.getByTestId('entry-progress').innerText()).resolves.toBe('5 of 6 rows saved');
      });
    } finally {
      await session.close();
      if (!(await fetch(`${rig.origin}/api/health`).then((r) => r.ok).catch(() => false))) await startCluster(rig.cluster).catch(() => undefined);
    }

    // In the database: each typed value exactly once, first versions, one audit entry each.
    const stored = await storedReadings(sheet.id);
    expect(stored).toHaveLength(5 * channels.length);
    for (let rowIndex = 0; rowIndex < 5; rowIndex += 1) {
      channels.forEach((channel, i) => {
        const matching = stored.filter((r) => r.rawText === cellText(rowIndex, i));
        expect(matching, `row ${rowIndex} ${channel.symbol}`).toHaveLength(1);
        expect(matching[0]).toMatchObject({ rowIndex, channelId: channel.id, version: 1, audits: 1 });
      });
    }
    expect(rig.unexpectedExit).toBeUndefined();
  }, 240_000);

  for (const offsetMs of [DAY_MS, -DAY_MS]) {
    const label = offsetMs > 0 ? 'a day ahead of' : 'a day behind';
    it(`the browser's clock ${label} the server's: sign-in and saving work, stored times are the server's and the frame's`, async () => {
      const { sheet, channels } = await drillSheet(`Clock drill ${offsetMs > 0 ? '+1' : '-1'} day`, 10);
      const session = await launchBrowser();
      const { page, context } = session;
      // Every Date in the page runs `offsetMs` off; timers still run at the real rate.
      await context.addInitScript((offset: number) => {
        const RealDate = Date;
        class SkewedDate extends RealDate {
          constructor(...args: unknown[]) {
            if (args.length === 0) super(RealDate.now() + offset);
            else super(...(args as [number]));
          }
          static override now(): number {
            return RealDate.now() + offset;
          }
        }
        globalThis.Date = SkewedDate as DateConstructor;
      }, offsetMs);
      const mediaUrlRequests: number[] = [];
      page.on('request', (request) => {
        if (request.method() === 'POST' && /\/api\/recordings\/[^/]+\/media-urls$/.test(new URL(request.url()).pathname)) mediaUrlRequests.push(Date.now());
      });
      const before = Date.now();
      try {
        await withFailureScreenshot(page, `fault-drills-clock${offsetMs > 0 ? '-ahead' : '-behind'}`, async () => {
          await signIn(page, 'reader@demo.test', entryPath(sheet.id));
          const skew = await page.evaluate(() => Date.now());
          expect(Math.abs(skew - Date.now() - offsetMs)).toBeLessThan(60_000);
          for (const i of [0, 1]) await typeRow(page, i, channels, { afterFrame: true });
          for (const i of [0, 1]) await expect.poll(() => rowState(page, i)).toBe('saved');
          await expect.poll(() => page.getByTestId('entry-queue-status').innerText()).toBe('All rows saved');
          // Signed video links are renewed by their lifetime on the server's clock, not by a
          // browser clock that says they are long expired (or valid for a day).
          const firstAsk = mediaUrlRequests[0] ?? Date.now();
          await new Promise((resolve) => setTimeout(resolve, Math.max(0, firstAsk + 15_000 - Date.now())));
          expect(mediaUrlRequests.length, 'signed-link requests in the first 15 s').toBeLessThanOrEqual(2);
        });
      } finally {
        await session.close();
      }
      const after = Date.now();

      const readings = await api<Reading[]>(demo.lead, 'GET', `/sheets/${sheet.id}/readings?pass=1`);
      expect(readings).toHaveLength(2 * channels.length);
      for (const reading of readings) {
        // The server stamps the time (this machine's clock is the server's); the browser's is a day off.
        const updated = Date.parse(reading.updatedAt);
        expect(updated).toBeGreaterThanOrEqual(before - 5_000);
        expect(updated).toBeLessThanOrEqual(after + 5_000);
        // The frame's own presentation time, as the recording's frame list has it.
        const testTime = reading.rowIndex * 5;
        const frame = frameIndexAt(demo.frameTimes, toVideoTime(demo.sync, testTime));
        expect(reading.frameTime).toBeCloseTo(demo.frameTimes[frame], 6);
        expect(reading.rawText).toBe(cellText(reading.rowIndex, channels.findIndex((c) => c.id === reading.channelId)));
      }
      const [[createdSkewMs]] = await sql(
        `SELECT max(abs(extract(epoch FROM (now() - created_at)))) * 1000 FROM readings WHERE sheet_id = '${sheet.id}'`,
      );
      expect(Number(createdSkewMs)).toBeLessThan(after - before + 60_000);
    }, 180_000);
  }

  it('the server killed (SIGKILL) in the middle of a transcode: the next server resumes the job and finishes it', async () => {
    // 12 s of 720p: still transcoding seconds after it starts.
    const long = path.join(rig.dir, 'long.mp4');
    await ffmpeg(['-f', 'lavfi', '-i', 'testsrc2=s=1280x720:r=30:d=12', '-c:v', 'libx264', '-preset', 'ultrafast', '-g', '300', '-pix_fmt', 'yuv420p', long]);
    const runId = demo.runIds[1];
    const uploaded = await uploadVideo(demo.lead, runId, long);
    const midway = await waitForRecording(demo.lead, runId, (r) => r.status === 'transcoding' && r.progress > 0, 90_000, 100);
    expect(midway.progress).toBeLessThan(100);

    await killRigApp();
    // What the dead process left: the recording claimed and half-done, its job still active.
    const [[status, claimed]] = await sql(`SELECT status, claim_id IS NOT NULL FROM recordings WHERE id = '${uploaded.id}'`);
    expect(status).toBe('transcoding');
    expect(claimed).toBe('t');
    const [[jobState]] = await sql(`SELECT state FROM pgboss.job WHERE name = 'recording.process' AND data->>'recordingId' = '${uploaded.id}'`);
    expect(jobState).toBe('active');

    // A new server on the same database and storage takes the recording over once the dead
    // worker's heartbeat is stale (two minutes), and finishes it.
    await startRigApp();
    const done = await waitForRecording(demo.lead, runId, (r) => r.status === 'ready' || r.status === 'failed', 300_000, 1000);
    expect(done).toMatchObject({ id: uploaded.id, status: 'ready', progress: 100, failureReason: null, proxy: { width: 1280, height: 720 } });
    const frames = await api<RecordingFrames>(demo.lead, 'GET', `/recordings/${done.id}/frames`);
    expect(frames.times).toHaveLength(360);
    const files = fs.readdirSync(path.join(rig.settings.storageDir, 'objects', 'recordings', done.id)).sort();
    expect(files).toEqual(['original', 'poster.jpg', 'proxy.mp4']);
    expect(rig.unexpectedExit).toBeUndefined();
  }, 420_000);
});
