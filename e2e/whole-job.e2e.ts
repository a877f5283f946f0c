import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page, Request } from 'playwright-core';
import { parse } from 'csv-parse/sync';
import ExcelJS from 'exceljs';
import {
  frameIndexAt,
  toVideoTime,
  type Analysis,
  type BalanceAnalysis,
  type CampaignMember,
  type Channel,
  type ChannelCalibration,
  type DisplayRegion,
  type Reading,
  type Recording,
  type RecordingFrames,
  type Release,
  type Run,
  type Sheet,
  type SheetMismatches,
  type SheetRow,
  type StableValueAnalysis,
} from '@dialsheet/common';
import { standardDensity } from '../common/src/units';
import { trend, type DisplayKey } from '../scripts/demo/scenario';
import { sig } from '../frontend/src/features/analysis/utils/number-format';
import { assertServerUp, demoPassword, launchBrowser, withFailureScreenshot, type BrowserSession } from './support/browser';
import { finishByKeyboard } from './support/keyboard';
import { api, generateVideo, linkIn, login, resolutionOf, truthAt, waitForMail, type GeneratedVideo } from './support/whole-job-data';

// The whole job once, on fresh data, in a real browser: a lead sets up a new campaign (channels,
// three invited people, a run with a generated video, its sync, display regions, a sheet and its
// assignment); the reader transcribes by keyboard what each frame shows; the checker enters the
// blind second pass, slips once on purpose and resolves that mismatch; the engineer calibrates
// the flow meter, saves two stable values and a mass balance, and asks for a release; the lead
// signs it and downloads CSV (long) and XLSX, whose every value is checked against the
// generator's true value. Every step goes through the UI; the API is used only to read back
// what the UI did and the frame grid the entry screen steps on (never to change anything).

/** Long enough for 8 rows at 5 s after the sync lamp at 2 s; short to make and to transcode. */
const VIDEO_SECONDS = 40;
const INTERVAL_SECONDS = 5;
const LEAD = 'lead@demo.test';

const stamp = `${Date.now().toString(36)}${Math.random().toString(36).slice(2, 6)}`;
const campaignName = `Whole job ${stamp}`;
const runName = `Warm stream run ${stamp}`;
const sheetName = `Every ${INTERVAL_SECONDS} s ${stamp}`;
const releaseTitle = `Whole job release ${stamp}`;

interface Person {
  email: string;
  name: string;
  password: string;
  role: 'Reader' | 'Checker' | 'Engineer';
}

const people: Record<'reader' | 'checker' | 'engineer', Person> = {
  reader: { email: `reader-${stamp}@e2e.test`, name: `Rita Reader ${stamp}`, password: `rd-${stamp}-long-enough`, role: 'Reader' },
  checker: { email: `checker-${stamp}@e2e.test`, name: `Chris Checker ${stamp}`, password: `ck-${stamp}-long-enough`, role: 'Checker' },
  engineer: { email: `engineer-${stamp}@e2e.test`, name: `Erin Engineer ${stamp}`, password: `en-${stamp}-long-enough`, role: 'Engineer' },
};

/** The two displays of the demo panel on the sheet, in entry order, as typed into the channel form. */
const CHANNELS: Array<{ key: DisplayKey; name: string; quantity: string; unit: string; resolution: string; rangeMin: string; rangeMax: string; fullScale?: string; percentOfReading: string; digits: string }> = [
  { key: 'T1', name: 'Warm stream inlet temperature', quantity: 'temperature', unit: '°C', resolution: '0.1', rangeMin: '-50', rangeMax: '200', percentOfReading: '0.5', digits: '3' },
  { key: 'V', name: 'Flow meter signal', quantity: 'voltage', unit: 'V', resolution: '0.001', rangeMin: '0', rangeMax: '5', fullScale: '5', percentOfReading: '0.05', digits: '2' },
];

/** The flow meter's span (0–5 V = 0–200 standard L/min, printed on the demo panel). */
const METER_GAIN_SLPM_PER_V = 200 / 5;

/** What one step hands to the next. */
interface Job {
  video?: GeneratedVideo;
  campaignId?: string;
  runId?: string;
  sheet?: Sheet;
  rows?: ExpectedRow[];
  channels?: Channel[];
  members?: CampaignMember[];
  planted?: { rowIndex: number; channel: number; trueText: string; wrongText: string; reason: string };
  stableIds?: string[];
  balanceId?: string;
}

interface ExpectedRow {
  index: number;
  testTime: number;
  frame: number;
  frameTime: number;
  /** What each display of the sheet shows on that frame, in sheet order. */
  texts: string[];
}

const job: Job = {};
let workDir = '';
let videoReady: Promise<GeneratedVideo> | undefined;
const leadToken = () => login(LEAD);

function need<T>(value: T | undefined, what: string): T {
  if (value === undefined) throw new Error(`an earlier step did not finish: ${what} is missing`);
  return value;
}

// ---------------------------------------------------------------------------------------------
// Browser helpers

/** expect.poll with room for a loaded machine: the UI has 15 s to get there (vitest's default is 1 s). */
function poll<T>(read: () => Promise<T> | T, timeout = 15_000) {
  return expect.poll(read, { timeout });
}

async function signIn(page: Page, email: string, password: string, next: string): Promise<void> {
  await page.goto(`/sign-in?next=${encodeURIComponent(next)}`);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL((url) => url.pathname === next.split('?')[0]);
}

/** Signs in with the keyboard only: the e-mail field has the focus on arrival. */
async function signInByKeyboard(page: Page, email: string, password: string, next: string): Promise<void> {
  await page.goto(`/sign-in?next=${encodeURIComponent(next)}`);
  const emailInput = page.getByLabel('E-mail');
  await emailInput.waitFor();
  await poll(() => emailInput.evaluate((el) => el === document.activeElement)).toBe(true);
  await page.keyboard.type(email);
  await page.keyboard.press('Tab');
  await page.keyboard.type(password);
  await page.keyboard.press('Enter');
  await page.waitForURL((url) => url.pathname === next);
}

/**
 * Picks an option of an antd Select by its text. A list closed a moment ago still fades out and
 * may hold the same options, so wait until no list shows, open this one, and pick from the one shown.
 */
async function choose(page: Page, combobox: string, optionText: string | RegExp): Promise<void> {
  const shown = page.locator('.ant-select-dropdown').filter({ visible: true });
  await poll(() => shown.count()).toBe(0);
  await page.getByRole('combobox', { name: combobox, exact: true }).click();
  await poll(() => shown.count()).toBe(1);
  // A single-choice list closes once an option is taken. A click that lands while the list is
  // still opening can be missed (seen on a busy machine): the list then stays open, so click again.
  for (let attempt = 1; ; attempt++) {
    await shown.locator('.ant-select-item-option').filter({ hasText: optionText }).first().click();
    const closed = await poll(() => shown.count(), 3_000)
      .toBe(0)
      .then(
        () => true,
        () => false,
      );
    if (closed) return;
    if (attempt === 3) throw new Error(`the list of "${combobox}" stayed open after choosing ${String(optionText)} three times`);
  }
}

async function shownFrame(page: Page, index: number): Promise<void> {
  await page.locator(`[data-testid="frame-index"][data-shown="true"]:text-is("${index}")`).waitFor({ timeout: 20_000 });
}

function focusedLabel(page: Page): Promise<string | null> {
  return page.evaluate(() => document.activeElement?.getAttribute('aria-label') ?? null);
}

function inputLabel(channel: Channel): string {
  return `${channel.symbol} ${channel.name} (${channel.rawUnit})`;
}

async function atRow(page: Page, row: ExpectedRow, first: Channel): Promise<void> {
  await poll(() => page.getByTestId('entry-row-title').innerText()).toMatch(new RegExp(`^Row ${row.index + 1}\\b`));
  await expect.poll(() => page.getByTestId('entry-frame-index').innerText(), { timeout: 15_000 }).toBe(String(row.frame));
  await poll(() => focusedLabel(page)).toBe(inputLabel(first));
}

async function typeRow(page: Page, texts: readonly string[]): Promise<void> {
  for (const text of texts) {
    await page.keyboard.type(text);
    await page.keyboard.press('Enter');
  }
}

/** Texts from `values` that the page shows as a number of their own (not inside a longer one). */
async function shownNumbers(page: Page, values: readonly string[]): Promise<string[]> {
  const text = await page.locator('body').innerText();
  const inputs = await page.locator('input').evaluateAll((els) => els.map((el) => (el as HTMLInputElement).value).join('\n'));
  const all = `${text}\n${inputs}`;
  return values.filter((v) => new RegExp(`(?<![\\d.])${v.replace(/[.]/g, '\\.')}(?![\\d])`).test(all));
}

/** Clicks an export button and returns where the browser saved the file. */
async function download(page: Page, button: string): Promise<string> {
  const downloading = page.waitForEvent('download', { timeout: 60_000 });
  await page.getByRole('button', { name: button, exact: true }).click();
  return (await downloading).path();
}

// ---------------------------------------------------------------------------------------------

describe('the whole job in one browser test, on fresh data', () => {
  beforeAll(async () => {
    await assertServerUp();
    workDir = fs.mkdtempSync(path.join(os.tmpdir(), 'dialsheet-whole-job-'));
    // Made while the lead sets the campaign up; awaited just before the upload.
    videoReady = generateVideo(workDir, VIDEO_SECONDS);
    videoReady.catch(() => undefined);
  });

  afterAll(() => {
    if (workDir) fs.rmSync(workDir, { recursive: true, force: true });
  });

  it('1. a lead creates the campaign, its channels and people, uploads and syncs a run, draws the regions, plans and assigns a sheet', async () => {
    let session: BrowserSession | undefined = await launchBrowser();
    const { page } = session;
    try {
      await withFailureScreenshot(page, 'whole-job-setup', async () => {
        await signIn(page, LEAD, demoPassword, '/campaigns');
        await page.getByRole('button', { name: 'New campaign' }).first().click();
        const createDialog = page.getByRole('dialog').filter({ hasText: 'New campaign' });
        await createDialog.getByLabel('Name').fill(campaignName);
        await createDialog.getByLabel('Description').fill('Heat-recovery core, warm stream: the whole job in one browser test.');
        await createDialog.getByRole('button', { name: 'Create campaign' }).click();
        await page.getByRole('heading', { name: campaignName }).waitFor();
        const campaignId = new URL(page.url()).pathname.split('/')[2];
        expect(campaignId).toMatch(/^[0-9a-f-]{36}$/);
        job.campaignId = campaignId;

        // Three fresh accounts, each invited by e-mail with one role.
        const nav = page.getByRole('navigation', { name: 'Main' });
        await nav.getByRole('link', { name: 'Members' }).click();
        await page.getByRole('heading', { name: 'Members', exact: true }).waitFor();
        for (const person of Object.values(people)) {
          await page.getByRole('button', { name: 'Invite by e-mail' }).click();
          const dialog = page.getByRole('dialog').filter({ hasText: 'Invite someone to this campaign' });
          await dialog.getByLabel('E-mail').fill(person.email);
          const readerBox = dialog.getByRole('checkbox', { name: /Reader/ });
          if (person.role !== 'Reader') {
            await readerBox.uncheck();
            await dialog.getByRole('checkbox', { name: new RegExp(person.role) }).check();
          }
          await expect(readerBox.isChecked()).resolves.toBe(person.role === 'Reader');
          await dialog.getByRole('button', { name: 'Send invitation' }).click();
          await dialog.waitFor({ state: 'detached' });
          await page.getByRole('cell', { name: person.email, exact: true }).waitFor();
        }
        // Each accepts from the link in their e-mail, in a browser of their own, as a new account.
        for (const person of Object.values(people)) {
          const mail = await waitForMail(person.email, `invited you to the campaign "${campaignName}"`);
          const invitee = await launchBrowser();
          try {
            await withFailureScreenshot(invitee.page, `whole-job-accept-${person.role.toLowerCase()}`, async () => {
              const p = invitee.page;
              await p.goto(linkIn(mail, '/invitations/accept?token='));
              await p.getByRole('heading', { name: 'You are invited to a campaign' }).waitFor();
              await p.getByText(person.role, { exact: true }).waitFor();
              await p.getByLabel('Your name').fill(person.name);
              await p.getByLabel('Choose a password').fill(person.password);
              await p.getByLabel('Repeat the password').fill(person.password);
              await p.getByRole('button', { name: 'Create account and join' }).click();
              await p.waitForURL((url) => url.pathname === `/campaigns/${campaignId}`);
              await p.getByRole('heading', { name: campaignName }).waitFor();
            });
          } finally {
            await invitee.close();
          }
        }
        await page.reload();
        for (const person of Object.values(people)) await page.getByRole('cell', { name: person.name }).first().waitFor();

        // Two displays of the demo panel: the warm inlet thermometer and the flow meter's voltmeter.
        await nav.getByRole('link', { name: 'Channels' }).click();
        await page.getByRole('heading', { name: 'Channels', exact: true }).waitFor();
        for (const c of CHANNELS) {
          await page.getByRole('button', { name: 'New channel' }).first().click();
          const dialog = page.getByRole('dialog').filter({ hasText: 'New channel' });
          await dialog.getByLabel('Name', { exact: true }).fill(c.name);
          await dialog.getByLabel('Symbol', { exact: true }).fill(c.key);
          await dialog.getByLabel('Quantity', { exact: true }).fill(c.quantity);
          await dialog.getByLabel('Unit on the display', { exact: true }).fill(c.unit);
          await dialog.getByLabel('Resolution', { exact: true }).fill(c.resolution);
          await dialog.getByLabel('Range from', { exact: true }).fill(c.rangeMin);
          await dialog.getByLabel('Range to', { exact: true }).fill(c.rangeMax);
          if (c.fullScale) await dialog.getByLabel('Full scale', { exact: true }).fill(c.fullScale);
          await dialog.getByLabel('± % of reading', { exact: true }).fill(c.percentOfReading);
          await dialog.getByLabel('+ digits', { exact: true }).fill(c.digits);
          await dialog.getByRole('button', { name: 'Add channel' }).click();
          await dialog.waitFor({ state: 'detached' });
          await page.getByRole('cell', { name: c.name }).waitFor();
        }

        // A run, and the generated video through the run page's file input.
        await nav.getByRole('link', { name: 'Runs' }).click();
        await page.getByRole('heading', { name: 'Runs', exact: true }).waitFor();
        await page.getByRole('button', { name: 'New run' }).first().click();
        const runDialog = page.getByRole('dialog').filter({ hasText: 'New run' });
        await runDialog.getByLabel('Name').fill(runName);
        await runDialog.getByLabel('Configuration').fill('flow meter on the warm stream');
        await runDialog.getByRole('button', { name: 'Create run' }).click();
        await page.getByRole('heading', { name: runName }).waitFor();
        job.runId = new URL(page.url()).pathname.split('/')[4];
        expect(job.runId).toMatch(/^[0-9a-f-]{36}$/);

        job.video = await need(videoReady, 'the video generator');
        const { truth } = job.video;
        await page.locator('.recording-dragger input[type="file"]').setInputFiles(job.video.video);
        // Processing runs in the server's worker, possibly behind other recordings in its queue.
        await page.getByRole('region', { name: 'Video' }).waitFor({ timeout: 240_000 });
        await shownFrame(page, 0);

        // The sync lamp's first lit frame is test time 0: step there with the keyboard.
        const marker = truth.startMarkerFrames[0];
        await page.getByRole('region', { name: 'Video' }).click();
        for (let i = 0; i < Math.floor(marker / truth.fps); i++) await page.keyboard.press('Shift+ArrowRight');
        for (let i = 0; i < marker % truth.fps; i++) await page.keyboard.press('ArrowRight');
        await shownFrame(page, marker);
        await page.getByRole('button', { name: 'Mark start here' }).click();
        await poll(() => page.getByTestId('sync-offset').textContent()).toBe(`${truth.startMarkerVideoTime.toFixed(3)} s`);

        // Each channel's display region: pick the channel, drag round its digits on the frame.
        const lead = await leadToken();
        const recording = await api<Recording>(lead, 'GET', `/runs/${job.runId}/recording`);
        const frameSize = recording.proxy ?? { width: recording.probe!.displayWidth, height: recording.probe!.displayHeight };
        const overlay = page.getByTestId('region-overlay');
        for (const c of CHANNELS) {
          await choose(page, 'Channel to draw', `${c.key} · ${c.name}`);
          // Picking the channel scrolled the page to the side column: bring the frame back into view.
          await overlay.scrollIntoViewIfNeeded();
          const box = (await overlay.boundingBox())!;
          // The picture is letterboxed inside the player (object-fit: contain).
          const scale = Math.min(box.width / frameSize.width, box.height / frameSize.height);
          const picture = { x: box.x + (box.width - frameSize.width * scale) / 2, y: box.y + (box.height - frameSize.height * scale) / 2, w: frameSize.width * scale, h: frameSize.height * scale };
          const region = truth.displays.find((d) => d.key === c.key)!.region;
          await page.mouse.move(picture.x + region.x * picture.w, picture.y + region.y * picture.h);
          await page.mouse.down();
          await page.mouse.move(picture.x + (region.x + region.w / 2) * picture.w, picture.y + (region.y + region.h / 2) * picture.h, { steps: 4 });
          await page.mouse.move(picture.x + (region.x + region.w) * picture.w, picture.y + (region.y + region.h) * picture.h, { steps: 4 });
          await page.mouse.up();
          await page.getByTestId(`region-${c.key}`).waitFor();
        }
        await page.getByRole('button', { name: 'Save regions' }).click();
        await page.getByRole('button', { name: 'Save regions' }).waitFor({ state: 'detached' });

        // A sheet every 5 s over the whole recording, both channels in the campaign's order.
        await page.getByRole('button', { name: 'New sheet' }).click();
        const sheetDialog = page.getByRole('dialog').filter({ hasText: 'New sheet' });
        await sheetDialog.getByLabel('Name', { exact: true }).fill(sheetName);
        // The usual intervals are button-styled radios: the label is what takes the click.
        await sheetDialog.locator('.ant-radio-button-wrapper').filter({ hasText: new RegExp(`^${INTERVAL_SECONDS} s$`) }).click();
        await poll(() => sheetDialog.getByRole('radio', { name: `${INTERVAL_SECONDS} s`, exact: true }).isChecked()).toBe(true);
        await poll(() => sheetDialog.getByTestId('sheet-plan-summary').textContent()).toBe('8 rows × 2 channels = 16 cells');
        await sheetDialog.getByRole('button', { name: 'Create sheet' }).click();
        await sheetDialog.waitFor({ state: 'detached' });

        await page.getByRole('button', { name: `Assign ${sheetName}` }).click();
        const assignDialog = page.getByRole('dialog').filter({ hasText: `Assign ${sheetName}` });
        await assignDialog.getByLabel('Reader (pass 1)').click();
        await page.locator(`.ant-select-item-option[title="${people.reader.name} · ${people.reader.email}"]`).click();
        await assignDialog.getByLabel('Checker (pass 2, blind)').click();
        await page.locator(`.ant-select-item-option[title="${people.checker.name} · ${people.checker.email}"]`).click();
        await assignDialog.getByRole('button', { name: 'Save assignment' }).click();
        await assignDialog.waitFor({ state: 'detached' });
        await page.getByRole('row').filter({ hasText: sheetName }).filter({ hasText: people.reader.name }).filter({ hasText: people.checker.name }).waitFor();
      });
    } finally {
      await session?.close();
      session = undefined;
    }

    // What the server now holds is what the lead did in the browser.
    const lead = await leadToken();
    const campaignId = need(job.campaignId, 'the campaign');
    const runId = need(job.runId, 'the run');
    const { truth } = need(job.video, 'the video');
    const members = await api<CampaignMember[]>(lead, 'GET', `/campaigns/${campaignId}/members`);
    for (const person of Object.values(people)) {
      expect(members.find((m) => m.email === person.email)?.roles).toEqual([person.role.toLowerCase()]);
    }
    const channels = await api<Channel[]>(lead, 'GET', `/campaigns/${campaignId}/channels`);
    expect(channels.map((c) => [c.symbol, c.resolution, c.rawUnit])).toEqual(CHANNELS.map((c) => [c.key, Number(c.resolution), c.unit]));
    const run = await api<Run>(lead, 'GET', `/runs/${runId}`);
    const recording = await api<Recording>(lead, 'GET', `/runs/${runId}/recording`);
    expect(recording.status).toBe('ready');
    expect(recording.sha256).toBe(JSON.parse(fs.readFileSync(path.join(workDir, 'run-1.truth.json'), 'utf8')).video.sha256);
    const frames = await api<RecordingFrames>(lead, 'GET', `/recordings/${recording.id}/frames`);
    // The playback copy keeps the generator's frame grid, so the truth applies frame for frame.
    expect(frames.times.length).toBe(truth.frameCount);
    expect(run.sync?.first.testTime).toBe(0);
    expect(run.sync!.first.videoTime).toBeCloseTo(truth.startMarkerVideoTime, 6);

    const regions = await api<DisplayRegion[]>(lead, 'GET', `/runs/${runId}/display-regions`);
    expect(regions).toHaveLength(CHANNELS.length);
    for (const r of regions) {
      const key = channels.find((c) => c.id === r.channelId)!.symbol as DisplayKey;
      const want = truth.displays.find((d) => d.key === key)!.region;
      // Within half a percent of the frame: the mouse lands on whole CSS pixels of a scaled-down picture.
      for (const [got, exp] of [[r.x, want.x], [r.y, want.y], [r.width, want.w], [r.height, want.h]]) expect(Math.abs(got - exp)).toBeLessThan(0.005);
    }

    const sheets = await api<Sheet[]>(lead, 'GET', `/runs/${runId}/sheets`);
    const sheet = sheets.find((s) => s.name === sheetName);
    expect(sheet).toBeDefined();
    expect(sheet!.interval).toBe(INTERVAL_SECONDS);
    expect(sheet!.channelIds).toEqual(channels.map((c) => c.id));
    expect(sheet!.readerId).toBe(members.find((m) => m.email === people.reader.email)!.userId);
    expect(sheet!.checkerId).toBe(members.find((m) => m.email === people.checker.email)!.userId);
    const rows = await api<SheetRow[]>(lead, 'GET', `/sheets/${sheet!.id}/rows`);
    expect(rows.map((r) => r.testTime)).toEqual([0, 5, 10, 15, 20, 25, 30, 35]);

    job.sheet = sheet;
    job.channels = channels;
    job.members = members;
    job.rows = rows.map((row) => {
      const frame = frameIndexAt(frames.times, toVideoTime(run.sync!, row.testTime));
      const frameTime = frames.times[frame];
      return { index: row.index, testTime: row.testTime, frame, frameTime, texts: channels.map((c) => truthAt(truth, c.symbol as DisplayKey, frameTime).text) };
    });
  }, 420_000);

  it('2. the reader transcribes the whole sheet with the keyboard alone, typing what each frame shows', async () => {
    const campaignId = need(job.campaignId, 'the campaign');
    const sheet = need(job.sheet, 'the sheet');
    const rows = need(job.rows, 'the rows');
    const channels = need(job.channels, 'the channels');
    const mail = await waitForMail(people.reader.email, `Sheet "${sheetName}" is yours to read`);
    const sheetPath = linkIn(mail, `/sheets/${sheet.id}`);
    expect(sheetPath).toBe(`/campaigns/${campaignId}/sheets/${sheet.id}`);

    const session = await launchBrowser();
    const { page } = session;
    try {
      await withFailureScreenshot(page, 'whole-job-reader', async () => {
        await signInByKeyboard(page, people.reader.email, people.reader.password, sheetPath);
        await page.getByRole('link', { name: 'Enter pass 1' }).click();
        await page.getByTestId('entry-screen').waitFor({ timeout: 30_000 });
        await expect(page.getByTestId('entry-progress').innerText()).resolves.toBe(`0 of ${rows.length} rows saved`);
        for (const row of rows) {
          await atRow(page, row, channels[0]);
          await typeRow(page, row.texts);
        }
        await finishByKeyboard(page, 1);
      });
    } finally {
      await session.close();
    }

    const lead = await leadToken();
    const stored = await api<Reading[]>(lead, 'GET', `/sheets/${sheet.id}/readings?pass=1`);
    expect(stored).toHaveLength(rows.length * channels.length);
    for (const reading of stored) {
      const row = rows[reading.rowIndex];
      expect(reading.rawText).toBe(row.texts[sheet.channelIds.indexOf(reading.channelId)]);
      expect(reading.frameTime!).toBeCloseTo(row.frameTime, 4);
    }
    expect((await api<Sheet>(lead, 'GET', `/sheets/${sheet.id}`)).pass1FinishedAt).not.toBeNull();
  }, 240_000);

  it('3. the checker enters pass 2 blind, slips once on purpose and resolves that mismatch from the list', async () => {
    const campaignId = need(job.campaignId, 'the campaign');
    const sheet = need(job.sheet, 'the sheet');
    const rows = need(job.rows, 'the rows');
    const channels = need(job.channels, 'the channels');
    const pass1Texts = [...new Set(rows.flatMap((r) => r.texts))];
    // One tenth of a degree off on T1 in row 4: the kind of slip a second pass exists to catch.
    const trueText = rows[3].texts[0];
    const planted = { rowIndex: 3, channel: 0, trueText, wrongText: (Number(trueText) + 0.1).toFixed(1), reason: `T1 shows ${trueText} °C on the frame; pass 2 was a typing slip.` };
    job.planted = planted;
    const mail = await waitForMail(people.checker.email, `Sheet "${sheetName}" is yours to check`);
    const sheetPath = linkIn(mail, `/sheets/${sheet.id}`);

    const session = await launchBrowser();
    const { page } = session;
    const requests: string[] = [];
    const listen = (request: Request) => requests.push(request.url());
    try {
      await withFailureScreenshot(page, 'whole-job-checker', async () => {
        page.on('request', listen);
        await signIn(page, people.checker.email, people.checker.password, sheetPath);
        await page.getByRole('link', { name: 'Enter pass 2' }).waitFor();
        // The table is drawn once the sheet's entries have arrived: only then is "nothing shown" a finding.
        await page.locator('.sheet-table-wrap').waitFor();
        // Blind: neither the sheet page nor the entry screen shows a single pass-1 value.
        await expect(shownNumbers(page, pass1Texts)).resolves.toEqual([]);
        await page.getByRole('link', { name: 'Enter pass 2' }).click();
        await page.getByTestId('entry-screen').waitFor({ timeout: 30_000 });
        await page.getByText('Pass 2 (blind)').waitFor();
        await atRow(page, rows[0], channels[0]);
        await expect(shownNumbers(page, pass1Texts)).resolves.toEqual([]);

        for (const row of rows) {
          await atRow(page, row, channels[0]);
          const texts = row.texts.slice();
          if (row.index === planted.rowIndex) texts[planted.channel] = planted.wrongText;
          await typeRow(page, texts);
        }
        await finishByKeyboard(page, 2);
        page.off('request', listen);
        const apiCalls = requests.filter((url) => new URL(url).pathname.startsWith('/api/'));
        expect(apiCalls.filter((url) => /\/readings\?pass=1\b/.test(url))).toEqual([]);
        expect(apiCalls.filter((url) => /\/mismatches\b/.test(url))).toEqual([]);

        // The mismatch list holds exactly the slip; j selects it, Enter opens it against its frame.
        await page.goto(`/campaigns/${campaignId}/sheets/${sheet.id}?tab=mismatches`);
        await page.locator('.mismatch-table').waitFor();
        const listed = page.locator('.mismatch-table tbody tr[data-row-key]');
        await poll(() => listed.count()).toBe(1);
        const line = await listed.first().innerText();
        expect(line).toContain(channels[planted.channel].symbol);
        expect(line).toContain(planted.trueText);
        expect(line).toContain(planted.wrongText);
        await page.keyboard.press('j');
        await page.keyboard.press('Enter');
        const drawer = page.locator('.resolution-drawer');
        await drawer.waitFor();
        await expect(drawer.innerText()).resolves.toContain(`Row ${planted.rowIndex + 1}`);
        await drawer.getByLabel('Resolved value').fill(planted.trueText);
        await drawer.getByLabel('Reason').fill(planted.reason);
        await page.keyboard.press('Control+Enter');
        await drawer.getByText(/Resolution saved \(version 1\)/).waitFor();
      });
    } finally {
      page.off('request', listen);
      await session.close();
    }

    const lead = await leadToken();
    const mismatches = await api<SheetMismatches>(lead, 'GET', `/sheets/${sheet.id}/mismatches`);
    expect(mismatches.complete).toBe(true);
    expect(mismatches.cells).toHaveLength(1);
    expect(mismatches.cells[0].rowIndex).toBe(planted.rowIndex);
    expect(mismatches.cells[0].pass2.rawText).toBe(planted.wrongText);
    expect(mismatches.cells[0].resolution?.rawText).toBe(planted.trueText);
    expect(mismatches.cells[0].resolution?.reason).toBe(planted.reason);
    expect(mismatches.open).toBe(0);
  }, 240_000);

  it('4. the engineer calibrates the flow meter, saves two stable values and a mass balance, and asks for a release', async () => {
    const campaignId = need(job.campaignId, 'the campaign');
    const runId = need(job.runId, 'the run');
    const channels = need(job.channels, 'the channels');
    const meter = channels.find((c) => c.symbol === 'V')!;
    const rho0 = standardDensity('0C');
    const windows = [
      { name: `V steady early ${stamp}`, from: 15, to: 25 },
      { name: `V steady late ${stamp}`, from: 25, to: 35 },
    ];
    const balanceName = `Warm stream mass ${stamp}`;

    const session = await launchBrowser();
    const { page } = session;
    try {
      await withFailureScreenshot(page, 'whole-job-engineer', async () => {
        // The meter's chain: 0–5 V = 0–200 standard L/min, then standard L/min → g/min at 0 °C, 101.325 kPa.
        await signIn(page, people.engineer.email, people.engineer.password, `/campaigns/${campaignId}/analysis`);
        await page.getByRole('button', { name: 'Edit calibration of V' }).click();
        const dialog = page.getByRole('dialog').filter({ hasText: 'Calibration of V' });
        await dialog.getByRole('button', { name: 'Add step' }).click();
        await dialog.getByRole('combobox', { name: 'Step 1 output unit' }).fill('SLPM');
        await page.keyboard.press('Tab');
        await dialog.getByLabel('Step 1 gain a', { exact: true }).fill(String(METER_GAIN_SLPM_PER_V));
        await dialog.getByRole('button', { name: 'Add step' }).click();
        await choose(page, 'Step 2 kind', 'Standard flow → mass flow');
        await choose(page, 'Step 2 standard conditions', '0 °C, 101.325 kPa');
        // Preview at full scale: 5 V → 200 standard L/min × ρ(0 °C, 101.325 kPa) (ideal gas, dry air).
        await poll(() => dialog.getByTestId('calibration-preview').textContent()).toBe(`5 V → ${sig(5 * METER_GAIN_SLPM_PER_V * rho0, 5)} g/min`);
        await dialog.getByRole('button', { name: 'Save calibration' }).click();
        await dialog.waitFor({ state: 'detached' });
        await page.getByRole('row').filter({ hasText: 'linear V → SLPM · standard-to-mass SLPM → g/min' }).waitFor();

        // The run's analysis: a linear fit over each window, the value at its end saved.
        await page.goto(`/campaigns/${campaignId}/runs/${runId}/analysis`);
        await page.getByRole('heading', { name: new RegExp(`^Analysis of ${runName}`) }).waitFor();
        await choose(page, 'Channel', `V · ${meter.name}`);
        const headline = page.getByTestId('stable-value');
        await headline.waitFor();
        for (const w of windows) {
          await page.getByLabel('Window from', { exact: true }).fill(String(w.from));
          await page.getByLabel('Window to', { exact: true }).fill(String(w.to));
          await page.getByRole('button', { name: 't* = end of window' }).click();
          await poll(() => page.getByLabel('t*', { exact: true }).inputValue()).toBe(String(w.to));
          await page.getByTestId('fit-slope').waitFor();
          await poll(() => headline.textContent()).toMatch(/g\/min/);
          await page.getByRole('button', { name: /Save as analysis/ }).click();
          const name = page.getByLabel('Analysis name');
          await name.fill(w.name);
          await name.press('Enter');
          await name.waitFor({ state: 'detached' });
          await page.getByRole('cell', { name: w.name, exact: true }).waitFor();
        }

        // The warm stream's mass balance: the same duct early and late in the steady part of the run.
        await page.goto(`/campaigns/${campaignId}/balance`);
        await page.getByRole('heading', { name: 'Balances', exact: true }).waitFor();
        await page.getByLabel('Stream 1 label').fill('Warm stream, early');
        await page.getByLabel('Stream 2 label').fill('Warm stream, late');
        await choose(page, 'Stream 1 mass flow', windows[0].name);
        await choose(page, 'Stream 2 mass flow', windows[1].name);
        await page.getByText('Closure (live)').waitFor();
        await page.getByRole('button', { name: 'Save balance' }).click();
        const balance = page.getByLabel('Balance name');
        await balance.fill(balanceName);
        await balance.press('Enter');
        await balance.waitFor({ state: 'detached' });
        await page.getByRole('cell', { name: balanceName, exact: true }).waitFor();

        // The engineer asks for the release; the lead signs.
        await page.goto(`/campaigns/${campaignId}/releases`);
        const request = page.getByRole('button', { name: 'Request release', exact: true });
        await poll(() => request.isEnabled()).toBe(true);
        await request.click();
        const releaseDialog = page.getByRole('dialog');
        await releaseDialog.getByLabel('Title').fill(releaseTitle);
        await releaseDialog.getByRole('checkbox', { name: `Include ${runName}` }).check();
        await releaseDialog.getByRole('button', { name: 'Send request' }).click();
        await releaseDialog.waitFor({ state: 'hidden' });
        await page.getByRole('row').filter({ hasText: releaseTitle }).waitFor();
      });
    } finally {
      await session.close();
    }

    const engineer = await login(people.engineer.email, people.engineer.password);
    const calibration = (await api<ChannelCalibration[]>(engineer, 'GET', `/campaigns/${campaignId}/calibrations`)).find((c) => c.channelId === meter.id);
    expect(calibration?.engineeringUnit).toBe('g/min');
    const analyses = await api<Analysis[]>(engineer, 'GET', `/campaigns/${campaignId}/analyses?runId=${runId}`);
    const { truth } = need(job.video, 'the video');
    const stable = windows.map((w) => analyses.find((a): a is StableValueAnalysis => a.kind === 'stable-value' && a.name === w.name));
    for (const [i, a] of stable.entries()) {
      expect(a?.status).toBe('current');
      expect(a!.input.window).toEqual({ from: windows[i].from, to: windows[i].to });
      const result = a!.result!.stable;
      expect(result.unit).toBe('g/min');
      // The generator's noise-free flow at t*, through the meter's span and ρ at 0 °C, lies within
      // the stated expanded uncertainty (k = 2, GUM JCGM 100:2008 §6): the reading chain adds no bias.
      const trueFlow = trend('V', result.tStar, truth.durationSec, truth.meterStream) * METER_GAIN_SLPM_PER_V * rho0;
      expect(Math.abs(result.value - trueFlow)).toBeLessThanOrEqual(result.expandedUncertainty);
    }
    job.stableIds = stable.map((a) => a!.id);
    const balances = await api<Analysis[]>(engineer, 'GET', `/campaigns/${campaignId}/analyses`);
    const balance = balances.find((a): a is BalanceAnalysis => a.kind === 'balance' && a.name === balanceName);
    expect(balance?.status).toBe('current');
    const mass = balance!.result!.mass;
    // R = Σout/Σin, closure (R − 1)·100 (the balance's definition), from the two stored stable values in kg/s.
    const [early, late] = stable.map((a) => a!.result!.stable.value / 60_000);
    expect(mass.sumIn).toBeCloseTo(early, 12);
    expect(mass.sumOut).toBeCloseTo(late, 12);
    expect(mass.closurePercent).toBeCloseTo((late / early - 1) * 100, 9);
    // One duct, one steady flow: the closure is within its uncertainty.
    expect(mass.pass).toBe(true);
    job.balanceId = balance!.id;
  }, 240_000);

  it('5. the lead signs the release and downloads CSV (long) and XLSX whose every value is the true one within the display resolution', async () => {
    const campaignId = need(job.campaignId, 'the campaign');
    const sheet = need(job.sheet, 'the sheet');
    const rows = need(job.rows, 'the rows');
    const channels = need(job.channels, 'the channels');
    const { truth } = need(job.video, 'the video');
    const xlsxFile = path.join(workDir, 'release.xlsx');
    let csvText = '';
    let release: Release | undefined;

    const session = await launchBrowser();
    const { page } = session;
    try {
      await withFailureScreenshot(page, 'whole-job-release', async () => {
        await signIn(page, LEAD, demoPassword, `/campaigns/${campaignId}/releases`);
        await page.getByRole('button', { name: `Sign ${releaseTitle}` }).click();
        const dialog = page.getByRole('dialog').filter({ hasText: releaseTitle });
        await dialog.getByRole('button', { name: 'Sign and publish' }).click();
        await dialog.waitFor({ state: 'hidden' });
        const lead = await leadToken();
        release = (await api<Release[]>(lead, 'GET', `/campaigns/${campaignId}/releases`)).find((r) => r.title === releaseTitle);
        expect(release?.status).toBe('published');
        await page.getByRole('row').filter({ hasText: releaseTitle }).getByText('published', { exact: true }).waitFor();
        // The downloads live in the browser's profile, which goes with the browser: keep them now.
        csvText = fs.readFileSync(await download(page, `Export release ${release!.number} as CSV long`), 'utf8');
        fs.copyFileSync(await download(page, `Export release ${release!.number} as XLSX`), xlsxFile);
      });
    } finally {
      await session.close();
    }
    expect(release?.runIds).toEqual([need(job.runId, 'the run')]);
    expect(csvText).toContain(`content SHA-256 ${release!.contentHash}`);

    const csvRecords = parse(csvText, { comment: '#', comment_no_infix: true, columns: true, cast: true, skip_empty_lines: true }) as Array<Record<string, unknown>>;
    const workbook = new ExcelJS.Workbook();
    await workbook.xlsx.readFile(xlsxFile);
    const readings = workbook.getWorksheet('readings');
    expect(readings).toBeDefined();
    const header = (readings!.getRow(1).values as unknown[]).slice(1).map(String);
    const xlsxRecords: Array<Record<string, unknown>> = [];
    readings!.eachRow((row, n) => {
      if (n === 1) return;
      const values = (row.values as unknown[]).slice(1);
      xlsxRecords.push(Object.fromEntries(header.map((h, i) => [h, values[i] ?? null])));
    });

    const rho0 = standardDensity('0C');
    for (const [format, records] of [['CSV long', csvRecords], ['XLSX', xlsxRecords]] as const) {
      // One record per cell of the sheet, each channel at each row.
      expect(records, format).toHaveLength(rows.length * channels.length);
      const seen = new Set<string>();
      for (const record of records) {
        expect(record.sheet).toBe(sheet.name);
        expect(record.status).toBe(record.channel === 'T1' && Number(record['test time [s]']) === rows[3].testTime ? 'resolved' : 'agreed');
        const key = record.channel as DisplayKey;
        const row = rows.find((r) => Math.abs(r.testTime - Number(record['test time [s]'])) < 1e-6);
        expect(row, `${format} row at ${String(record['test time [s]'])} s`).toBeDefined();
        seen.add(`${row!.index}:${key}`);
        // The frame the value was read on is the row's frame; the truth is what that frame shows.
        expect(Number(record['frame pts [s]'])).toBeCloseTo(row!.frameTime, 4);
        const truthHere = truthAt(truth, key, Number(record['frame pts [s]']));
        expect(typeof record.value, `${format} ${key} at ${row!.testTime} s is a number`).toBe('number');
        // A display rounds the true value to its nearest step, so a correct reading lies within half
        // a step of it (common practice: the quantisation error of a digital display is ±½ of the
        // last digit). A misread digit or a slip of a whole step would fail.
        const halfStep = resolutionOf(truth, key) / 2;
        expect(Math.abs((record.value as number) - truthHere.value), `${format} ${key} at ${row!.testTime} s`).toBeLessThanOrEqual(halfStep + 1e-9);
        if (key === 'V') {
          // Engineering value through the engineer's chain: the same half step, scaled by the chain's gain.
          expect(record['engineering unit']).toBe('g/min');
          const gain = METER_GAIN_SLPM_PER_V * rho0;
          expect(Math.abs((record['engineering value'] as number) - truthHere.value * gain)).toBeLessThanOrEqual(halfStep * gain + 1e-9);
        } else {
          expect(record['engineering value']).toBe(record.value);
        }
      }
      expect(seen.size, format).toBe(rows.length * channels.length);
    }
    // The signed analyses travel with the data.
    const balances = workbook.worksheets.find((w) => /balance/i.test(w.name));
    expect(balances, 'the XLSX has a balance sheet').toBeDefined();
    let balanceRows = 0;
    balances!.eachRow((row) => {
      if ((row.values as unknown[]).includes(`Warm stream mass ${stamp}`)) balanceRows += 1;
    });
    expect(balanceRows).toBe(1);
  }, 240_000);
});
