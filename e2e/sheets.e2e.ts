import { spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { beforeAll, describe, expect, it } from 'vitest';
import type { Page, Request } from 'playwright-core';
import { frameIndexAt, toVideoTime, type Channel, type CampaignMember, type LoginResponse, type Reading, type RecordingFrames, type Sheet, type SheetMismatches, type SheetRow, type SyncMarks } from '@dialsheet/common';
import { readingsAt, type DisplayKey, type RunTruth } from '../scripts/demo/scenario';
import { assertServerUp, baseUrl, browserStepSettings, demoPassword, launchBrowser, withFailureScreenshot } from './support/browser';
import { finishByKeyboard } from './support/keyboard';
import { api, ApiError } from './support/api';

// Reading sheets in the browser on the seeded demo run: the reader types the whole sheet with the
// keyboard alone, the checker enters blind and resolves the one mismatch they planted, and a
// server killed in the middle of entry loses nothing. Every value typed is what the demo video's
// displays really show at the row's frame (the generator's truth file), so the stored readings are
// checked against the video, not against themselves.

const repoRoot = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');

/** The part of scripts/lib/app.ts AppSettings a second server needs (passed by `npm test`). */
interface AppSettings {
  port: number;
  host: string;
  databaseUrl: string;
  storageDir: string;
  smtpUrl: string;
  mailCatcherDir: string;
  demoPassword: string;
  appUrl: string;
  demoVideosDir?: string;
}

const DEMO_CAMPAIGN = 'Heat-recovery core bench test';
const DEMO_RUN_PREFIX = 'Run 1';
const DEMO_SHEET = 'Every 5 s, whole run';

// ---------------------------------------------------------------------------------------------
// API

const tokens = new Map<string, string>();
async function tokenFor(email: string): Promise<string> {
  const known = tokens.get(email);
  if (known) return known;
  const login = await api<LoginResponse>(null, 'POST', '/auth/login', { email, password: demoPassword });
  tokens.set(email, login.accessToken);
  return login.accessToken;
}

// ---------------------------------------------------------------------------------------------
// The demo run and what its displays show

interface DemoContext {
  campaignId: string;
  runId: string;
  sync: SyncMarks;
  frameTimes: number[];
  channels: Channel[];
  members: CampaignMember[];
  truth: RunTruth;
}

/** Row → the frame the entry screen shows for it and the text each display shows there (sheet order). */
interface ExpectedRow {
  rowIndex: number;
  frame: number;
  frameTime: number;
  texts: string[];
}

function expectedRows(ctx: DemoContext, rows: readonly SheetRow[], channelIds: readonly string[]): ExpectedRow[] {
  const symbols = channelIds.map((id) => {
    const channel = ctx.channels.find((c) => c.id === id);
    if (!channel) throw new Error(`channel ${id} of the sheet is not in the campaign`);
    return channel.symbol as DisplayKey;
  });
  return rows.map((row) => {
    const frame = frameIndexAt(ctx.frameTimes, toVideoTime(ctx.sync, row.testTime));
    expect(frame).toBeGreaterThanOrEqual(0);
    const frameTime = ctx.frameTimes[frame];
    const shown = readingsAt(ctx.truth, frameTime);
    return { rowIndex: row.index, frame, frameTime, texts: symbols.map((s) => shown[s]) };
  });
}

async function waitForReadyRecording(token: string, runId: string): Promise<{ id: string }> {
  const deadline = Date.now() + 180_000;
  for (;;) {
    const recording = await api<{ id: string; status: string } | null>(token, 'GET', `/runs/${runId}/recording`).catch((error: unknown) => {
      if (error instanceof ApiError && error.status === 404) return null;
      throw error;
    });
    if (recording?.status === 'ready') return recording;
    if (recording?.status === 'failed') throw new Error('the demo recording failed to process');
    if (Date.now() > deadline) throw new Error(`the demo recording is not ready after 3 minutes (status ${recording?.status ?? 'none'})`);
    await new Promise((resolve) => setTimeout(resolve, 1000));
  }
}

async function loadDemo(): Promise<DemoContext> {
  const settings = browserStepSettings();
  if (!settings.demoVideosDir) throw new Error('E2E_APP_SETTINGS names no demoVideosDir: the browser step generates the demo video there');
  const truth = JSON.parse(fs.readFileSync(path.join(settings.demoVideosDir, 'run-1.truth.json'), 'utf8')) as RunTruth;
  const lead = await tokenFor('lead@demo.test');
  const campaigns = await api<{ id: string; name: string }[]>(lead, 'GET', '/campaigns');
  const campaign = campaigns.find((c) => c.name === DEMO_CAMPAIGN);
  if (!campaign) throw new Error(`the seeded campaign "${DEMO_CAMPAIGN}" is missing`);
  const runs = await api<{ id: string; name: string; sync: SyncMarks | null }[]>(lead, 'GET', `/campaigns/${campaign.id}/runs`);
  const run = runs.find((r) => r.name.startsWith(DEMO_RUN_PREFIX));
  if (!run?.sync) throw new Error('the seeded run 1 is missing or has no sync');
  const recording = await waitForReadyRecording(lead, run.id);
  const frames = await api<RecordingFrames>(lead, 'GET', `/recordings/${recording.id}/frames`);
  const channels = await api<Channel[]>(lead, 'GET', `/campaigns/${campaign.id}/channels`);
  const members = await api<CampaignMember[]>(lead, 'GET', `/campaigns/${campaign.id}/members`);
  // The generator's frame grid and the playback copy's must be one and the same for the truth to apply.
  expect(frames.times.length).toBe(truth.frameCount);
  return { campaignId: campaign.id, runId: run.id, sync: run.sync, frameTimes: frames.times, channels, members, truth };
}

// ---------------------------------------------------------------------------------------------
// Browser helpers

function entryPath(campaignId: string, sheetId: string): string {
  return `/campaigns/${campaignId}/sheets/${sheetId}/entry`;
}

/** Signs in with the keyboard only; the form sends the person on to `next`. */
async function signInByKeyboard(page: Page, origin: string, email: string, next: string): Promise<void> {
  await page.goto(`${origin}/sign-in?next=${encodeURIComponent(next)}`);
  const emailInput = page.getByLabel('E-mail');
  await emailInput.waitFor();
  // The e-mail field has the focus on arrival.
  await expect.poll(() => emailInput.evaluate((el) => el === document.activeElement)).toBe(true);
  await page.keyboard.type(email);
  await page.keyboard.press('Tab');
  await expect.poll(() => page.getByLabel('Password').evaluate((el) => el === document.activeElement)).toBe(true);
  await page.keyboard.type(demoPassword);
  await page.keyboard.press('Enter');
  await page.waitForURL((url) => url.pathname === next);
}

async function focusedLabel(page: Page): Promise<string | null> {
  return page.evaluate(() => document.activeElement?.getAttribute('aria-label') ?? null);
}

function inputLabel(channel: Channel): string {
  return `${channel.symbol} ${channel.name} (${channel.rawUnit})`;
}

/** Waits until the entry screen shows this row, with the cursor in its first input and its frame on screen. */
async function atRow(page: Page, row: ExpectedRow, first: Channel): Promise<void> {
  await expect.poll(() => page.getByTestId('entry-row-title').innerText()).toMatch(new RegExp(`^Row ${row.rowIndex + 1}\\b`));
  await expect.poll(() => page.getByTestId('entry-frame-index').innerText(), { timeout: 15_000 }).toBe(String(row.frame));
  await expect.poll(() => focusedLabel(page)).toBe(inputLabel(first));
}

/** Types the texts of one row, Enter after each: the last Enter saves the row and steps on. */
async function typeRow(page: Page, texts: readonly string[]): Promise<void> {
  for (const text of texts) {
    await page.keyboard.type(text);
    await page.keyboard.press('Enter');
  }
}

function rowState(page: Page, rowIndex: number): Promise<string | null> {
  return page.getByTestId(`entry-row-${rowIndex}`).getAttribute('data-state');
}

function orderedChannels(ctx: DemoContext, sheet: Sheet): Channel[] {
  return sheet.channelIds.map((id) => ctx.channels.find((c) => c.id === id)!);
}

// ---------------------------------------------------------------------------------------------
// A second server on the same database and storage, for the restart drill

function secondServerEnv(settings: AppSettings, port: number): NodeJS.ProcessEnv {
  // As scripts/lib/app.ts appEnvironment(), on another port.
  return {
    ...process.env,
    PORT: String(port),
    HOST: settings.host,
    DATABASE_URL: settings.databaseUrl,
    STORAGE_DIR: settings.storageDir,
    SMTP_URL: settings.smtpUrl,
    MAIL_CATCHER_DIR: settings.mailCatcherDir,
    DEMO_PASSWORD: settings.demoPassword,
    APP_URL: `http://127.0.0.1:${port}`,
    ...(settings.demoVideosDir ? { DEMO_VIDEOS_DIR: settings.demoVideosDir } : {}),
  };
}

interface SecondServer {
  proc: ChildProcess;
  log: string[];
  exited: Promise<void>;
}

async function healthy(origin: string): Promise<boolean> {
  try {
    return (await fetch(`${origin}/api/health`)).ok;
  } catch {
    return false;
  }
}

async function startSecondServer(settings: AppSettings, port: number): Promise<SecondServer> {
  const origin = `http://127.0.0.1:${port}`;
  if (await healthy(origin)) throw new Error(`something already answers on port ${port}; set E2E_SECOND_PORT to a free port`);
  const entry = path.join(repoRoot, 'backend', 'dist', 'main.js');
  if (!fs.existsSync(entry)) throw new Error('backend/dist/main.js is missing: build the backend first');
  const log: string[] = [];
  const proc = spawn(process.execPath, [entry], { cwd: repoRoot, env: secondServerEnv(settings, port), stdio: ['ignore', 'pipe', 'pipe'] });
  proc.stdout?.on('data', (chunk: Buffer) => log.push(chunk.toString()));
  proc.stderr?.on('data', (chunk: Buffer) => log.push(chunk.toString()));
  const exited = new Promise<void>((resolve) => proc.once('exit', () => resolve()));
  const deadline = Date.now() + 60_000;
  while (!(await healthy(origin))) {
    if (proc.exitCode !== null || proc.signalCode !== null) throw new Error(`the second server stopped before it was ready:\n${log.join('').slice(-2000)}`);
    if (Date.now() > deadline) throw new Error(`the second server did not answer within 60 s:\n${log.join('').slice(-2000)}`);
    await new Promise((resolve) => setTimeout(resolve, 250));
  }
  return { proc, log, exited };
}

async function killServer(server: SecondServer | undefined): Promise<void> {
  if (!server || server.proc.exitCode !== null || server.proc.signalCode !== null) return;
  server.proc.kill('SIGKILL');
  await server.exited;
}

// ---------------------------------------------------------------------------------------------

describe('reading sheets: keyboard entry, blind second pass, mismatch resolution, restart', () => {
  let ctx: DemoContext;
  let sheet: Sheet;
  let rows: SheetRow[];
  let expected: ExpectedRow[];

  beforeAll(async () => {
    await assertServerUp();
    ctx = await loadDemo();
    const lead = await tokenFor('lead@demo.test');
    const sheets = await api<Sheet[]>(lead, 'GET', `/runs/${ctx.runId}/sheets`);
    const seeded = sheets.find((s) => s.name === DEMO_SHEET);
    if (!seeded) throw new Error(`the seeded sheet "${DEMO_SHEET}" is missing on run 1`);
    sheet = seeded;
    rows = await api<SheetRow[]>(lead, 'GET', `/sheets/${sheet.id}/rows`);
    expected = expectedRows(ctx, rows, sheet.channelIds);
  }, 240_000);

  it('the seeded sheet is the one the demo promises: 8 rows × 6 channels, nothing typed yet', () => {
    expect(rows.map((r) => r.testTime)).toEqual([0, 5, 10, 15, 20, 25, 30, 35]);
    expect(orderedChannels(ctx, sheet).map((c) => c.symbol)).toEqual(['T1', 'T2', 'T3', 'T4', 'V', 'P']);
    expect(sheet.progress.pass1.done).toBe(0);
    expect(sheet.progress.pass2.done).toBe(0);
    expect(sheet.pass1FinishedAt).toBeNull();
  });

  it('a reader completes the sheet with the keyboard alone; a bad value shows the inline error and is not saved', async () => {
    const session = await launchBrowser();
    const { page } = session;
    const channels = orderedChannels(ctx, sheet);
    const typed = new Map<string, string>();
    try {
      await withFailureScreenshot(page, 'sheets-reader', async () => {
        const target = entryPath(ctx.campaignId, sheet.id);
        await signInByKeyboard(page, baseUrl, 'reader@demo.test', target);
        await page.getByTestId('entry-screen').waitFor({ timeout: 30_000 });
        await expect(page.getByTestId('entry-progress').innerText()).resolves.toBe(`0 of ${rows.length} rows saved`);

        for (const row of expected) {
          await atRow(page, row, channels[0]);
          if (row.rowIndex === 0) {
            // A value the parser refuses: the message is under the input, the cursor stays, nothing is saved.
            await page.keyboard.type('12..3');
            await page.keyboard.press('Enter');
            const cell = page.getByTestId(`entry-cell-${channels[0].symbol}`);
            const input = page.getByLabel(inputLabel(channels[0]), { exact: true });
            await cell.locator('.entry-error').waitFor();
            await expect(cell.locator('.entry-error').innerText()).resolves.toMatch(/\S/);
            await expect(input.getAttribute('aria-invalid')).resolves.toBe('true');
            await expect(focusedLabel(page)).resolves.toBe(inputLabel(channels[0]));
            await expect(rowState(page, 0)).resolves.not.toBe('saved');
            // Select the bad text and type the display's value over it.
            await page.keyboard.press('Control+A');
            await page.keyboard.type(row.texts[0]);
            await expect(input.getAttribute('aria-invalid')).resolves.toBeNull();
            await expect(cell.locator('.entry-error').count()).resolves.toBe(0);
            await page.keyboard.press('Enter');
            await expect(focusedLabel(page)).resolves.toBe(inputLabel(channels[1]));
            await typeRow(page, row.texts.slice(1));
          } else {
            await typeRow(page, row.texts);
          }
          row.texts.forEach((text, i) => typed.set(`${row.rowIndex}/${channels[i].id}`, text));
        }

        await finishByKeyboard(page, 1);
      });
    } finally {
      await session.close();
    }

    // What the server holds: the 48 texts as typed, each with the presentation time of the row's frame.
    const lead = await tokenFor('lead@demo.test');
    const after = await api<Sheet>(lead, 'GET', `/sheets/${sheet.id}`);
    expect(after.pass1FinishedAt).not.toBeNull();
    expect(after.progress.pass1).toEqual({ done: 48, total: 48 });
    const stored = await api<Reading[]>(lead, 'GET', `/sheets/${sheet.id}/readings?pass=1`);
    expect(stored).toHaveLength(48);
    expect(typed.size).toBe(48);
    for (const reading of stored) {
      expect(reading.pass).toBe(1);
      expect(reading.rawText).toBe(typed.get(`${reading.rowIndex}/${reading.channelId}`));
      expect(reading.flag).toBeNull();
      expect(reading.value).toBe(Number(reading.rawText));
      expect(reading.frameTime).not.toBeNull();
      expect(reading.frameTime!).toBeCloseTo(expected[reading.rowIndex].frameTime, 4);
    }
  }, 240_000);

  it('the checker enters blind, plants one wrong value, and resolves that mismatch against the frame', async () => {
    const session = await launchBrowser();
    const { page } = session;
    const channels = orderedChannels(ctx, sheet);
    const planted = { rowIndex: 3, channel: 1 };
    const trueText = expected[planted.rowIndex].texts[planted.channel];
    // One tenth of a degree off: the kind of slip a second pass exists to catch.
    const wrongText = (Number(trueText) + 0.1).toFixed(1);
    expect(wrongText).not.toBe(trueText);
    const reason = 'T2 reads 0.1 °C lower on the frame; the pass 2 entry was a typing slip.';

    const requests: string[] = [];
    const listen = (request: Request) => requests.push(request.url());
    try {
      await withFailureScreenshot(page, 'sheets-checker', async () => {
        page.on('request', listen);
        const target = entryPath(ctx.campaignId, sheet.id);
        await signInByKeyboard(page, baseUrl, 'checker@demo.test', target);
        await page.getByTestId('entry-screen').waitFor({ timeout: 30_000 });
        await expect(page.getByText('Pass 2 (blind)').count()).resolves.toBe(1);
        for (const row of expected) {
          await atRow(page, row, channels[0]);
          const texts = row.texts.slice();
          if (row.rowIndex === planted.rowIndex) texts[planted.channel] = wrongText;
          await typeRow(page, texts);
        }
        await finishByKeyboard(page, 2);
        page.off('request', listen);

        // Blind: the screen never asked for the first pass or the comparison while pass 2 was open.
        const apiCalls = requests.filter((url) => new URL(url).pathname.startsWith('/api/'));
        expect(apiCalls.some((url) => /\/readings\?pass=2\b/.test(url))).toBe(true);
        expect(apiCalls.filter((url) => /\/readings\?pass=1\b/.test(url))).toEqual([]);
        expect(apiCalls.filter((url) => /\/mismatches\b/.test(url))).toEqual([]);

        // The mismatch list on the sheet page: exactly the planted cell.
        await page.goto(`/campaigns/${ctx.campaignId}/sheets/${sheet.id}?tab=mismatches`);
        const table = page.locator('.mismatch-table');
        await table.waitFor();
        const listed = table.locator('tbody tr[data-row-key]');
        await expect.poll(() => listed.count()).toBe(1);
        const line = await listed.first().innerText();
        expect(line).toContain(String(planted.rowIndex + 1));
        expect(line).toContain(channels[planted.channel].symbol);
        expect(line).toContain(trueText);
        expect(line).toContain(wrongText);

        // j selects it, Enter opens it against its frame; type the value and the reason, Ctrl+Enter saves.
        await page.keyboard.press('j');
        await page.keyboard.press('Enter');
        const drawer = page.locator('.resolution-drawer');
        await drawer.waitFor();
        await expect(drawer.innerText()).resolves.toContain(`Row ${planted.rowIndex + 1}`);
        await drawer.getByLabel('Resolved value').fill(trueText);
        await drawer.getByLabel('Reason').fill(reason);
        await page.keyboard.press('Control+Enter');
        await drawer.getByText(/Resolution saved \(version 1\)/).waitFor();
      });
    } finally {
      page.off('request', listen);
      await session.close();
    }

    const lead = await tokenFor('lead@demo.test');
    const after = await api<Sheet>(lead, 'GET', `/sheets/${sheet.id}`);
    expect(after.pass2FinishedAt).not.toBeNull();
    const pass2 = await api<Reading[]>(lead, 'GET', `/sheets/${sheet.id}/readings?pass=2`);
    expect(pass2).toHaveLength(48);
    for (const reading of pass2) {
      const i = sheet.channelIds.indexOf(reading.channelId);
      const want = reading.rowIndex === planted.rowIndex && i === planted.channel ? wrongText : expected[reading.rowIndex].texts[i];
      expect(reading.rawText).toBe(want);
    }
    const mismatches = await api<SheetMismatches>(lead, 'GET', `/sheets/${sheet.id}/mismatches`);
    expect(mismatches.complete).toBe(true);
    expect(mismatches.cells).toHaveLength(1);
    const [cell] = mismatches.cells;
    expect(cell.rowIndex).toBe(planted.rowIndex);
    expect(cell.channelId).toBe(sheet.channelIds[planted.channel]);
    expect(cell.pass1.rawText).toBe(trueText);
    expect(cell.pass2.rawText).toBe(wrongText);
    expect(cell.resolution).not.toBeNull();
    expect(cell.resolution!.rawText).toBe(trueText);
    expect(cell.resolution!.reason).toBe(reason);
    expect(cell.resolution!.resolvedBy).toBe(ctx.members.find((m) => m.email === 'checker@demo.test')!.userId);
    expect(mismatches.open).toBe(0);
    expect(mismatches.resolved).toBe(1);
  }, 240_000);

  it('a server killed during entry loses nothing: rows typed meanwhile wait in the browser and reach the restarted server', async () => {
    const settings = browserStepSettings();
    const port = Number(process.env.E2E_SECOND_PORT ?? settings.port + 2);
    const origin = `http://127.0.0.1:${port}`;
    const lead = await tokenFor('lead@demo.test');
    const stamp = `${Date.now().toString(36)}${Math.random().toString(36).slice(2, 6)}`;
    // Six rows (0–25 s): two typed before the kill, three while the server is down, one left.
    const drill = await api<Sheet>(lead, 'POST', `/runs/${ctx.runId}/sheets`, {
      name: `Restart drill ${stamp}`,
      startTime: 0,
      endTime: 25,
      interval: 5,
      channelIds: sheet.channelIds,
    });
    const memberId = (email: string) => ctx.members.find((m) => m.email === email)!.userId;
    await api<Sheet>(lead, 'PUT', `/sheets/${drill.id}/assignment`, { readerId: memberId('reader@demo.test'), checkerId: memberId('checker@demo.test') });
    const drillRows = await api<SheetRow[]>(lead, 'GET', `/sheets/${drill.id}/rows`);
    expect(drillRows).toHaveLength(6);
    const want = expectedRows(ctx, drillRows, drill.channelIds);
    const channels = orderedChannels(ctx, drill);

    let server: SecondServer | undefined;
    const session = await launchBrowser();
    const { page } = session;
    try {
      server = await startSecondServer(settings, port);
      await withFailureScreenshot(page, 'sheets-restart', async () => {
        await signInByKeyboard(page, origin, 'reader@demo.test', entryPath(ctx.campaignId, drill.id));
        await page.getByTestId('entry-screen').waitFor({ timeout: 30_000 });

        for (const row of want.slice(0, 2)) {
          await atRow(page, row, channels[0]);
          await typeRow(page, row.texts);
        }
        await expect.poll(() => rowState(page, 0)).toBe('saved');
        await expect.poll(() => rowState(page, 1)).toBe('saved');

        // The server dies without a word; the reader goes on typing.
        await killServer(server);
        expect(await healthy(origin)).toBe(false);
        for (const row of want.slice(2, 5)) {
          await atRow(page, row, channels[0]);
          await typeRow(page, row.texts);
        }
        await atRow(page, want[5], channels[0]);
        await expect.poll(() => page.getByTestId('entry-queue-status').innerText(), { timeout: 20_000 }).toMatch(/3 rows waiting/);
        for (const i of [2, 3, 4]) await expect(rowState(page, i)).resolves.toMatch(/^(pending|sending)$/);
        await expect(page.getByTestId('entry-progress').innerText()).resolves.toBe('2 of 6 rows saved');

        // Back up on the same port: the queue retries by itself and every row arrives.
        server = await startSecondServer(settings, port);
        for (const i of [2, 3, 4]) await expect.poll(() => rowState(page, i), { timeout: 90_000 }).toBe('saved');
        await expect.poll(() => page.getByTestId('entry-queue-status').innerText()).toBe('All rows saved');
        await expect(page.getByTestId('entry-progress').innerText()).resolves.toBe('5 of 6 rows saved');
      });
    } finally {
      await session.close();
      await killServer(server);
    }

    const stored = await api<Reading[]>(lead, 'GET', `/sheets/${drill.id}/readings?pass=1`);
    expect(stored).toHaveLength(30);
    for (const reading of stored) {
      expect(reading.rowIndex).toBeLessThan(5);
      expect(reading.rawText).toBe(want[reading.rowIndex].texts[drill.channelIds.indexOf(reading.channelId)]);
      expect(reading.frameTime!).toBeCloseTo(want[reading.rowIndex].frameTime, 4);
      // Each row was stored once: a retry of a row the server already had changes nothing.
      expect(reading.version).toBe(1);
    }
    const cells = new Set(stored.map((r) => `${r.rowIndex}/${r.channelId}`));
    expect(cells.size).toBe(30);
  }, 300_000);
});
