import type { Campaign, Channel, Recording, RecordingStatus, Run, Sheet } from '@dialsheet/common';
import { existsSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import type request from 'supertest';
import { expect } from 'vitest';
import type { UserEntity } from '../../src/modules/users/user.entity';
import { addMember, bearer, createUser, login, type Http, type TestApp } from './test-app';
import type { TestMedia } from './media';

export type Actor = 'lead' | 'engineer' | 'reader' | 'checker' | 'outsider';
export const MEMBERS = ['lead', 'engineer', 'reader', 'checker'] as const;
export const WRITERS = ['lead', 'engineer'] as const;
export const VIEWERS = ['reader', 'checker'] as const;

export interface Fixture {
  campaign: Campaign;
  users: Record<Actor, UserEntity>;
  tokens: Record<Actor, string>;
}

/** A campaign with one member per role and a signed-in stranger. */
export async function campaignFixture(t: TestApp, name = 'Heat-recovery core soak test'): Promise<Fixture> {
  const users = {} as Record<Actor, UserEntity>;
  const tokens = {} as Record<Actor, string>;
  for (const actor of [...MEMBERS, 'outsider'] as const) {
    users[actor] = await createUser(t.dataSource, { name: `Pat ${actor}` });
    tokens[actor] = await login(t.http, users[actor].email);
  }
  const res = await t.http.post('/api/campaigns').set(bearer(tokens.lead)).send({ name });
  expect(res.status).toBe(201);
  const campaign = res.body as Campaign;
  for (const role of ['engineer', 'reader', 'checker'] as const) await addMember(t.dataSource, campaign.id, users[role].id, [role]);
  return { campaign, users, tokens };
}

export async function createRun(http: Http, token: string, campaignId: string, name = 'Run 1 — meter on warm stream'): Promise<Run> {
  const res = await http.post(`/api/campaigns/${campaignId}/runs`).set(bearer(token)).send({ name, configuration: 'flow meter on warm stream' });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body as Run;
}

export function upload(http: Http, token: string, runId: string, path: string, field = 'file') {
  return http.post(`/api/runs/${runId}/recording`).set(bearer(token)).attach(field, path);
}

/** Polls the recording until it reaches one of `statuses`. */
export async function waitForStatus(
  http: Http,
  token: string,
  runId: string,
  statuses: RecordingStatus[] = ['ready', 'failed'],
  timeoutMs = 60_000,
): Promise<Recording> {
  const deadline = Date.now() + timeoutMs;
  let last: Recording | undefined;
  for (;;) {
    const res = await http.get(`/api/runs/${runId}/recording`).set(bearer(token));
    if (res.status === 200) {
      last = res.body as Recording;
      if (statuses.includes(last.status)) return last;
    }
    if (Date.now() > deadline) {
      throw new Error(`recording of run ${runId} not ${statuses.join('/')} within ${timeoutMs} ms (last: ${JSON.stringify(last)})`);
    }
    await new Promise((r) => setTimeout(r, 150));
  }
}

/** Files under a directory, relative, recursively; [] when it does not exist. */
export function filesUnder(dir: string): string[] {
  if (!existsSync(dir)) return [];
  return readdirSync(dir, { recursive: true, withFileTypes: true })
    .filter((e) => e.isFile())
    .map((e) => join(e.parentPath, e.name).slice(dir.length + 1))
    .sort();
}

export async function recordingRows(t: TestApp, runId: string): Promise<number> {
  const [row] = await t.dataSource.query('SELECT count(*)::int AS n FROM recordings WHERE run_id = $1', [runId]);
  return (row as { n: number }).n;
}

/** Port of the app's HTTP server, listening on 127.0.0.1 (supertest alone never listens for long). */
export async function listeningPort(t: TestApp): Promise<number> {
  const server = t.app.getHttpServer() as import('node:http').Server;
  if (!server.listening) await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  return (server.address() as import('node:net').AddressInfo).port;
}

/** supertest parser that keeps a binary body as a Buffer. */
export function binary(res: request.Response, done: (err: Error | null, body: Buffer) => void): void {
  const parts: Buffer[] = [];
  res.on('data', (c: Buffer) => parts.push(c));
  res.on('end', () => done(null, Buffer.concat(parts)));
}

/**
 * A run with a processed one-minute recording and its sync set (video 2 s = test 0 s), ready for
 * sheets: the set-up every readings test starts from.
 */
export async function createSyncedRun(http: Http, token: string, campaignId: string, media: TestMedia): Promise<Run> {
  const run = await createRun(http, token, campaignId);
  expect((await upload(http, token, run.id, await media.unique(media.minute()))).status).toBe(201);
  expect((await waitForStatus(http, token, run.id)).status).toBe('ready');
  const sync = await http.put(`/api/runs/${run.id}/sync`).set(bearer(token)).send({ first: { videoTime: 2, testTime: 0 } });
  expect(sync.status, JSON.stringify(sync.body)).toBe(200);
  return sync.body as Run;
}

export async function createChannel(http: Http, token: string, campaignId: string, body: object): Promise<Channel> {
  const res = await http.post(`/api/campaigns/${campaignId}/channels`).set(bearer(token)).send(body);
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body as Channel;
}

/**
 * A sheet on `runId` every `interval` s from `startTime` to `endTime` over `channelIds` (planned by
 * the engineer), assigned by the lead to the fixture's reader and to `checkerId` (the checker).
 */
export async function openAssignedSheet(
  http: Http,
  f: Fixture,
  runId: string,
  channelIds: string[],
  plan: { name: string; startTime: number; endTime: number; interval: number },
  checkerId: string = f.users.checker.id,
): Promise<Sheet> {
  const res = await http.post(`/api/runs/${runId}/sheets`).set(bearer(f.tokens.engineer)).send({ ...plan, channelIds });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  const assigned = await http
    .put(`/api/sheets/${(res.body as Sheet).id}/assignment`)
    .set(bearer(f.tokens.lead))
    .send({ readerId: f.users.reader.id, checkerId });
  expect(assigned.status, JSON.stringify(assigned.body)).toBe(200);
  return assigned.body as Sheet;
}
