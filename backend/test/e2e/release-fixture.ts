// Shared set-up of the release, export and notification API tests: a campaign with one member
// per role, a temperature display and a flow-meter voltage display (calibrated to SLPM), a synced
// run and sheets of 2 rows × 2 channels typed in both passes, finished and resolved.

import type { Channel, Release, Run, Sheet } from '@dialsheet/common';
import { expect } from 'vitest';
import type { TestMedia } from '../helpers/media';
import { campaignFixture, createChannel, createSyncedRun, type Fixture } from '../helpers/recordings';
import { bearer, type Http, type TestApp } from '../helpers/test-app';

export function call(http: Http, method: 'get' | 'post' | 'put' | 'patch' | 'delete', path: string, token: string) {
  return http[method](path).set(bearer(token));
}

export const GAUGES = [
  { name: 'Warm stream inlet temperature', symbol: 'T1', quantity: 'temperature', rawUnit: '°C', resolution: 0.1, rangeMin: -50, rangeMax: 200 },
  { name: 'Flow meter output', symbol: 'V1', quantity: 'voltage', rawUnit: 'V', resolution: 0.001, rangeMin: 0, rangeMax: 5, fullScale: 5 },
];

/** The demo flow meter's panel span: 0–5 V = 0–200 SLPM, so 40 SLPM per volt. */
export const FLOW_CHAIN = { steps: [{ kind: 'linear', a: 40, b: 0, inputUnit: 'V', outputUnit: 'SLPM', label: 'meter span' }] };

export interface ReleaseWorld {
  f: Fixture;
  T: Channel;
  V: Channel;
  run: Run;
}

export async function releaseWorld(t: TestApp, media: TestMedia, name: string): Promise<ReleaseWorld> {
  const f = await campaignFixture(t, name);
  const T = await createChannel(t.http, f.tokens.lead, f.campaign.id, GAUGES[0]);
  const V = await createChannel(t.http, f.tokens.lead, f.campaign.id, GAUGES[1]);
  const cal = await call(t.http, 'put', `/api/channels/${V.id}/calibration`, f.tokens.engineer).send({ chain: FLOW_CHAIN, reason: 'meter data sheet' });
  expect(cal.status, JSON.stringify(cal.body)).toBe(200);
  const run = await createSyncedRun(t.http, f.tokens.lead, f.campaign.id, media);
  return { f, T, V, run };
}

/** A sheet of rows at 0 and 2 s over T1 and V1, with the fixture's reader and checker. */
export async function openSheet(t: TestApp, w: ReleaseWorld, name: string, run: Run = w.run): Promise<Sheet> {
  const res = await call(t.http, 'post', `/api/runs/${run.id}/sheets`, w.f.tokens.engineer).send({
    name,
    startTime: 0,
    endTime: 2,
    interval: 2,
    channelIds: [w.T.id, w.V.id],
  });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  const assigned = await call(t.http, 'put', `/api/sheets/${(res.body as Sheet).id}/assignment`, w.f.tokens.lead).send({
    readerId: w.f.users.reader.id,
    checkerId: w.f.users.checker.id,
  });
  expect(assigned.status, JSON.stringify(assigned.body)).toBe(200);
  return assigned.body as Sheet;
}

export async function enter(t: TestApp, w: ReleaseWorld, sheet: Sheet, pass: 1 | 2, rows: string[][]): Promise<void> {
  const token = pass === 1 ? w.f.tokens.reader : w.f.tokens.checker;
  for (const [rowIndex, texts] of rows.entries()) {
    const res = await call(t.http, 'put', `/api/sheets/${sheet.id}/rows/${rowIndex}`, token).send({
      pass,
      readings: texts.map((rawText, i) => ({ channelId: [w.T.id, w.V.id][i], rawText, frameTime: 2 + rowIndex * 2 + 0.017 * (pass === 1 ? 1 : 2) })),
    });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
  }
}

export async function finish(t: TestApp, w: ReleaseWorld, sheet: Sheet, pass: 1 | 2): Promise<void> {
  const res = await call(t.http, 'post', `/api/sheets/${sheet.id}/passes/${pass}/finish`, pass === 1 ? w.f.tokens.reader : w.f.tokens.checker);
  expect(res.status, JSON.stringify(res.body)).toBe(200);
}

export async function resolve(t: TestApp, w: ReleaseWorld, sheet: Sheet, rowIndex: number, channelId: string, rawText: string, reason: string): Promise<void> {
  const res = await call(t.http, 'put', `/api/sheets/${sheet.id}/resolutions/${rowIndex}/${channelId}`, w.f.tokens.checker).send({ rawText, reason });
  expect(res.status, JSON.stringify(res.body)).toBe(200);
}

/**
 * The sheet every export test reads: a negative temperature that both passes agree on, a voltage
 * pass 2 mistyped (resolved with a reason that looks like a formula) and a voltage pass 1 flagged
 * unreadable (resolved to pass 2's value).
 */
export async function typedSheet(t: TestApp, w: ReleaseWorld, name: string, run: Run = w.run): Promise<Sheet> {
  const sheet = await openSheet(t, w, name, run);
  await enter(t, w, sheet, 1, [
    ['-3.5', '2.315'],
    ['18.5', '#unreadable'],
  ]);
  await finish(t, w, sheet, 1);
  await enter(t, w, sheet, 2, [
    ['-3.50', '2.351'],
    ['18.50', '2.340'],
  ]);
  await finish(t, w, sheet, 2);
  await resolve(t, w, sheet, 0, w.V.id, '2.315', '=1+2');
  await resolve(t, w, sheet, 1, w.V.id, '2.340', 'The frame at 00:00:04 shows 2.340');
  return sheet;
}

export async function signRelease(t: TestApp, w: ReleaseWorld, title: string, runIds: string[] = [w.run.id]): Promise<Release> {
  const res = await call(t.http, 'post', `/api/campaigns/${w.f.campaign.id}/releases`, w.f.tokens.lead).send({ title, runIds, sign: true });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body as Release;
}
