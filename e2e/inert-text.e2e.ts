import { execFile } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import type { Channel, LoginResponse, Recording, Release, Run, Sheet } from '@dialsheet/common';
import { assertServerUp, baseUrl, demoPassword, launchBrowser, withFailureScreenshot, type BrowserSession } from './support/browser';
import { api } from './support/api';

// Issue 7, bad input: names and notes that look like markup or script are shown as the literal
// text a person typed, never as HTML. The lead creates, through the API, a campaign, a run, a
// channel, a sheet and a release whose every text field is markup (each tag carries an id, so its
// presence in the DOM can be looked for), then opens each page that shows them. On every page the
// markup must be readable as text, no element from it may exist in the DOM, and no dialog may
// open (an alert from an onerror/onload handler would be the proof of injection).

const run = promisify(execFile);
const STAMP = Date.now().toString(36);

/** Each field's text; the id inside names the element that must never appear in the page. */
const TEXT = {
  campaignName: `<img id="inert-campaign" src=x onerror=alert(1)> Campaign ${STAMP}`,
  campaignDescription: `<script id="inert-script">alert(2)</script> description ${STAMP}`,
  runName: `<svg id="inert-svg" onload=alert(3)></svg> Run ${STAMP}`,
  runNotes: `<b id="inert-bold">bold</b><iframe id="inert-iframe" src="javascript:alert(4)"></iframe> notes`,
  runConfiguration: `"><img id="inert-config" src=x onerror=alert(5)> configuration`,
  channelName: `<img id="inert-channel" src=x onerror=alert(6)> Gauge`,
  sheetName: `<a id="inert-link" href="javascript:alert(7)">Sheet ${STAMP}</a>`,
  releaseTitle: `<img id="inert-release" src=x onerror=alert(8)> Release ${STAMP}`,
  releaseNote: `<style id="inert-style">body{display:none}</style><marquee id="inert-marquee">note</marquee>`,
};
const IDS = ['inert-campaign', 'inert-script', 'inert-svg', 'inert-bold', 'inert-iframe', 'inert-config', 'inert-channel', 'inert-link', 'inert-release', 'inert-style', 'inert-marquee'];

/** A 3 s test pattern; the comment makes the bytes new each time (the same file twice is refused). */
async function makeVideo(dir: string): Promise<string> {
  const file = path.join(dir, `inert-${STAMP}.mp4`);
  await run('ffmpeg', [
    '-hide_banner', '-loglevel', 'error', '-y',
    '-f', 'lavfi', '-i', 'testsrc2=s=320x240:r=10:d=3',
    '-c:v', 'libx264', '-preset', 'ultrafast', '-pix_fmt', 'yuv420p',
    '-metadata', `comment=dialsheet inert text ${STAMP}`,
    file,
  ]);
  return file;
}

interface World {
  campaignId: string;
  run: Run;
  sheet: Sheet;
  release: Release;
}

async function prepare(): Promise<World> {
  const lead = (await api<LoginResponse>(null, 'POST', '/auth/login', { email: 'lead@demo.test', password: demoPassword })).accessToken;
  const campaign = await api<{ id: string }>(lead, 'POST', '/campaigns', { name: TEXT.campaignName, description: TEXT.campaignDescription });
  const created = await api<Run>(lead, 'POST', `/campaigns/${campaign.id}/runs`, { name: TEXT.runName, notes: TEXT.runNotes, configuration: TEXT.runConfiguration });
  const channel = await api<Channel>(lead, 'POST', `/campaigns/${campaign.id}/channels`, {
    name: TEXT.channelName,
    symbol: 'P1',
    quantity: 'pressure',
    rawUnit: 'kPa',
    resolution: 0.1,
    rangeMin: 0,
    rangeMax: 100,
  });

  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'dialsheet-inert-'));
  const file = await makeVideo(dir);
  const form = new FormData();
  form.append('file', new Blob([fs.readFileSync(file)], { type: 'video/mp4' }), path.basename(file));
  const uploaded = await fetch(`${baseUrl}/api/runs/${created.id}/recording`, { method: 'POST', headers: { authorization: `Bearer ${lead}` }, body: form });
  if (!uploaded.ok) throw new Error(`upload: HTTP ${uploaded.status} ${await uploaded.text()}`);
  fs.rmSync(dir, { recursive: true, force: true });
  // The queue may still be processing the seeded demo videos (about a minute each on two cores).
  const deadline = Date.now() + 280_000;
  for (;;) {
    const recording = await api<Recording>(lead, 'GET', `/runs/${created.id}/recording`);
    if (recording.status === 'ready') break;
    if (recording.status === 'failed' || Date.now() > deadline) throw new Error(`recording not ready: ${JSON.stringify(recording)}`);
    await new Promise((r) => setTimeout(r, 300));
  }
  const synced = await api<Run>(lead, 'PUT', `/runs/${created.id}/sync`, { first: { videoTime: 0, testTime: 0 } });
  const sheet = await api<Sheet>(lead, 'POST', `/runs/${created.id}/sheets`, { name: TEXT.sheetName, startTime: 0, endTime: 2, interval: 1, channelIds: [channel.id] });
  const release = await api<Release>(lead, 'POST', `/campaigns/${campaign.id}/releases`, { title: TEXT.releaseTitle, note: TEXT.releaseNote, runIds: [created.id] });
  return { campaignId: campaign.id, run: synced, sheet, release };
}

async function signIn(page: Page): Promise<void> {
  await page.goto('/sign-in');
  await page.getByLabel('E-mail').fill('lead@demo.test');
  await page.getByLabel('Password').fill(demoPassword);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.getByRole('heading', { name: 'Campaigns', exact: true }).waitFor();
}

/** Elements the markup would have made, by id, plus any <img src="x"> it would have added. */
async function injectedElements(page: Page): Promise<string[]> {
  return page.evaluate((ids) => {
    const found = ids.filter((id) => document.getElementById(id));
    if (document.querySelector('img[src="x"]')) found.push('img[src=x]');
    if (document.querySelector('a[href^="javascript:"], iframe[src^="javascript:"]')) found.push('javascript: link');
    return found;
  }, IDS);
}

describe('markup in names and notes is shown as text', () => {
  let session: BrowserSession;
  let world: World;
  const dialogs: string[] = [];

  beforeAll(async () => {
    await assertServerUp();
    world = await prepare();
    session = await launchBrowser();
    session.page.on('dialog', (dialog) => {
      dialogs.push(`${dialog.type()}: ${dialog.message()}`);
      void dialog.dismiss();
    });
  }, 330_000);

  afterAll(async () => {
    await session?.close();
  });

  it('every page that shows the data shows the markup literally, builds nothing from it and opens no dialog', async () => {
    const { page } = session;
    const { campaignId, run, sheet, release } = world;
    const visits: Array<{ name: string; path: string; texts: string[] }> = [
      { name: 'campaign list', path: '/campaigns', texts: [TEXT.campaignName, TEXT.campaignDescription] },
      { name: 'campaign page', path: `/campaigns/${campaignId}`, texts: [TEXT.campaignName] },
      { name: 'runs', path: `/campaigns/${campaignId}/runs`, texts: [TEXT.runName] },
      { name: 'run page', path: `/campaigns/${campaignId}/runs/${run.id}`, texts: [TEXT.runName, TEXT.runNotes, TEXT.runConfiguration] },
      { name: 'channels', path: `/campaigns/${campaignId}/channels`, texts: [TEXT.channelName] },
      { name: 'sheet page', path: `/campaigns/${campaignId}/sheets/${sheet.id}`, texts: [TEXT.sheetName] },
      { name: 'releases', path: `/campaigns/${campaignId}/releases`, texts: [TEXT.releaseTitle, TEXT.releaseNote] },
      { name: 'release report', path: `/campaigns/${campaignId}/releases/${release.id}/report`, texts: [TEXT.releaseTitle, TEXT.releaseNote] },
      { name: 'dashboard', path: `/campaigns/${campaignId}/dashboard`, texts: [TEXT.runName] },
      { name: 'audit trail', path: `/campaigns/${campaignId}/audit`, texts: [] },
    ];
    await withFailureScreenshot(page, 'inert-text', async () => {
      await signIn(page);
      for (const visit of visits) {
        await page.goto(visit.path);
        for (const text of visit.texts) {
          // innerText is what a person sees: the markup as characters, not as elements.
          await expect
            .poll(() => page.evaluate(() => document.body.innerText), { timeout: 15_000, message: `${visit.name} shows ${text}` })
            .toContain(text);
        }
        if (visit.texts.length === 0) await page.waitForLoadState('networkidle');
        expect(await injectedElements(page), visit.name).toEqual([]);
        expect(dialogs, visit.name).toEqual([]);
      }
      // Style from the release note must not have hidden the page.
      expect(await page.evaluate(() => getComputedStyle(document.body).display)).not.toBe('none');
      expect(dialogs).toEqual([]);
    });
  }, 180_000);
});
