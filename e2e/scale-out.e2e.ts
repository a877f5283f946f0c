import { execFile } from 'node:child_process';
import fs from 'node:fs';
import http from 'node:http';
import net from 'node:net';
import path from 'node:path';
import { promisify } from 'node:util';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import type { CampaignMember, Channel, LoginResponse, MediaUrls, Reading, Recording, Run, Sheet } from '@dialsheet/common';
import { checkStored, SaveClient, type Outcome } from '../bench/lib/save-load';
import { appEnvironment, backendEntry, migrateAndSeed, type AppSettings } from '../scripts/lib/app';
import { repoRoot } from '../scripts/lib/config';
import { describeExit, freePort, httpOk, Services, waitFor, type Proc } from '../scripts/lib/processes';
import { browserStepSettings, launchBrowser, withFailureScreenshot, type BrowserSession } from './support/browser';
import { api as apiOf } from './support/api';

// Scale-out (issue 7, part 5): two API processes and one worker process on one database and one
// storage directory, as a deployment behind a load balancer runs them. The API processes run with
// WORKER=off, so only the worker process transcodes. What proves that the servers keep no state in
// memory: a token issued by A works on B; a row saved through A is read through B; a recording
// uploaded through A waits until the worker process starts, which transcodes it, and B streams it
// with a range request through a link A signed; a reader's browser behind a small load balancer of
// our own keeps working when A dies and the balancer sends it to B (rows typed meanwhile wait in the
// browser and reach B); and 50 readers saving rows for 60 s, half on each API process, lose nothing.
//
// The stack is our own: a fresh database on the browser step's PostgreSQL, its own storage
// directory, so the app `npm test` started (which runs jobs itself) cannot take our jobs.

const run = promisify(execFile);

const DEMO_CAMPAIGN = 'Heat-recovery core bench test';
const DATABASE = 'dialsheet_e2e_scale_out_test';
/** Issue 7: 50 concurrent readers for 60 s. */
const LOAD_READERS = 50;
const LOAD_MS = 60_000;
/** A fast reader's pace, as bench/save-row.bench.ts: the next row 0.5–1.5 s after the last. */
const PACE_MIN_MS = 500;
const PACE_MAX_MS = 1_500;

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

// ---------------------------------------------------------------------------------------------
// API calls, each to a named process

/** The API of one named process. */
function api<T>(origin: string, token: string | null, method: string, route: string, body?: unknown): Promise<T> {
  return apiOf<T>(token, method, route, body, origin);
}

async function signInThrough(origin: string, email: string, password: string): Promise<string> {
  return (await api<LoginResponse>(origin, null, 'POST', '/auth/login', { email, password })).accessToken;
}

/** A short, small test pattern; the comment makes its bytes (and hash) new on every run. */
async function makeVideo(dir: string, stamp: string): Promise<string> {
  const file = path.join(dir, `scale-out-${stamp}.mp4`);
  await run('ffmpeg', [
    '-hide_banner', '-loglevel', 'error', '-y',
    '-f', 'lavfi', '-i', 'testsrc2=s=320x180:r=10:d=30',
    '-c:v', 'libx264', '-g', '100', '-pix_fmt', 'yuv420p',
    '-metadata', `comment=dialsheet scale-out test ${stamp}`,
    file,
  ]);
  return file;
}

// ---------------------------------------------------------------------------------------------
// A load balancer of our own: forwards every request to the one API process it points at, and
// answers 502 when that process does not answer (as a balancer does before its health check
// notices). Counts what it forwarded where.

class Balancer {
  private server: http.Server | null = null;
  /** Forwarded requests by upstream port; failed ones under "port/failed". */
  readonly counts = new Map<string, number>();

  constructor(public target: number) {}

  get origin(): string {
    const address = this.server?.address() as net.AddressInfo | null;
    if (!address) throw new Error('the balancer is not listening');
    return `http://127.0.0.1:${address.port}`;
  }

  count(key: string): number {
    return this.counts.get(key) ?? 0;
  }

  async listen(port: number): Promise<void> {
    const server = http.createServer((req, res) => {
      const port = this.target;
      const isRowSave = req.method === 'PUT' && /\/rows\/\d+$/.test(req.url ?? '');
      const upstream = http.request(
        { host: '127.0.0.1', port, method: req.method, path: req.url, headers: req.headers },
        (answer) => {
          this.bump(`${port}`);
          if (isRowSave) this.bump(`${port}/row-saves`);
          res.writeHead(answer.statusCode ?? 502, answer.headers);
          answer.pipe(res);
        },
      );
      upstream.on('error', () => {
        this.bump(`${port}/failed`);
        if (!res.headersSent) res.writeHead(502, { 'content-type': 'text/plain' }).end('the API process does not answer');
        else res.destroy();
      });
      res.on('close', () => upstream.destroy());
      req.pipe(upstream);
    });
    await new Promise<void>((resolve, reject) => {
      server.once('error', reject);
      server.listen({ port, host: '127.0.0.1' }, () => resolve());
    });
    this.server = server;
  }

  private bump(key: string): void {
    this.counts.set(key, this.count(key) + 1);
  }

  async close(): Promise<void> {
    const server = this.server;
    this.server = null;
    if (!server) return;
    server.closeAllConnections();
    await new Promise<void>((resolve) => server.close(() => resolve()));
  }
}

// ---------------------------------------------------------------------------------------------
// The stack: two API processes (WORKER=off) and one worker process

interface Stack {
  settings: AppSettings;
  log: string;
  services: Services;
  /** Exits nobody asked for, reported by Services. */
  died: string[];
  portA: number;
  portB: number;
  a: Proc | null;
  b: Proc | null;
  worker: Proc | null;
}

const originOf = (port: number) => `http://127.0.0.1:${port}`;

function tail(file: string, lines = 40): string {
  try {
    return fs.readFileSync(file, 'utf8').trimEnd().split('\n').slice(-lines).join('\n');
  } catch {
    return '(no log)';
  }
}

/**
 * The API process serves the web app only if frontend/dist was there when it started; another
 * build on this machine may be rewriting it right now, so wait for it rather than fail later.
 */
async function webAppBuilt(): Promise<void> {
  const index = path.join(repoRoot, 'frontend', 'dist', 'index.html');
  await waitFor('frontend/dist/index.html (the built web app)', async () => fs.existsSync(index), 120_000);
}

async function startApi(stack: Stack, name: string, port: number): Promise<Proc> {
  const origin = originOf(port);
  await webAppBuilt();
  const env = { ...appEnvironment({ ...stack.settings, port, appUrl: origin }), WORKER: 'off' };
  const proc = stack.services.start(name, process.execPath, [backendEntry('main.js')], { cwd: repoRoot, env, output: { file: stack.log } });
  await waitFor(`API process ${name} (${origin})`, () => httpOk(`${origin}/api/health`), 90_000, () =>
    proc.running ? undefined : `it ${describeExit(proc.exit!)} before it was ready:\n${tail(stack.log)}`,
  );
  const page = await fetch(`${origin}/sign-in`);
  if (!page.ok || !(page.headers.get('content-type') ?? '').includes('text/html')) {
    throw new Error(`API process ${name} does not serve the web app (HTTP ${page.status}): was frontend/dist rebuilt while it started?`);
  }
  return proc;
}

async function startWorker(stack: Stack): Promise<Proc> {
  const before = fs.statSync(stack.log).size;
  const proc = stack.services.start('worker', process.execPath, [backendEntry('cli/worker.js')], {
    cwd: repoRoot,
    env: { ...appEnvironment(stack.settings), WORKER: 'on' },
    output: { file: stack.log },
  });
  // No HTTP to poll: its start-up line (backend/src/cli/worker.ts) says it takes jobs.
  await waitFor('the worker process', async () => fs.readFileSync(stack.log, 'utf8').slice(before).includes('worker running'), 60_000, () =>
    proc.running ? undefined : `it ${describeExit(proc.exit!)} before it was ready:\n${tail(stack.log)}`,
  );
  return proc;
}

/** SIGKILL: no goodbye, as a crashed machine or an OOM kill. */
async function kill(proc: Proc | null): Promise<void> {
  if (!proc?.running) return;
  proc.stopping = true;
  proc.signal('SIGKILL');
  await proc.exited;
}

async function withDatabase<T>(url: string, work: (client: pg.Client) => Promise<T>): Promise<T> {
  const client = new pg.Client({ connectionString: url, application_name: 'dialsheet-e2e-scale-out' });
  await client.connect();
  try {
    return await work(client);
  } finally {
    await client.end();
  }
}

// ---------------------------------------------------------------------------------------------
// Browser helpers

async function signIn(page: Page, origin: string, email: string, password: string, next: string): Promise<void> {
  await page.goto(`${origin}/sign-in?next=${encodeURIComponent(next)}`);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL((url) => url.pathname === next);
}

const inputLabel = (channel: Channel) => `${channel.symbol} ${channel.name} (${channel.rawUnit})`;

async function focusedLabel(page: Page): Promise<string | null> {
  return page.evaluate(() => document.activeElement?.getAttribute('aria-label') ?? null);
}

function rowState(page: Page, rowIndex: number): Promise<string | null> {
  return page.getByTestId(`entry-row-${rowIndex}`).getAttribute('data-state');
}

/** The texts typed for a row of the browser sheet (T1 and V): different from row to row. */
function browserRowTexts(row: number): string[] {
  return [(20 + row / 10).toFixed(1), (2.5 + row / 1000).toFixed(3)];
}

/** Waits for the row with the cursor in its first input, then types its texts, Enter after each. */
async function typeRow(page: Page, rowIndex: number, channels: readonly Channel[]): Promise<void> {
  await expect.poll(() => page.getByTestId('entry-row-title').innerText()).toMatch(new RegExp(`^Row ${rowIndex + 1}\\b`));
  await expect.poll(() => focusedLabel(page)).toBe(inputLabel(channels[0]));
  for (const text of browserRowTexts(rowIndex)) {
    await page.keyboard.type(text);
    await page.keyboard.press('Enter');
  }
}

// ---------------------------------------------------------------------------------------------

describe('scale-out: two API processes and one worker process keep no state in memory', () => {
  const base = browserStepSettings();
  const runDir = path.dirname(base.storageDir);
  const databaseUrl = (() => {
    const url = new URL(base.databaseUrl);
    url.pathname = `/${DATABASE}`;
    return url.toString();
  })();
  const stack: Stack = {
    settings: {
      ...base,
      databaseUrl,
      storageDir: path.join(runDir, 'e2e-scale-out'),
      mailCatcherDir: path.join(runDir, 'e2e-scale-out-mail'),
      demoVideosDir: undefined,
    },
    log: path.join(runDir, 'e2e-scale-out.log'),
    services: new Services((proc, exit) => stack.died.push(`${proc.name} ${describeExit(exit)}`)),
    died: [],
    portA: 0,
    portB: 0,
    a: null,
    b: null,
    worker: null,
  };
  const password = base.demoPassword;
  const balancer = new Balancer(0);
  const sessions: BrowserSession[] = [];
  let workDir: string;
  let leadToken: string;
  let campaignId: string;
  let channels: Channel[];
  let members: CampaignMember[];
  let runId: string;
  const a = () => originOf(stack.portA);
  const b = () => originOf(stack.portB);
  const memberId = (email: string) => {
    const member = members.find((m) => m.email === email);
    if (!member) throw new Error(`${email} is not a member of the demo campaign`);
    return member.userId;
  };

  beforeAll(async () => {
    for (const dir of [stack.settings.storageDir, stack.settings.mailCatcherDir]) {
      fs.rmSync(dir, { recursive: true, force: true });
      fs.mkdirSync(dir, { recursive: true });
    }
    fs.writeFileSync(stack.log, '');
    workDir = fs.mkdtempSync(path.join(runDir, 'e2e-scale-out-video-'));
    await withDatabase(base.databaseUrl, async (client) => {
      await client.query(`DROP DATABASE IF EXISTS ${DATABASE} WITH (FORCE)`);
      await client.query(`CREATE DATABASE ${DATABASE}`);
    });
    await migrateAndSeed(stack.settings, () => ({ file: stack.log }));
    [stack.portA, stack.portB] = [await freePort(), await freePort()];
    // Both at once on a fresh storage directory: they must settle on one JWT secret between them.
    [stack.a, stack.b] = await Promise.all([startApi(stack, 'api-a', stack.portA), startApi(stack, 'api-b', stack.portB)]);
    balancer.target = stack.portA;
    await balancer.listen(await freePort());

    leadToken = await signInThrough(a(), 'lead@demo.test', password);
    const campaigns = await api<Array<{ id: string; name: string }>>(a(), leadToken, 'GET', '/campaigns');
    const campaign = campaigns.find((c) => c.name === DEMO_CAMPAIGN);
    if (!campaign) throw new Error(`the seeded campaign "${DEMO_CAMPAIGN}" is missing`);
    campaignId = campaign.id;
    channels = await api<Channel[]>(a(), leadToken, 'GET', `/campaigns/${campaignId}/channels`);
    members = await api<CampaignMember[]>(a(), leadToken, 'GET', `/campaigns/${campaignId}/members`);
  }, 180_000);

  afterAll(async () => {
    for (const session of sessions) await session.close().catch(() => undefined);
    await balancer.close();
    await stack.services.stopAll();
    await withDatabase(base.databaseUrl, (client) => client.query(`DROP DATABASE IF EXISTS ${DATABASE} WITH (FORCE)`)).catch((error: unknown) => {
      console.error(`could not drop ${DATABASE}: ${(error as Error).message}`);
    });
    if (workDir) fs.rmSync(workDir, { recursive: true, force: true });
    fs.rmSync(stack.settings.storageDir, { recursive: true, force: true });
    fs.rmSync(stack.settings.mailCatcherDir, { recursive: true, force: true });
  }, 60_000);

  it('a token from A works on B; an upload through A waits for the worker process, which transcodes it; B streams a range of it', async () => {
    // A token A issued is accepted by B, and B sees the same campaign.
    const onB = await api<Array<{ id: string }>>(b(), leadToken, 'GET', '/campaigns');
    expect(onB.map((c) => c.id)).toContain(campaignId);

    const stamp = `${Date.now().toString(36)}${Math.random().toString(36).slice(2, 6)}`;
    const video = await makeVideo(workDir, stamp);
    const created = await api<Run>(b(), leadToken, 'POST', `/campaigns/${campaignId}/runs`, { name: `Scale-out ${stamp}` });
    runId = created.id;
    const form = new FormData();
    form.append('file', await fs.openAsBlob(video, { type: 'video/mp4' }), path.basename(video));
    const upload = await fetch(`${a()}/api/runs/${runId}/recording`, { method: 'POST', headers: { authorization: `Bearer ${leadToken}` }, body: form });
    expect(upload.status, await upload.clone().text()).toBe(201);
    const uploaded = (await upload.json()) as Recording;
    expect(uploaded.status).toBe('uploaded');

    // No worker process yet and both API processes have WORKER=off: nobody touches the job.
    for (let i = 0; i < 6; i++) {
      await sleep(1000);
      const now = await api<Recording>(b(), leadToken, 'GET', `/runs/${runId}/recording`);
      expect(now.status).toBe('uploaded');
    }

    stack.worker = await startWorker(stack);
    const deadline = Date.now() + 120_000;
    let recording: Recording;
    for (;;) {
      recording = await api<Recording>(b(), leadToken, 'GET', `/runs/${runId}/recording`);
      if (recording.status === 'ready') break;
      if (recording.status === 'failed') throw new Error(`the worker process failed the recording: ${recording.failureReason}`);
      if (Date.now() > deadline) throw new Error(`the recording is still "${recording.status}" 2 minutes after the worker process started:\n${tail(stack.log)}`);
      await sleep(500);
    }
    expect(recording.id).toBe(uploaded.id);

    // A signs the link; B serves a byte range of the playback copy the worker process wrote.
    const links = await api<MediaUrls>(a(), leadToken, 'POST', `/recordings/${recording.id}/media-urls`);
    expect(links.proxyUrl).not.toBeNull();
    const whole = await fetch(new URL(links.proxyUrl!, a()));
    expect(whole.status).toBe(200);
    const bytes = Buffer.from(await whole.arrayBuffer());
    expect(bytes.length).toBeGreaterThan(5000);
    const ranged = await fetch(new URL(links.proxyUrl!, b()), { headers: { range: 'bytes=1000-4999' } });
    expect(ranged.status).toBe(206);
    expect(ranged.headers.get('content-range')).toBe(`bytes 1000-4999/${bytes.length}`);
    const part = Buffer.from(await ranged.arrayBuffer());
    expect(part.equals(bytes.subarray(1000, 5000))).toBe(true);

    await api<Run>(b(), leadToken, 'PUT', `/runs/${runId}/sync`, { first: { videoTime: 0, testTime: 0 }, reason: 'Scale-out test set-up' });
    expect(stack.died).toEqual([]);
  }, 180_000);

  it('a reader on A and the checker on B work one sheet at once; rows typed while A is down reach B when the balancer moves the page there', async () => {
    expect(runId, 'the first test made the run').toBeDefined();
    const sheetChannels = ['T1', 'V'].map((symbol) => channels.find((c) => c.symbol === symbol)!);
    const sheet = await api<Sheet>(b(), leadToken, 'POST', `/runs/${runId}/sheets`, {
      name: `Scale-out sheet ${Date.now().toString(36)}`,
      startTime: 0,
      endTime: 25,
      interval: 5,
      channelIds: sheetChannels.map((c) => c.id),
    });
    await api<Sheet>(a(), leadToken, 'PUT', `/sheets/${sheet.id}/assignment`, { readerId: memberId('reader@demo.test'), checkerId: memberId('checker@demo.test') });
    const entry = `/campaigns/${campaignId}/sheets/${sheet.id}/entry`;
    const expectTexts = (readings: Reading[], rows: number[]) => {
      expect(readings.map((r) => `${r.rowIndex}/${r.channelId}`).sort()).toEqual(rows.flatMap((i) => sheetChannels.map((c) => `${i}/${c.id}`)).sort());
      for (const r of readings) {
        expect(r.rawText).toBe(browserRowTexts(r.rowIndex)[sheetChannels.findIndex((c) => c.id === r.channelId)]);
        // Stored once: no retry through another process made a second version.
        expect(r.version).toBe(1);
      }
    };

    const reader = await launchBrowser();
    sessions.push(reader);
    const checker = await launchBrowser();
    sessions.push(checker);
    await withFailureScreenshot(reader.page, 'scale-out-reader', async () => {
      // The reader's page is behind the balancer, which sends everything to A.
      await signIn(reader.page, balancer.origin, 'reader@demo.test', password, entry);
      await reader.page.getByTestId('entry-screen').waitFor({ timeout: 30_000 });
      for (const row of [0, 1]) await typeRow(reader.page, row, sheetChannels);
      for (const row of [0, 1]) await expect.poll(() => rowState(reader.page, row), { timeout: 20_000 }).toBe('saved');
      expect(balancer.count(`${stack.portA}/row-saves`)).toBeGreaterThanOrEqual(2);
    });

    // Saved through A, read through B (with the lead's token from A).
    expectTexts(await api<Reading[]>(b(), leadToken, 'GET', `/sheets/${sheet.id}/readings?pass=1`), [0, 1]);

    // Meanwhile the checker works the same sheet, blind, straight on B.
    await withFailureScreenshot(checker.page, 'scale-out-checker', async () => {
      await signIn(checker.page, b(), 'checker@demo.test', password, entry);
      await checker.page.getByTestId('entry-screen').waitFor({ timeout: 30_000 });
      await expect(checker.page.getByText('Pass 2 (blind)').count()).resolves.toBe(1);
      for (const row of [0, 1]) await typeRow(checker.page, row, sheetChannels);
      for (const row of [0, 1]) await expect.poll(() => rowState(checker.page, row), { timeout: 20_000 }).toBe('saved');
    });
    expectTexts(await api<Reading[]>(a(), leadToken, 'GET', `/sheets/${sheet.id}/readings?pass=2`), [0, 1]);

    // A dies without a word; the balancer still sends the reader's page there (502), so the rows
    // typed now wait in the browser.
    await kill(stack.a);
    await withFailureScreenshot(reader.page, 'scale-out-failover', async () => {
      for (const row of [2, 3]) await typeRow(reader.page, row, sheetChannels);
      await expect.poll(() => reader.page.getByTestId('entry-queue-status').innerText(), { timeout: 20_000 }).toMatch(/2 rows waiting/);
      for (const row of [2, 3]) await expect(rowState(reader.page, row)).resolves.toMatch(/^(pending|sending)$/);
      expect(balancer.count(`${stack.portA}/failed`)).toBeGreaterThan(0);

      // The balancer notices and moves the page to B: the same token, the queued rows arrive.
      const savesOnBBefore = balancer.count(`${stack.portB}/row-saves`);
      balancer.target = stack.portB;
      for (const row of [2, 3]) await expect.poll(() => rowState(reader.page, row), { timeout: 60_000 }).toBe('saved');
      await expect.poll(() => reader.page.getByTestId('entry-queue-status').innerText()).toBe('All rows saved');
      expect(balancer.count(`${stack.portB}/row-saves`) - savesOnBBefore).toBeGreaterThanOrEqual(2);
    });
    expectTexts(await api<Reading[]>(b(), leadToken, 'GET', `/sheets/${sheet.id}/readings?pass=1`), [0, 1, 2, 3]);

    // A comes back for the load test.
    stack.a = await startApi(stack, 'api-a', stack.portA);
    expect(stack.died).toEqual([]);
  }, 240_000);

  it(`${LOAD_READERS} readers save rows for ${LOAD_MS / 1000} s across both API processes: every acknowledged row is stored exactly once, no errors`, async () => {
    expect(stack.a?.running && stack.b?.running, 'both API processes run').toBe(true);
    const panel = ['T1', 'T2', 'T3', 'T4', 'V', 'P'].map((symbol) => {
      const channel = channels.find((c) => c.symbol === symbol);
      if (!channel) throw new Error(`the demo campaign has no channel ${symbol}`);
      return channel;
    });
    const readerId = memberId('reader@demo.test');
    const checkerId = memberId('checker@demo.test');
    // One sheet per reader (the server locks the sheet row while it saves), made half through each process.
    const sheets: Sheet[] = [];
    for (let i = 0; i < LOAD_READERS; i++) {
      const origin = i % 2 === 0 ? a() : b();
      const sheet = await api<Sheet>(origin, leadToken, 'POST', `/runs/${runId}/sheets`, {
        name: `Load ${i + 1} ${Date.now().toString(36)}`,
        startTime: 0,
        endTime: 25,
        interval: 0.1,
        channelIds: panel.map((c) => c.id),
      });
      sheets.push(await api<Sheet>(origin, leadToken, 'PUT', `/sheets/${sheet.id}/assignment`, { readerId, checkerId }));
    }
    const rowCount = sheets[0].rowCount;
    // 60 s at a mean of one row a second stays well inside the sheet.
    expect(rowCount).toBeGreaterThan((LOAD_MS / PACE_MIN_MS) * 1.2);
    // The reader's token from B is used on both processes.
    const authorization = `Bearer ${await signInThrough(b(), 'reader@demo.test', password)}`;
    // A save that takes longer than 30 s counts as an error (the browser's queue would retry it).
    const clients = sheets.map((sheet, i) => new SaveClient(i, sheet.id, panel, authorization, new URL(i % 2 === 0 ? a() : b()), rowCount, 30_000));
    const outcomes: Outcome[] = [];
    try {
      const pause = () => PACE_MIN_MS + Math.random() * (PACE_MAX_MS - PACE_MIN_MS);
      const start = performance.now();
      await Promise.all(clients.map((c) => c.paced(start, start + Math.random() * PACE_MAX_MS, start + LOAD_MS, outcomes, pause)));
    } finally {
      for (const c of clients) c.agent.destroy();
    }

    const errors = clients.flatMap((c) => c.errors.map((e) => `sheet ${c.index + 1} on ${c.url.port}: ${e}`));
    expect(outcomes.filter((o) => !o.ok).length, errors.slice(0, 5).join('\n')).toBe(0);
    // Both processes took their half: about 25 readers × 60 rows each.
    const onA = outcomes.filter((o) => o.sheet % 2 === 0).length;
    const onB = outcomes.filter((o) => o.sheet % 2 === 1).length;
    expect(onA).toBeGreaterThan(LOAD_READERS / 2);
    expect(onB).toBeGreaterThan(LOAD_READERS / 2);

    const check = await withDatabase(databaseUrl, (client) => checkStored(client, sheets.map((s) => s.id), panel.length, outcomes));
    expect(check.acknowledged).toBe(outcomes.length);
    expect(check).toMatchObject({ lost: 0, wrong: 0, duplicates: 0, unacknowledged: 0 });
    expect(check.stored).toBe(outcomes.length);
    expect(check.readings).toBe(outcomes.length * panel.length);
    // One audit entry per reading (DEVELOPERS.md: every change writes its audit row).
    expect(check.audits).toBe(check.readings);
    expect(stack.died).toEqual([]);
  }, 240_000);
});
