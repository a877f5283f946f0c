import type { AuditEntry, Channel, Page, Run, Sheet, SheetRow } from '@dialsheet/common';
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { TestMedia } from '../helpers/media';
import { campaignFixture, createChannel, createRun, MEMBERS, upload, VIEWERS, waitForStatus, type Fixture } from '../helpers/recordings';
import { addMember, bearer, createUser, login, startTestApp, TEST_APP_URL, waitForMail, type Http, type TestApp } from '../helpers/test-app';

function call(http: Http, method: 'get' | 'post' | 'patch' | 'put' | 'delete', path: string, token?: string) {
  const req = http[method](path);
  return token ? req.set(bearer(token)) : req;
}

const gauges = [
  { name: 'Warm stream inlet temperature', symbol: 'T1', quantity: 'temperature', rawUnit: '°C', resolution: 0.1, rangeMin: -50, rangeMax: 200 },
  { name: 'Flow meter output', symbol: 'V1', quantity: 'voltage', rawUnit: 'V', resolution: 0.001, rangeMin: 0, rangeMax: 10 },
  { name: 'Supply pressure', symbol: 'P1', quantity: 'pressure', rawUnit: 'kPa', resolution: 1, rangeMin: 0, rangeMax: 600 },
];

async function auditOf(http: Http, token: string, campaignId: string): Promise<AuditEntry[]> {
  const res = await call(http, 'get', `/api/campaigns/${campaignId}/audit?entityType=sheet&limit=200`, token);
  expect(res.status).toBe(200);
  return (res.body as Page<AuditEntry>).items;
}

describe('sheets', () => {
  let t: TestApp;
  let media: TestMedia;
  let f: Fixture;
  let run: Run;
  let channels: Channel[];
  let adminToken: string;
  /** Test time at the end of the recording: video length minus the 2 s before the start lamp. */
  let lastTestTime: number;

  const plan = () => ({ name: 'Warm-up, every 2 s', startTime: 0, endTime: 60, interval: 2, channelIds: channels.map((c) => c.id) });

  async function createSheet(body: object = plan(), token = f.tokens.engineer): Promise<Sheet> {
    const res = await call(t.http, 'post', `/api/runs/${run.id}/sheets`, token).send(body);
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    return res.body as Sheet;
  }

  beforeAll(async () => {
    t = await startTestApp();
    media = new TestMedia();
    const admin = await createUser(t.dataSource, { isAdmin: true });
    adminToken = await login(t.http, admin.email);
    f = await campaignFixture(t, 'Heat-recovery core sheets');
    channels = [];
    for (const g of gauges) channels.push(await createChannel(t.http, f.tokens.lead, f.campaign.id, g));
    run = await createRun(t.http, f.tokens.lead, f.campaign.id);
    expect((await upload(t.http, f.tokens.lead, run.id, await media.unique(media.minute()))).status).toBe(201);
    const recording = await waitForStatus(t.http, f.tokens.lead, run.id);
    expect(recording.status).toBe('ready');
    const duration = recording.probe?.durationSec as number;
    expect(duration).toBeGreaterThan(61.5);
    lastTestTime = duration - 2;
    const sync = await call(t.http, 'put', `/api/runs/${run.id}/sync`, f.tokens.lead).send({ first: { videoTime: 2, testTime: 0 } });
    expect(sync.status, JSON.stringify(sync.body)).toBe(200);
    run = sync.body as Run;
  }, 120_000);
  afterAll(async () => {
    await t.close();
    media.remove();
  });

  it('lead and engineer plan sheets; every member lists and reads them; rows are exact test times', async () => {
    const res = await call(t.http, 'post', `/api/runs/${run.id}/sheets`, f.tokens.engineer).send({ ...plan(), name: '  Warm-up, every 2 s ' });
    expect(res.status).toBe(201);
    const sheet = res.body as Sheet;
    expect(sheet).toEqual({
      id: expect.any(String),
      campaignId: f.campaign.id,
      runId: run.id,
      name: 'Warm-up, every 2 s',
      startTime: 0,
      endTime: 60,
      interval: 2,
      channelIds: channels.map((c) => c.id),
      rowCount: 31,
      readerId: null,
      checkerId: null,
      status: 'draft',
      progress: { pass1: { done: 0, total: 93 }, pass2: { done: 0, total: 93 } },
      pass1FinishedAt: null,
      pass2FinishedAt: null,
      lock: null,
      createdAt: expect.any(String),
      updatedAt: expect.any(String),
    });
    const reversed = await createSheet({ ...plan(), name: 'Settled, every 0.1 s', startTime: 30, endTime: 31, interval: 0.1, channelIds: [channels[2].id, channels[0].id] }, f.tokens.lead);
    expect(reversed).toMatchObject({ rowCount: 11, channelIds: [channels[2].id, channels[0].id] });

    for (const actor of MEMBERS) {
      const list = await call(t.http, 'get', `/api/runs/${run.id}/sheets`, f.tokens[actor]);
      expect(list.status, actor).toBe(200);
      const mine = (list.body as Sheet[]).filter((s) => s.id === sheet.id || s.id === reversed.id);
      expect(mine).toEqual([sheet, reversed]);
      const one = await call(t.http, 'get', `/api/sheets/${sheet.id}`, f.tokens[actor]);
      expect(one.status).toBe(200);
      expect(one.body).toEqual(sheet);
      const rows = await call(t.http, 'get', `/api/sheets/${sheet.id}/rows`, f.tokens[actor]);
      expect(rows.status).toBe(200);
      expect(rows.body as SheetRow[]).toEqual(Array.from({ length: 31 }, (_, index) => ({ index, testTime: 2 * index })));
    }
    const tenths = await call(t.http, 'get', `/api/sheets/${reversed.id}/rows`, f.tokens.reader);
    expect((tenths.body as SheetRow[]).map((r) => r.testTime)).toEqual([30, 30.1, 30.2, 30.3, 30.4, 30.5, 30.6, 30.7, 30.8, 30.9, 31]);
  });

  it('refuses readers and checkers (403), hides sheets from strangers (404) and needs a token (401)', async () => {
    const sheet = await createSheet();
    const writes = [
      ['post', `/api/runs/${run.id}/sheets`, plan()],
      ['patch', `/api/sheets/${sheet.id}`, { name: 'Renamed' }],
      ['delete', `/api/sheets/${sheet.id}`, {}],
      ['put', `/api/sheets/${sheet.id}/assignment`, { readerId: f.users.reader.id }],
    ] as const;
    for (const actor of VIEWERS) {
      for (const [method, path, body] of writes) {
        const res = await call(t.http, method, path, f.tokens[actor]).send(body);
        expect(res.status, `${actor} ${method} ${path}`).toBe(403);
        expect(res.body.message).toBe('This needs the Lead or Engineer role in this campaign');
      }
    }
    const reads = [
      ['get', `/api/runs/${run.id}/sheets`, {}],
      ['get', `/api/sheets/${sheet.id}`, {}],
      ['get', `/api/sheets/${sheet.id}/rows`, {}],
    ] as const;
    for (const [method, path, body] of [...writes, ...reads]) {
      const res = await call(t.http, method, path, f.tokens.outsider).send(body);
      expect(res.status, `${method} ${path}`).toBe(404);
      expect(res.body.message, `${method} ${path}`).toBe(path.startsWith('/api/runs/') ? 'Run not found' : 'Sheet not found');
      expect((await call(t.http, method, path).send(body)).status, `${method} ${path} without token`).toBe(401);
    }
    for (const id of [randomUUID(), 'not-a-uuid']) {
      for (const path of [`/api/sheets/${id}`, `/api/sheets/${id}/rows`]) {
        const res = await call(t.http, 'get', path, f.tokens.lead);
        expect(res.status).toBe(404);
        expect(res.body.message).toBe('Sheet not found');
      }
    }
    // Nothing the refused callers sent was saved.
    const again = await call(t.http, 'get', `/api/sheets/${sheet.id}`, f.tokens.lead);
    expect(again.body).toEqual(sheet);
  });

  it('answers 400 naming the field and saves nothing', async () => {
    const before = (await call(t.http, 'get', `/api/runs/${run.id}/sheets`, f.tokens.lead)).body as Sheet[];
    const other = await campaignFixture(t, 'Another campaign');
    const foreign = await createChannel(t.http, other.tokens.lead, other.campaign.id, gauges[0]);
    const cases: Array<[Record<string, unknown>, string]> = [
      [{ ...plan(), name: '   ' }, 'name should not be empty'],
      [{ ...plan(), startTime: '0' }, 'startTime must be a number of seconds'],
      [{ ...plan(), startTime: -2 }, 'startTime must be 0 s or later'],
      [{ ...plan(), endTime: null }, 'endTime must be a number of seconds'],
      [{ ...plan(), interval: 0.05 }, 'interval must be at least 0.1 s'],
      [{ ...plan(), interval: 0 }, 'interval must be at least 0.1 s'],
      [{ ...plan(), channelIds: [] }, 'channelIds must list at least one channel'],
      [{ ...plan(), channelIds: [channels[0].id, channels[0].id] }, 'channelIds must not list a channel twice'],
      [{ ...plan(), channelIds: ['T1'] }, 'channelIds must contain channel ids (UUIDs)'],
      [{ ...plan(), runId: randomUUID() }, 'property runId should not exist'],
      [{ ...plan(), startTime: 10, endTime: 10 }, 'endTime (10 s) must be after startTime (10 s)'],
      [{ ...plan(), channelIds: [channels[0].id, foreign.id] }, 'channelIds.1 is not a channel of this run’s campaign'],
      [{ ...plan(), channelIds: [randomUUID()] }, 'channelIds.0 is not a channel of this run’s campaign'],
      [{ ...plan(), endTime: 61 }, `endTime must be at most ${Math.floor(lastTestTime * 1000) / 1000} s: the recording ends there in test time, got 61 s`],
    ];
    for (const [body, message] of cases) {
      const res = await call(t.http, 'post', `/api/runs/${run.id}/sheets`, f.tokens.lead).send(body);
      expect(res.status, JSON.stringify(body)).toBe(400);
      expect(res.body.message, JSON.stringify(body)).toContain(message);
    }

    // Sheet times are test times: a run without sync marks cannot have a sheet yet.
    const unsynced = await createRun(t.http, f.tokens.lead, f.campaign.id, 'Run 2 — no sync yet');
    const res = await call(t.http, 'post', `/api/runs/${unsynced.id}/sheets`, f.tokens.lead).send(plan());
    expect(res.status).toBe(400);
    expect(res.body.message).toBe("Set the run's time sync before making a sheet: sheet times are test times");
    expect((await call(t.http, 'get', `/api/runs/${unsynced.id}/sheets`, f.tokens.lead)).body).toEqual([]);
    expect((await call(t.http, 'get', `/api/runs/${run.id}/sheets`, f.tokens.lead)).body).toEqual(before);
  });

  it('judges a change against the stored plan and records old and new in the audit trail', async () => {
    const sheet = await createSheet();
    const crossed = await call(t.http, 'patch', `/api/sheets/${sheet.id}`, f.tokens.engineer).send({ startTime: 70 });
    expect(crossed.status).toBe(400);
    expect(crossed.body.message).toContain('endTime (60 s) must be after startTime (70 s)');
    const tooLong = await call(t.http, 'patch', `/api/sheets/${sheet.id}`, f.tokens.engineer).send({ endTime: 600 });
    expect(tooLong.status).toBe(400);
    expect(tooLong.body.message).toMatch(/^endTime must be at most 60(\.\d+)? s: the recording ends there in test time/);
    const nulled = await call(t.http, 'patch', `/api/sheets/${sheet.id}`, f.tokens.engineer).send({ interval: null });
    expect(nulled.status).toBe(400);
    expect(nulled.body.message).toContain('interval must be a number of seconds');
    expect((await call(t.http, 'get', `/api/sheets/${sheet.id}`, f.tokens.lead)).body).toEqual(sheet);

    const order = [channels[1].id, channels[0].id];
    const res = await call(t.http, 'patch', `/api/sheets/${sheet.id}`, f.tokens.engineer).send({
      interval: 5,
      channelIds: order,
      name: sheet.name,
      reason: 'Displays settle slowly',
    });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body).toMatchObject({ interval: 5, channelIds: order, rowCount: 13, progress: { pass1: { done: 0, total: 26 } } });
    const rows = (await call(t.http, 'get', `/api/sheets/${sheet.id}/rows`, f.tokens.checker)).body as SheetRow[];
    expect(rows.map((r) => r.testTime)).toEqual([0, 5, 10, 15, 20, 25, 30, 35, 40, 45, 50, 55, 60]);

    // A change that changes nothing leaves no trail.
    expect((await call(t.http, 'patch', `/api/sheets/${sheet.id}`, f.tokens.lead).send({ interval: 5 })).status).toBe(200);
    const trail = (await auditOf(t.http, f.tokens.reader, f.campaign.id)).filter((e) => e.entityId === sheet.id);
    expect(trail.map((e) => e.action)).toEqual(['update', 'create']);
    expect(trail[0]).toMatchObject({
      actorId: f.users.engineer.id,
      before: { interval: 2, channelIds: channels.map((c) => c.id) },
      after: { interval: 5, channelIds: order },
      reason: 'Displays settle slowly',
    });
    expect(trail[1]).toMatchObject({ actorId: f.users.engineer.id, after: { ...plan(), runId: run.id } });
  });

  it('assigns a reader and a different checker by role, e-mails each with a link to the sheet', async () => {
    const sheet = await createSheet({ ...plan(), name: 'Assigned sheet' });
    const path = `/api/sheets/${sheet.id}/assignment`;
    const both = await createUser(t.dataSource, { name: 'Dana Both' });
    await addMember(t.dataSource, f.campaign.id, both.id, ['reader', 'checker']);
    const cases: Array<[object, string]> = [
      [{ readerId: f.users.checker.id }, 'readerId must be a member with the reader role in this campaign'],
      [{ checkerId: f.users.reader.id }, 'checkerId must be a member with the checker role in this campaign'],
      [{ readerId: f.users.outsider.id }, 'readerId must be a member of this campaign'],
      [{ readerId: both.id, checkerId: both.id }, 'readerId and checkerId must be different people'],
      [{ readerId: 'pat' }, 'readerId must be a user id (UUID) or null'],
    ];
    for (const [body, message] of cases) {
      const res = await call(t.http, 'put', path, f.tokens.lead).send(body);
      expect(res.status, JSON.stringify(body)).toBe(400);
      expect(JSON.stringify(res.body.message), JSON.stringify(body)).toContain(message);
    }
    expect((await call(t.http, 'get', `/api/sheets/${sheet.id}`, f.tokens.lead)).body).toEqual(sheet);

    const res = await call(t.http, 'put', path, f.tokens.engineer).send({ readerId: f.users.reader.id, checkerId: f.users.checker.id });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body).toMatchObject({ readerId: f.users.reader.id, checkerId: f.users.checker.id, status: 'open' });
    const link = `${TEST_APP_URL}/campaigns/${f.campaign.id}/sheets/${sheet.id}`;
    const toReader = await waitForMail(t.http, adminToken, f.users.reader.email, /Assigned sheet" is yours to read/);
    expect(toReader.text).toContain(link);
    expect(toReader.html).toContain(`href="${link}"`);
    expect(toReader.text).toContain('Pat engineer');
    const toChecker = await waitForMail(t.http, adminToken, f.users.checker.email, /Assigned sheet" is yours to check/);
    expect(toChecker.text).toContain(link);
    expect(toChecker.text).toContain('blind second pass');

    // The same person may now take the checker's place only after leaving the reader's.
    const swap = await call(t.http, 'put', path, f.tokens.lead).send({ checkerId: both.id });
    expect(swap.status).toBe(200);
    expect(swap.body).toMatchObject({ readerId: f.users.reader.id, checkerId: both.id, status: 'open' });
    await waitForMail(t.http, adminToken, both.email, /Assigned sheet" is yours to check/);
    const clash = await call(t.http, 'put', path, f.tokens.lead).send({ readerId: both.id });
    expect(clash.status).toBe(400);
    const cleared = await call(t.http, 'put', path, f.tokens.lead).send({ readerId: null });
    expect(cleared.status).toBe(200);
    expect(cleared.body).toMatchObject({ readerId: null, checkerId: both.id, status: 'draft' });

    const trail = (await auditOf(t.http, f.tokens.lead, f.campaign.id)).filter((e) => e.entityId === sheet.id);
    expect(trail.map((e) => [e.action, e.before, e.after])).toEqual([
      ['update', { readerId: f.users.reader.id, checkerId: both.id }, { readerId: null, checkerId: both.id }],
      ['update', { readerId: f.users.reader.id, checkerId: f.users.checker.id }, { readerId: f.users.reader.id, checkerId: both.id }],
      ['update', { readerId: null, checkerId: null }, { readerId: f.users.reader.id, checkerId: f.users.checker.id }],
      ['create', null, { ...plan(), name: 'Assigned sheet', runId: run.id }],
    ]);
  });

  it('refuses to delete a channel a sheet reads (409), and allows it once the sheet is gone', async () => {
    const spare = await createChannel(t.http, f.tokens.lead, f.campaign.id, { ...gauges[2], name: 'Return pressure', symbol: 'P2' });
    const sheet = await createSheet({ ...plan(), name: 'Return side', channelIds: [spare.id] });
    const refused = await call(t.http, 'delete', `/api/channels/${spare.id}`, f.tokens.lead);
    expect(refused.status).toBe(409);
    expect(refused.body.message).toBe(`This channel is used by sheet “Return side” of run “${run.name}”; take it off that sheet before deleting it`);
    expect((await call(t.http, 'get', `/api/sheets/${sheet.id}`, f.tokens.lead)).body).toEqual(sheet);
    const second = await createSheet({ ...plan(), name: 'Return side, fine', interval: 0.5, channelIds: [channels[0].id, spare.id] });
    const twice = await call(t.http, 'delete', `/api/channels/${spare.id}`, f.tokens.engineer);
    expect(twice.status).toBe(409);
    expect(twice.body.message).toBe(
      `This channel is used by sheet “Return side” of run “${run.name}” and 1 other sheet; take it off those sheets before deleting it`,
    );
    expect((await call(t.http, 'delete', `/api/sheets/${second.id}`, f.tokens.lead)).status).toBe(204);
    expect((await call(t.http, 'get', `/api/campaigns/${f.campaign.id}/channels`, f.tokens.lead)).body).toContainEqual(spare);

    const gone = await call(t.http, 'delete', `/api/sheets/${sheet.id}`, f.tokens.engineer);
    expect(gone.status).toBe(204);
    expect((await call(t.http, 'get', `/api/sheets/${sheet.id}`, f.tokens.lead)).status).toBe(404);
    const trail = (await auditOf(t.http, f.tokens.lead, f.campaign.id)).filter((e) => e.entityId === sheet.id);
    expect(trail[0]).toMatchObject({
      action: 'delete',
      actorId: f.users.engineer.id,
      before: { name: 'Return side', channelIds: [spare.id], runId: run.id, readerId: null, checkerId: null },
    });
    expect((await call(t.http, 'delete', `/api/channels/${spare.id}`, f.tokens.lead)).status).toBe(204);
  });

  it('keeps sheets of an archived campaign read-only', async () => {
    const sheet = await createSheet({ ...plan(), name: 'Before archiving' });
    expect((await call(t.http, 'post', `/api/campaigns/${f.campaign.id}/archive`, f.tokens.lead).send({})).status).toBe(200);
    try {
      const archived = 'This campaign is archived and read-only; restore it first';
      for (const [method, path, body] of [
        ['post', `/api/runs/${run.id}/sheets`, plan()],
        ['patch', `/api/sheets/${sheet.id}`, { name: 'After archiving' }],
        ['delete', `/api/sheets/${sheet.id}`, {}],
        ['put', `/api/sheets/${sheet.id}/assignment`, { readerId: f.users.reader.id }],
      ] as const) {
        const res = await call(t.http, method, path, f.tokens.lead).send(body);
        expect(res.status, `${method} ${path}`).toBe(409);
        expect(res.body.message).toBe(archived);
      }
      expect((await call(t.http, 'get', `/api/sheets/${sheet.id}`, f.tokens.reader)).body).toEqual(sheet);
    } finally {
      expect((await call(t.http, 'post', `/api/campaigns/${f.campaign.id}/restore`, f.tokens.lead).send({})).status).toBe(200);
    }
  });

  it('documents every route in the OpenAPI description', async () => {
    const doc = await t.http.get('/api/docs-json');
    const paths = doc.body.paths as Record<string, Record<string, { tags?: string[] }>>;
    for (const [path, method] of [
      ['/api/runs/{runId}/sheets', 'get'],
      ['/api/runs/{runId}/sheets', 'post'],
      ['/api/sheets/{sheetId}', 'get'],
      ['/api/sheets/{sheetId}', 'patch'],
      ['/api/sheets/{sheetId}', 'delete'],
      ['/api/sheets/{sheetId}/rows', 'get'],
      ['/api/sheets/{sheetId}/assignment', 'put'],
    ] as const) {
      expect(paths[path]?.[method]?.tags, `${method} ${path}`).toEqual(['sheets']);
    }
  });
});
