// The data the route × role matrix calls every route against: one campaign with a member per role,
// a second campaign led by the "outsider", a platform administrator, and a real resource behind
// every kind of id a route takes (run, recording, sheet, channel, calibration, derived channel,
// stability rule, analysis, release, invitation, captured mail).

import type { Analysis, Campaign, Channel, DerivedChannel, MediaUrls, Release, Run, Sheet, StoredStabilityRule } from '@dialsheet/common';
import { execFile } from 'node:child_process';
import { randomUUID } from 'node:crypto';
import { join } from 'node:path';
import { promisify } from 'node:util';
import { expect } from 'vitest';
import { enter, finish, FLOW_CHAIN, GAUGES, openSheet, signRelease, typedSheet, type ReleaseWorld } from '../e2e/release-fixture';
import type { UserEntity } from '../../src/modules/users/user.entity';
import type { TestMedia } from './media';
import { campaignFixture, createChannel, createRun, upload, waitForStatus } from './recordings';
import { addMember, bearer, createUser, login, tokenFromMail, uniqueEmail, waitForMail, type TestApp } from './test-app';

/** Everyone the matrix calls as, from no token at all to the campaign's lead. */
export const ACTORS = ['anonymous', 'outsider', 'admin', 'reader', 'checker', 'engineer', 'lead'] as const;
export type MatrixActor = (typeof ACTORS)[number];
export type SignedInActor = Exclude<MatrixActor, 'anonymous'>;

export interface MatrixWorld {
  t: TestApp;
  media: TestMedia;
  campaign: Campaign;
  /** Led by the outsider, who belongs to nothing in `campaign`. */
  other: Campaign;
  users: Record<SignedInActor | 'spare', UserEntity>;
  tokens: Record<SignedInActor, string>;
  T: Channel;
  V: Channel;
  /** Calibrated, read by no sheet: its calibration may still change. */
  P: Channel;
  /** Synced, with a typed and resolved sheet and a steady sheet; locked by `release`. */
  runA: Run;
  recordingId: string;
  releaseSheet: Sheet;
  release: Release;
  /** Synced and open for writes. */
  runB: Run;
  /** On runB, assigned, pass 1 partly typed by the reader, pass 2 not begun. */
  sheetB: Sheet;
  /** On runB, both passes finished, row 0 of V differs between the passes. */
  mismatchSheet: Sheet;
  derived: DerivedChannel;
  rule: StoredStabilityRule;
  analysis: Analysis;
  invitationId: string;
  invitationToken: string;
  mailId: string;
  mediaUrls: MediaUrls;
}

const run = promisify(execFile);

const ROWS_A = [
  ['21.4', '2.315'],
  ['21.5', '2.318'],
];

async function ok<T>(res: { status: number; body: unknown }, status: number): Promise<T> {
  expect(res.status, JSON.stringify(res.body)).toBe(status);
  return res.body as T;
}

export async function buildMatrixWorld(t: TestApp, media: TestMedia): Promise<MatrixWorld> {
  const f = await campaignFixture(t, 'Route matrix: plate heat exchanger soak');
  const admin = await createUser(t.dataSource, { name: 'Pat admin', isAdmin: true });
  const spare = await createUser(t.dataSource, { name: 'Pat spare' });
  await addMember(t.dataSource, f.campaign.id, spare.id, ['reader']);
  const tokens = { ...f.tokens, admin: await login(t.http, admin.email) } as Record<SignedInActor, string>;
  const users = { ...f.users, admin, spare } as MatrixWorld['users'];
  const other = await ok<Campaign>(await t.http.post('/api/campaigns').set(bearer(tokens.outsider)).send({ name: 'Someone else’s campaign' }), 201);

  const T = await createChannel(t.http, tokens.lead, f.campaign.id, GAUGES[0]);
  const V = await createChannel(t.http, tokens.lead, f.campaign.id, GAUGES[1]);
  await ok(await t.http.put(`/api/channels/${V.id}/calibration`).set(bearer(tokens.engineer)).send({ chain: FLOW_CHAIN, reason: 'meter data sheet' }), 200);

  // TestMedia makes each kind once but not under concurrency: make them before the parallel uploads.
  const clip = await shortClip(media);
  await media.clip();
  const [runA, runB] = await Promise.all([syncedRun(t, tokens.lead, f.campaign.id, media, clip, 'Run A'), syncedRun(t, tokens.lead, f.campaign.id, media, clip, 'Run B')]);
  const rw: ReleaseWorld = { f, T, V, run: runA };
  const releaseSheet = await typedSheet(t, rw, 'Released sheet');
  // A steady stretch of V (six rows, both passes alike) for a stable-value analysis.
  const steady = await ok<Sheet>(
    await t.http
      .post(`/api/runs/${runA.id}/sheets`)
      .set(bearer(tokens.engineer))
      .send({ name: 'Steady stretch', startTime: 4, endTime: 14, interval: 2, channelIds: [V.id] }),
    201,
  );
  await ok(await t.http.put(`/api/sheets/${steady.id}/assignment`).set(bearer(tokens.lead)).send({ readerId: users.reader.id, checkerId: users.checker.id }), 200);
  for (const pass of [1, 2] as const) {
    for (let row = 0; row < 6; row++) {
      await ok(
        await t.http
          .put(`/api/sheets/${steady.id}/rows/${row}`)
          .set(bearer(pass === 1 ? tokens.reader : tokens.checker))
          .send({ pass, readings: [{ channelId: V.id, rawText: (2.31 + 0.001 * (row % 3)).toFixed(3), frameTime: 6 + 2 * row }] }),
        200,
      );
    }
    await ok(await t.http.post(`/api/sheets/${steady.id}/passes/${pass}/finish`).set(bearer(pass === 1 ? tokens.reader : tokens.checker)), 200);
  }
  const analysis = await ok<Analysis>(
    await t.http
      .post(`/api/campaigns/${f.campaign.id}/analyses`)
      .set(bearer(tokens.engineer))
      .send({ kind: 'stable-value', name: 'Run A flow', input: { runId: runA.id, channelId: V.id, window: { from: 4, to: 14 }, tStar: 14 } }),
    201,
  );
  const release = await signRelease(t, rw, 'Release of run A');

  const sheetB = await openSheet(t, { ...rw, run: runB }, 'Sheet in progress');
  await ok(
    await t.http
      .put(`/api/sheets/${sheetB.id}/rows/0`)
      .set(bearer(tokens.reader))
      .send({ pass: 1, readings: [{ channelId: T.id, rawText: ROWS_A[0][0], frameTime: 2.02 }, { channelId: V.id, rawText: ROWS_A[0][1], frameTime: 2.02 }] }),
    200,
  );
  const mismatchSheet = await mismatchedSheet(t, { ...rw, run: runB }, 'Sheet with a mismatch');

  const derived = await ok<DerivedChannel>(
    await t.http
      .post(`/api/campaigns/${f.campaign.id}/derived-channels`)
      .set(bearer(tokens.engineer))
      .send({ name: 'Flow in litres per second', symbol: 'Q_ls', unit: 'L/s', expression: 'V1 * 40 / 60' }),
    201,
  );
  const rule = await ok<StoredStabilityRule>(
    await t.http
      .post(`/api/campaigns/${f.campaign.id}/stability-rules`)
      .set(bearer(tokens.engineer))
      .send({ name: 'Steady flow', windowSeconds: 10, slopeLimitPerMinute: 0.05, channelId: V.id }),
    201,
  );
  const P = await createChannel(t.http, tokens.lead, f.campaign.id, { ...GAUGES[1], name: 'Spare flow meter', symbol: 'V2' });
  await ok(await t.http.put(`/api/channels/${P.id}/calibration`).set(bearer(tokens.engineer)).send({ chain: FLOW_CHAIN }), 200);
  const invitation = await createInvitation(t, tokens.lead, tokens.admin, f.campaign.id);
  const mediaUrls = await ok<MediaUrls>(await t.http.post(`/api/recordings/${runA.recording!.id}/media-urls`).set(bearer(tokens.reader)), 200);
  expect(mediaUrls.proxyUrl).toBeTruthy();

  return {
    t,
    media,
    campaign: f.campaign,
    other,
    users,
    tokens,
    T,
    V,
    P,
    runA,
    recordingId: runA.recording!.id,
    releaseSheet,
    release,
    runB,
    sheetB,
    mismatchSheet,
    derived,
    rule,
    analysis,
    invitationId: invitation.id,
    invitationToken: invitation.token,
    mailId: invitation.mailId,
    mediaUrls,
  };
}

/**
 * 20 s at 160×120 and 5 fps: room for rows up to 16 s of video (test time up to 14 s once the
 * sync puts test 0 at video 2 s) and a third of the one-minute clip's processing time.
 */
async function shortClip(media: TestMedia): Promise<string> {
  const out = join(media.dir, 'matrix-20s.mp4');
  await run('ffmpeg', [
    '-hide_banner', '-nostdin', '-loglevel', 'error', '-y',
    '-f', 'lavfi', '-i', 'testsrc2=s=160x120:r=5:d=20', '-c:v', 'libx264', '-preset', 'ultrafast', '-pix_fmt', 'yuv420p', out,
  ]);
  return out;
}

/** A run with a processed recording and its sync set (video 2 s = test 0 s). */
async function syncedRun(t: TestApp, token: string, campaignId: string, media: TestMedia, clip: string, name: string): Promise<Run> {
  const created = await createRun(t.http, token, campaignId, name);
  await ok(await upload(t.http, token, created.id, await media.unique(clip)), 201);
  expect((await waitForStatus(t.http, token, created.id, ['ready', 'failed'], 120_000)).status).toBe('ready');
  return ok<Run>(await t.http.put(`/api/runs/${created.id}/sync`).set(bearer(token)).send({ first: { videoTime: 2, testTime: 0 } }), 200);
}

/** Both passes over T and V at 0 and 2 s, finished, with pass 2 mistyping V in row 0. */
export async function mismatchedSheet(t: TestApp, rw: ReleaseWorld, name: string): Promise<Sheet> {
  const sheet = await openSheet(t, rw, name);
  await enter(t, rw, sheet, 1, ROWS_A);
  await finish(t, rw, sheet, 1);
  await enter(t, rw, sheet, 2, [['21.4', '2.351'], ROWS_A[1]]);
  await finish(t, rw, sheet, 2);
  return sheet;
}

/** A pending invitation and the token its e-mail carries. */
export async function createInvitation(
  t: TestApp,
  leadToken: string,
  adminToken: string,
  campaignId: string,
): Promise<{ id: string; token: string; mailId: string; email: string }> {
  const email = uniqueEmail('invitee');
  const res = await ok<{ id: string }>(
    await t.http.post(`/api/campaigns/${campaignId}/invitations`).set(bearer(leadToken)).send({ email, roles: ['reader'] }),
    201,
  );
  const mail = await waitForMail(t.http, adminToken, email, /invited/, 20_000);
  return { id: res.id, token: tokenFromMail(mail, '/invitations/accept'), mailId: mail.id, email };
}

/** A one-time password-reset token for a new account (each call its own account). */
export async function resetToken(t: TestApp, adminToken: string): Promise<string> {
  const user = await createUser(t.dataSource, { name: 'Pat forgetful' });
  expect((await t.http.post('/api/auth/password-reset').send({ email: user.email })).status).toBe(202);
  return tokenFromMail(await waitForMail(t.http, adminToken, user.email, /new Dialsheet password/, 20_000), '/reset-password/confirm');
}

/** A campaign like `w.campaign` (same people, same roles), for calls that change the campaign itself. */
export async function twinCampaign(w: MatrixWorld, archived: boolean): Promise<Campaign> {
  const campaign = await ok<Campaign>(await w.t.http.post('/api/campaigns').set(bearer(w.tokens.lead)).send({ name: `Twin ${randomUUID().slice(0, 8)}` }), 201);
  for (const role of ['engineer', 'reader', 'checker'] as const) await addMember(w.t.dataSource, campaign.id, w.users[role].id, [role]);
  if (archived) await ok(await w.t.http.post(`/api/campaigns/${campaign.id}/archive`).set(bearer(w.tokens.lead)).send({ reason: 'set-up' }), 200);
  return campaign;
}

/**
 * A fresh run in `w.campaign`, optionally with a recording just uploaded: its processing may
 * still be under way when the caller deletes it, which a lead can do too.
 */
export async function freshRun(w: MatrixWorld, withRecording = false): Promise<Run> {
  const created = await createRun(w.t.http, w.tokens.lead, w.campaign.id, `Scratch run ${randomUUID().slice(0, 8)}`);
  if (withRecording) await ok(await upload(w.t.http, w.tokens.lead, created.id, await w.media.unique(w.media.clip())), 201);
  return created;
}

export async function freshChannel(w: MatrixWorld, calibrated = false): Promise<Channel> {
  const symbol = `P${randomUUID().replace(/-/g, '').slice(0, 8)}`;
  const channel = await createChannel(w.t.http, w.tokens.lead, w.campaign.id, { ...GAUGES[1], name: `Spare gauge ${symbol}`, symbol });
  if (calibrated) {
    await ok(await w.t.http.put(`/api/channels/${channel.id}/calibration`).set(bearer(w.tokens.engineer)).send({ chain: FLOW_CHAIN }), 200);
  }
  return channel;
}

/** A requested (unsigned) release of run A, which is complete and can be signed again. */
export async function requestedRelease(w: MatrixWorld): Promise<Release> {
  return ok<Release>(
    await w.t.http.post(`/api/campaigns/${w.campaign.id}/releases`).set(bearer(w.tokens.engineer)).send({ title: 'Again', runIds: [w.runA.id] }),
    201,
  );
}

/** Signs run A again when a correction before has lifted its lock. */
export async function relockRunA(w: MatrixWorld): Promise<void> {
  const [run] = (await w.t.dataSource.query('SELECT locked_release_id FROM runs WHERE id = $1', [w.runA.id])) as Array<{ locked_release_id: string | null }>;
  if (run.locked_release_id) return;
  await ok(
    await w.t.http.post(`/api/campaigns/${w.campaign.id}/releases`).set(bearer(w.tokens.lead)).send({ title: 'Relock', runIds: [w.runA.id], sign: true }),
    201,
  );
}

/** A fresh sheet on run B with every cell of pass 1 typed by the reader, ready to finish. */
export async function typedPass1Sheet(w: MatrixWorld): Promise<Sheet> {
  const rw: ReleaseWorld = { f: { campaign: w.campaign, users: w.users, tokens: w.tokens } as ReleaseWorld['f'], T: w.T, V: w.V, run: w.runB };
  const sheet = await openSheet(w.t, rw, `Ready to finish ${randomUUID().slice(0, 8)}`);
  await enter(w.t, rw, sheet, 1, ROWS_A);
  return sheet;
}

export async function freshSheet(w: MatrixWorld): Promise<Sheet> {
  return ok<Sheet>(
    await w.t.http
      .post(`/api/runs/${w.runB.id}/sheets`)
      .set(bearer(w.tokens.engineer))
      .send({ name: `Scratch sheet ${randomUUID().slice(0, 8)}`, startTime: 0, endTime: 4, interval: 2, channelIds: [w.T.id] }),
    201,
  );
}

export { ok as expectStatus };
