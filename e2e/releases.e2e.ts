import fs from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { parse } from 'csv-parse/sync';
import type { CampaignMember, Channel, DashboardRun, LoginResponse, Release, Run, Sheet, SheetRow } from '@dialsheet/common';
import { neutraliseText, toVideoTime } from '@dialsheet/common';
import { assertServerUp, baseUrl, demoPassword, launchBrowser, withFailureScreenshot, type BrowserSession } from './support/browser';

// A lead releases a fully double-entered run in a real browser and downloads its long CSV: the
// reader and the checker type the same values into the demo sheet of run 3 through the API (one
// channel negative, so a number must stay a number in the file), the lead signs a release of the
// run on the Releases page, the "CSV long" file is read back cell by cell, and a later write to
// the run is refused naming the release. Run 3 only: other browser tests write to runs 1 and 2.

const DEMO_CAMPAIGN = 'Heat-recovery core bench test';
const DEMO_RUN_PREFIX = 'Run 3';
const DEMO_SHEET = 'Every 5 s, whole run';

interface Answer {
  status: number;
  text: string;
}

async function call(token: string | null, method: string, route: string, body?: unknown): Promise<Answer> {
  const response = await fetch(`${baseUrl}/api${route}`, {
    method,
    headers: { ...(token ? { authorization: `Bearer ${token}` } : {}), ...(body !== undefined ? { 'content-type': 'application/json' } : {}) },
    body: body !== undefined ? JSON.stringify(body) : undefined,
  });
  return { status: response.status, text: await response.text() };
}

async function api<T>(token: string | null, method: string, route: string, body?: unknown): Promise<T> {
  const { status, text } = await call(token, method, route, body);
  if (status < 200 || status >= 300) throw new Error(`${method} ${route}: HTTP ${status} ${text.slice(0, 400)}`);
  return (text ? JSON.parse(text) : undefined) as T;
}

async function tokenFor(email: string): Promise<string> {
  return (await api<LoginResponse>(null, 'POST', '/auth/login', { email, password: demoPassword })).accessToken;
}

/** What a cell was typed as: channel index k, row i. The first channel reads below zero. */
function typed(k: number, i: number): string {
  return k === 0 ? (-0.5 - 0.1 * (i % 5)).toFixed(1) : (10 * (k + 1) + 0.25 * i).toFixed(2);
}

interface Context {
  campaignId: string;
  run: Run;
  sheet: Sheet;
  rows: SheetRow[];
  channels: Channel[];
  lead: string;
  reader: string;
}

/** Null when the database has no demo sheet on run 3 (its demo video was not generated). */
async function prepare(): Promise<Context | null> {
  const lead = await tokenFor('lead@demo.test');
  const campaign = (await api<Array<{ id: string; name: string }>>(lead, 'GET', '/campaigns')).find((c) => c.name === DEMO_CAMPAIGN);
  if (!campaign) throw new Error(`the seeded campaign "${DEMO_CAMPAIGN}" is missing`);
  const run = (await api<Run[]>(lead, 'GET', `/campaigns/${campaign.id}/runs`)).find((r) => r.name.startsWith(DEMO_RUN_PREFIX));
  if (!run) throw new Error('the seeded run 3 is missing');
  const sheet = (await api<Sheet[]>(lead, 'GET', `/runs/${run.id}/sheets`)).find((s) => s.name === DEMO_SHEET);
  if (!sheet || !run.sync) return null;

  // A second run on the same database: run 3 is still locked by the earlier release.
  const dashboard = await api<{ runs: DashboardRun[] }>(lead, 'GET', `/campaigns/${campaign.id}/dashboard`);
  if (dashboard.runs.find((r) => r.id === run.id)?.lockedBy) {
    await api(lead, 'POST', `/runs/${run.id}/correction`, { reason: 'Browser test: release run 3 again' });
  }

  const rows = await api<SheetRow[]>(lead, 'GET', `/sheets/${sheet.id}/rows`);
  const all = await api<Channel[]>(lead, 'GET', `/campaigns/${campaign.id}/channels`);
  const channels = sheet.channelIds.map((id) => all.find((c) => c.id === id)!);
  const reader = await tokenFor('reader@demo.test');
  const checker = await tokenFor('checker@demo.test');
  // A finished pass no longer changes; an earlier run of this test typed the same values.
  const passes: Array<[1 | 2, string, string | null]> = [
    [1, reader, sheet.pass1FinishedAt],
    [2, checker, sheet.pass2FinishedAt],
  ];
  for (const [pass, token, finishedAt] of passes) {
    if (finishedAt) continue;
    for (const row of rows) {
      const frameTime = toVideoTime(run.sync, row.testTime);
      await api(token, 'PUT', `/sheets/${sheet.id}/rows/${row.index}`, {
        pass,
        readings: channels.map((c, k) => ({ channelId: c.id, rawText: typed(k, row.index), frameTime, baseVersion: null })),
      });
    }
    await api(token, 'POST', `/sheets/${sheet.id}/passes/${pass}/finish`);
  }
  return { campaignId: campaign.id, run, sheet, rows, channels, lead, reader };
}

async function signIn(page: Page, email: string, next: string): Promise<void> {
  await page.goto(`/sign-in?next=${encodeURIComponent(next)}`);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(demoPassword);
  await page.getByRole('button', { name: 'Sign in' }).click();
}

describe('releases in the browser', () => {
  let session: BrowserSession;
  let ctx: Context | null;

  beforeAll(async () => {
    await assertServerUp();
    ctx = await prepare();
    session = await launchBrowser();
  }, 240_000);

  afterAll(async () => {
    await session?.close();
  });

  it('the lead signs a release of run 3, downloads its long CSV with the typed values and the hash, and the run is locked', async ({ skip }) => {
    if (!ctx) {
      skip(`run 3 has no "${DEMO_SHEET}" sheet: its demo video was not generated (scripts/demo/generate-videos.ts --runs 3)`);
      return;
    }
    const { page } = session;
    const { campaignId, run, sheet, rows, channels, lead, reader } = ctx;
    const dashboardRun = (await api<{ runs: DashboardRun[] }>(lead, 'GET', `/campaigns/${campaignId}/dashboard`)).runs.find((r) => r.id === run.id);
    expect(dashboardRun?.lockedBy).toBeNull();
    expect(dashboardRun?.readyToRelease).toBe(true);

    const title = `Run 3 browser release ${Date.now().toString(36)}`;
    let release: Release | undefined;
    let pageHash = '';
    let csv = '';

    await withFailureScreenshot(page, 'releases', async () => {
      await signIn(page, 'lead@demo.test', `/campaigns/${campaignId}/releases`);
      const open = page.getByRole('button', { name: 'Release', exact: true });
      await expect.poll(() => open.isEnabled()).toBe(true);
      await open.click();
      const dialog = page.getByRole('dialog');
      await dialog.getByLabel('Title').fill(title);
      await dialog.getByRole('checkbox', { name: `Include ${run.name}` }).check();
      await dialog.getByRole('button', { name: 'Sign and publish' }).click();
      await dialog.waitFor({ state: 'hidden' });

      release = (await api<Release[]>(lead, 'GET', `/campaigns/${campaignId}/releases`)).find((r) => r.title === title);
      expect(release?.status).toBe('published');
      expect(release?.runIds).toEqual([run.id]);
      expect(release?.number).toBeGreaterThan(0);
      expect(release?.contentHash).toMatch(/^[0-9a-f]{64}$/);

      const row = page.getByRole('row').filter({ hasText: title });
      await row.getByText(`Release ${release!.number}`, { exact: true }).waitFor();
      await row.getByText('published', { exact: true }).waitFor();
      const hash = row.locator('.content-hash');
      await expect.poll(() => hash.textContent()).toContain(release!.contentHash!.slice(0, 12));
      pageHash = ((await hash.getAttribute('title')) ?? '').replace(/^SHA-256 /, '');
      expect(pageHash).toBe(release!.contentHash);

      // No reload: a release signed while the page is open shows its export buttons at once.
      const downloading = page.waitForEvent('download');
      await page.getByRole('button', { name: `Export release ${release!.number} as CSV long` }).click();
      const download = await downloading;
      const file = await download.path();
      csv = fs.readFileSync(file, 'utf8');
      await page.getByText(`Saved ${download.suggestedFilename()}`).waitFor();

      // The lead's dashboard shows the run locked by the release.
      await page.goto(`${baseUrl}/campaigns/${campaignId}/dashboard`);
      await page.getByRole('row').filter({ hasText: run.name }).getByText(`release ${release!.number}`, { exact: true }).waitFor();

      // The printable report: the release's number, its full hash, and who read and who checked.
      const members = await api<CampaignMember[]>(lead, 'GET', `/campaigns/${campaignId}/members`);
      const nameOf = (email: string) => members.find((m) => m.email === email)?.name ?? email;
      await page.goto(`${baseUrl}/campaigns/${campaignId}/releases/${release!.id}/report`);
      await page.locator('.report-facts .content-hash').filter({ hasText: release!.contentHash! }).waitFor();
      const people = page.locator('[aria-label="Who read and who checked each sheet"]').getByRole('row').filter({ hasText: sheet.name });
      await people.filter({ hasText: nameOf('reader@demo.test') }).filter({ hasText: nameOf('checker@demo.test') }).waitFor();
      await page.getByRole('button', { name: /Print/ }).waitFor();
    });

    // Provenance: the "# …" lines name the release and the hash the page shows.
    const provenance = csv.split('\n').filter((line) => line.startsWith('#'));
    expect(provenance[0]).toContain(`# Release ${release!.number} of campaign "${DEMO_CAMPAIGN}"`);
    expect(provenance[0]).toContain(`content SHA-256 ${pageHash}`);

    const records = parse(csv, { comment: '#', comment_no_infix: true, columns: true, cast: true, skip_empty_lines: true }) as Array<
      Record<string, string | number>
    >;
    // One row per cell of the released run: every row of the sheet times every channel.
    expect(records).toHaveLength(rows.length * channels.length);
    const seen = new Set<string>();
    for (const record of records) {
      expect(record.run).toBe(run.name);
      expect(record.sheet).toBe(sheet.name);
      const k = channels.findIndex((c) => c.symbol === record.channel);
      expect(k).toBeGreaterThanOrEqual(0);
      const i = rows.findIndex((r) => Math.abs(r.testTime - Number(record['test time [s]'])) < 1e-6);
      expect(i).toBeGreaterThanOrEqual(0);
      seen.add(`${i}:${k}`);
      const text = typed(k, rows[i].index);
      // The value column is a bare number (a negative one too), equal to what both passes typed.
      expect(typeof record.value).toBe('number');
      expect(record.value).toBe(Number(text));
      // Text cells starting with "-" get a leading quote against formula injection (OWASP "CSV Injection").
      expect(record['raw text']).toBe(Number(text) < 0 ? neutraliseText(text) : Number(text));
      expect(record.status).toBe('agreed');
    }
    expect(seen.size).toBe(rows.length * channels.length);
    expect(records.some((r) => typeof r.value === 'number' && r.value < 0)).toBe(true);

    // The released run refuses writes, naming the release.
    const refused = await call(reader, 'PUT', `/sheets/${sheet.id}/rows/${rows[0].index}`, {
      pass: 1,
      readings: [{ channelId: channels[0].id, rawText: '1.0', frameTime: null, baseVersion: null }],
    });
    expect(refused.status).toBe(409);
    expect(refused.text).toMatch(new RegExp(`release ${release!.number}\\b`));
  });
});
