// Set-up the reading benchmarks share, done through the API as a lead would: the demo campaign's
// six panel channels (with their regions in the frame), a run with a processed recording and its
// time sync, and sheets assigned to the demo reader and checker.
import type { CampaignMember, Channel, CreateSheetRequest, Recording, Run, Sheet } from '@dialsheet/common';
import { displayRegions, type FrameRegion } from '../../scripts/demo/panel';
import { secondsSince, sleep, type Stack } from './harness';
import type { ApiClient } from './http-client';

/** The demo panel's displays in panel order (scripts/demo/scenario.ts, DISPLAYS). */
export const PANEL_SYMBOLS = ['T1', 'T2', 'T3', 'T4', 'V', 'P'] as const;

/** The six channels the demo seed gives the campaign, in panel order. */
export async function panelChannels(stack: Stack): Promise<Channel[]> {
  const all = await stack.api.json<Channel[]>('GET', `/api/campaigns/${stack.campaignId}/channels`);
  return PANEL_SYMBOLS.map((symbol) => {
    const channel = all.find((c) => c.symbol === symbol);
    if (!channel) throw new Error(`the demo campaign has no channel ${symbol}; the demo seed should have made it`);
    return channel;
  });
}

/** Draws each channel's region on the run, where the generated panel has its digit window. */
export async function setPanelRegions(stack: Stack, runId: string, channels: Channel[]): Promise<void> {
  const windows = new Map<string, FrameRegion>(displayRegions().map((d) => [d.key, d.region]));
  const regions = channels.map((channel) => {
    const box = windows.get(channel.symbol);
    if (!box) throw new Error(`the demo panel has no display ${channel.symbol}`);
    return { channelId: channel.id, x: box.x, y: box.y, width: box.w, height: box.h };
  });
  await stack.api.json('PUT', `/api/runs/${runId}/display-regions`, { regions });
}

/** Polls the run's recording until it is processed; fails on 'failed' or after `timeoutMs`. */
export async function waitUntilReady(api: ApiClient, runId: string, timeoutMs = 5 * 60_000): Promise<Recording> {
  const started = process.hrtime.bigint();
  for (;;) {
    const recording = await api.json<Recording>('GET', `/api/runs/${runId}/recording`);
    if (recording.status === 'failed') throw new Error(`processing the recording failed: ${recording.failureReason}`);
    if (recording.status === 'ready') return recording;
    if (secondsSince(started) * 1000 > timeoutMs) throw new Error(`the recording is still "${recording.status}" after ${Math.round(secondsSince(started))} s`);
    await sleep(200);
  }
}

/**
 * A run with `video` uploaded and processed (the app must run with WORKER=on) and its sync set:
 * `syncVideoTime` of video is test time 0.
 */
export async function runWithRecording(
  stack: Stack,
  name: string,
  video: string,
  syncVideoTime: number,
): Promise<{ run: Run; recording: Recording; seconds: number }> {
  const started = process.hrtime.bigint();
  const created = await stack.api.json<Run>('POST', `/api/campaigns/${stack.campaignId}/runs`, { name });
  const upload = await stack.api.upload(`/api/runs/${created.id}/recording`, video);
  if (upload.status !== 201) throw new Error(`upload answered HTTP ${upload.status}: ${upload.body.slice(0, 300)}`);
  const recording = await waitUntilReady(stack.api, created.id);
  const run = await stack.api.json<Run>('PUT', `/api/runs/${created.id}/sync`, {
    first: { videoTime: syncVideoTime, testTime: 0 },
    reason: 'Benchmark set-up',
  });
  return { run, recording, seconds: secondsSince(started) };
}

/** The user id of a campaign member, by e-mail. */
export async function memberId(stack: Stack, email: string): Promise<string> {
  const members = await stack.api.json<CampaignMember[]>('GET', `/api/campaigns/${stack.campaignId}/members`);
  const member = members.find((m) => m.email === email);
  if (!member) throw new Error(`${email} is not a member of the demo campaign; did the seed run?`);
  return member.userId;
}

/** A sheet on the run, assigned to a reader and a checker, so it is open for entry. */
export async function openSheet(stack: Stack, runId: string, plan: CreateSheetRequest, readerId: string, checkerId: string): Promise<Sheet> {
  const sheet = await stack.api.json<Sheet>('POST', `/api/runs/${runId}/sheets`, plan);
  return stack.api.json<Sheet>('PUT', `/api/sheets/${sheet.id}/assignment`, { readerId, checkerId });
}
