import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import type {
  Analysis,
  CampaignMember,
  Channel,
  ChannelCalibration,
  ChannelSeries,
  LoginResponse,
  Recording,
  Run,
  Sheet,
  SheetRow,
  StableValueAnalysis,
} from '@dialsheet/common';
import { toTestTime } from '@dialsheet/common';
import { stableValue } from '../common/src/analysis';
import { plusMinus } from '../frontend/src/features/analysis/utils/number-format';
import { channelSpecFor, rawPoints } from '../frontend/src/features/analysis/utils/stable-preview';
import { assertServerUp, demoPassword, launchBrowser, withFailureScreenshot, type BrowserSession } from './support/browser';
import { api } from './support/api';

// The engineer's run analysis in a real browser on the seeded demo campaign: readings of the flow
// meter's voltmeter are entered through the API (first pass for every row, a blind second pass for
// the first half, so both checked and unchecked points exist), then the engineer drags the fit
// window across the chart, and the preview and the saved result are checked against the common
// computation on the series the server sends.

const DEMO_CAMPAIGN = 'Heat-recovery core bench test';
const DEMO_RUN_PREFIX = 'Run 1';

async function tokenFor(email: string): Promise<string> {
  return (await api<LoginResponse>(null, 'POST', '/auth/login', { email, password: demoPassword })).accessToken;
}

async function readyRecording(token: string, runId: string): Promise<Recording> {
  const deadline = Date.now() + 180_000;
  for (;;) {
    const recording = await api<Recording | null>(token, 'GET', `/runs/${runId}/recording`).catch(() => null);
    if (recording?.status === 'ready') return recording;
    if (recording?.status === 'failed') throw new Error('the demo recording failed to process');
    if (Date.now() > deadline) throw new Error('the demo recording is not ready after 3 minutes');
    await new Promise((resolve) => setTimeout(resolve, 1000));
  }
}

interface Context {
  campaignId: string;
  runId: string;
  channel: Channel;
  engineer: string;
}

/** A sheet of the flow meter's display at half-second offsets (clear of the demo sheet's rows). */
async function enterReadings(): Promise<Context> {
  const lead = await tokenFor('lead@demo.test');
  const campaign = (await api<Array<{ id: string; name: string }>>(lead, 'GET', '/campaigns')).find((c) => c.name === DEMO_CAMPAIGN);
  if (!campaign) throw new Error(`the seeded campaign "${DEMO_CAMPAIGN}" is missing`);
  const run = (await api<Run[]>(lead, 'GET', `/campaigns/${campaign.id}/runs`)).find((r) => r.name.startsWith(DEMO_RUN_PREFIX));
  if (!run?.sync) throw new Error('the seeded run 1 is missing or has no sync');
  const recording = await readyRecording(lead, run.id);
  const channels = await api<Channel[]>(lead, 'GET', `/campaigns/${campaign.id}/channels`);
  const channel = channels.find((c) => c.rawUnit === 'V');
  if (!channel) throw new Error('the demo campaign has no voltmeter channel');
  const members = await api<CampaignMember[]>(lead, 'GET', `/campaigns/${campaign.id}/members`);
  const reader = members.find((m) => m.email === 'reader@demo.test')!;
  const checker = members.find((m) => m.email === 'checker@demo.test')!;
  const end = Math.floor(toTestTime(run.sync, recording.probe!.durationSec) - 1);
  const stamp = Date.now().toString(36);
  const sheet = await api<Sheet>(lead, 'POST', `/runs/${run.id}/sheets`, {
    name: `Analysis check ${stamp}`,
    startTime: 0.5,
    endTime: end + 0.5,
    interval: 1,
    channelIds: [channel.id],
  });
  await api(lead, 'PUT', `/sheets/${sheet.id}/assignment`, { readerId: reader.userId, checkerId: checker.userId });
  const rows = await api<SheetRow[]>(lead, 'GET', `/sheets/${sheet.id}/rows`);
  // A meter output settling towards 2.4 V, to three decimals as the display shows it.
  const text = (t: number) => (2.4 + 0.08 * Math.exp(-t / 12) + 0.002 * Math.sin(t * 1.3)).toFixed(3);
  const readerToken = await tokenFor('reader@demo.test');
  for (const row of rows) {
    await api(readerToken, 'PUT', `/sheets/${sheet.id}/rows/${row.index}`, { pass: 1, readings: [{ channelId: channel.id, rawText: text(row.testTime) }] });
  }
  const checkerToken = await tokenFor('checker@demo.test');
  for (const row of rows.slice(0, Math.floor(rows.length / 2))) {
    await api(checkerToken, 'PUT', `/sheets/${sheet.id}/rows/${row.index}`, { pass: 2, readings: [{ channelId: channel.id, rawText: text(row.testTime) }] });
  }
  return { campaignId: campaign.id, runId: run.id, channel, engineer: await tokenFor('engineer@demo.test') };
}

async function signIn(page: Page, email: string, next: string): Promise<void> {
  await page.goto(`/sign-in?next=${encodeURIComponent(next)}`);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(demoPassword);
  await page.getByRole('button', { name: 'Sign in' }).click();
}

async function numberIn(page: Page, label: string): Promise<number> {
  return Number(await page.getByLabel(label, { exact: true }).inputValue());
}

describe('run analysis in the browser', () => {
  let session: BrowserSession;
  let ctx: Context;

  beforeAll(async () => {
    await assertServerUp();
    ctx = await enterReadings();
    session = await launchBrowser();
  }, 240_000);

  afterAll(async () => {
    await session?.close();
  });

  it('the engineer drags the window on the chart, sees the common computation live, and saves what the server computes', async () => {
    const { page } = session;
    const series = await api<ChannelSeries>(ctx.engineer, 'GET', `/runs/${ctx.runId}/series/${ctx.channel.id}`);
    const calibration = (await api<ChannelCalibration[]>(ctx.engineer, 'GET', `/campaigns/${ctx.campaignId}/calibrations`)).find((c) => c.channelId === ctx.channel.id);
    expect(series.t.length).toBeGreaterThanOrEqual(10);
    expect(series.uncheckedCount).toBeGreaterThan(0);
    expect(series.uncheckedCount).toBeLessThan(series.t.length);
    const expectedAt = (window: { from: number; to: number }, tStar: number) =>
      stableValue(rawPoints(series), window, tStar, channelSpecFor(series, ctx.channel), calibration?.chain ?? null, {
        allowExtrapolation: false,
        includeResolution: true,
      });

    await withFailureScreenshot(page, 'analysis', async () => {
      await signIn(page, 'engineer@demo.test', `/campaigns/${ctx.campaignId}/runs/${ctx.runId}/analysis`);
      await page.getByRole('heading', { name: /^Analysis of Run 1/ }).waitFor();
      await page.getByRole('combobox', { name: 'Channel' }).click();
      await page.locator(`.ant-select-item-option[title^="${ctx.channel.symbol} ·"]`).click();
      const headline = page.getByTestId('stable-value');
      await headline.waitFor();
      const whole = expectedAt({ from: series.t[0], to: series.t[series.t.length - 1] }, series.t[series.t.length - 1]);
      await expect.poll(() => headline.textContent()).toContain(plusMinus(whole.value, whole.expandedUncertainty, whole.unit, 5));
      await page.getByText(`${series.uncheckedCount} of ${series.t.length} readings are unchecked first-pass values (drawn as hollow triangles).`).waitFor();

      // Drag across the right half of the plot: the brush sets the window.
      const canvas = page.getByTestId('trend-chart').locator('canvas').first();
      const box = (await canvas.boundingBox())!;
      const y = box.y + box.height / 2;
      await page.mouse.move(box.x + box.width * 0.5, y);
      await page.mouse.down();
      await page.mouse.move(box.x + box.width * 0.7, y, { steps: 6 });
      await page.mouse.move(box.x + box.width * 0.95, y, { steps: 6 });
      await page.mouse.up();
      await expect.poll(() => numberIn(page, 'Window from')).toBeGreaterThan(series.t[0] + 1);
      const window = { from: await numberIn(page, 'Window from'), to: await numberIn(page, 'Window to') };
      expect(window.to).toBeGreaterThan(window.from);

      await page.getByRole('button', { name: 't* = end of window' }).click();
      const tStar = await numberIn(page, 't*');
      expect(tStar).toBe(window.to);
      const dragged = expectedAt(window, tStar);
      await expect.poll(() => headline.textContent()).toContain(plusMinus(dragged.value, dragged.expandedUncertainty, dragged.unit, 5));

      await page.getByRole('button', { name: /Save as analysis/ }).click();
      const name = `V1 dragged ${Date.now().toString(36)}`;
      const nameInput = page.getByLabel('Analysis name');
      await nameInput.fill(name);
      await nameInput.press('Enter');
      const saved = page.getByTestId('saved-result');
      await saved.waitFor();

      const stored = (await api<Analysis[]>(ctx.engineer, 'GET', `/campaigns/${ctx.campaignId}/analyses?runId=${ctx.runId}&kind=stable-value`)).find(
        (a): a is StableValueAnalysis => a.name === name && a.kind === 'stable-value',
      );
      expect(stored?.status).toBe('current');
      expect(stored?.input.window).toEqual(window);
      const result = stored!.result!.stable;
      await expect.poll(() => saved.textContent()).toContain(`Server result: ${plusMinus(result.value, result.expandedUncertainty, result.unit, 5)}`);
      // The browser's preview and the server's stored result are one computation.
      expect(Math.abs(result.value - dragged.value)).toBeLessThanOrEqual(1e-9 * Math.abs(dragged.value));
      expect(Math.abs(result.expandedUncertainty - dragged.expandedUncertainty)).toBeLessThanOrEqual(1e-9 * dragged.expandedUncertainty);
      await page.getByRole('cell', { name, exact: true }).waitFor();
    });
  });
});
