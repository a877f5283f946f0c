import type { AuditEntry, Channel, Page, PassFinish, Reading, Run, SaveRowResponse, Sheet } from '@dialsheet/common';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { TestMedia } from '../helpers/media';
import { campaignFixture, createChannel, createSyncedRun, openAssignedSheet, upload, type Fixture } from '../helpers/recordings';
import { bearer, startTestApp, type Http, type TestApp } from '../helpers/test-app';

function call(http: Http, method: 'get' | 'post' | 'put' | 'patch' | 'delete', path: string, token: string) {
  return http[method](path).set(bearer(token));
}

const gauges = [
  { name: 'Warm stream inlet temperature', symbol: 'T1', quantity: 'temperature', rawUnit: '°C', resolution: 0.1, rangeMin: -50, rangeMax: 200, plausibleMin: 5, plausibleMax: 90 },
  { name: 'Supply pressure', symbol: 'P1', quantity: 'pressure', rawUnit: 'kPa', resolution: 1, rangeMin: 0, rangeMax: 600, operatingMin: 0, operatingMax: 400 },
];

describe('readings', () => {
  let t: TestApp;
  let media: TestMedia;
  let f: Fixture;
  let run: Run;
  let channels: Channel[];

  /** Three rows (0, 2, 4 s) × two channels, reader and checker assigned. */
  async function openSheet(name: string): Promise<Sheet> {
    return openAssignedSheet(t.http, f, run.id, channels.map((c) => c.id), { name, startTime: 0, endTime: 4, interval: 2 });
  }

  function save(sheet: Sheet, rowIndex: number, body: object, token = f.tokens.reader) {
    return call(t.http, 'put', `/api/sheets/${sheet.id}/rows/${rowIndex}`, token).send(body);
  }

  async function readingAudit(): Promise<AuditEntry[]> {
    const res = await call(t.http, 'get', `/api/campaigns/${f.campaign.id}/audit?entityType=reading&limit=200`, f.tokens.lead);
    expect(res.status).toBe(200);
    return (res.body as Page<AuditEntry>).items;
  }

  async function listPass(sheet: Sheet, pass: 1 | 2, token: string) {
    return call(t.http, 'get', `/api/sheets/${sheet.id}/readings?pass=${pass}`, token);
  }

  beforeAll(async () => {
    t = await startTestApp();
    media = new TestMedia();
    f = await campaignFixture(t, 'Heat-recovery core readings');
    channels = [];
    for (const g of gauges) channels.push(await createChannel(t.http, f.tokens.lead, f.campaign.id, g));
    run = await createSyncedRun(t.http, f.tokens.lead, f.campaign.id, media);
  }, 120_000);
  afterAll(async () => {
    await t.close();
    media.remove();
  });

  it('saves a row exactly as typed; an identical resend returns the same version and writes nothing', async () => {
    const sheet = await openSheet('Idempotent saves');
    const body = {
      pass: 1,
      readings: [
        { channelId: channels[0].id, rawText: '21.50', frameTime: 2.02 },
        { channelId: channels[1].id, rawText: '#unreadable', frameTime: 2.02 },
      ],
    };
    const auditBefore = (await readingAudit()).length;
    const first = await save(sheet, 0, body);
    expect(first.status, JSON.stringify(first.body)).toBe(200);
    const saved = (first.body as SaveRowResponse).readings;
    expect(saved).toEqual([
      {
        sheetId: sheet.id,
        rowIndex: 0,
        channelId: channels[0].id,
        pass: 1,
        rawText: '21.50',
        value: 21.5,
        flag: null,
        frameTime: 2.02,
        enteredBy: f.users.reader.id,
        version: 1,
        updatedAt: expect.any(String),
        warnings: [],
      },
      {
        sheetId: sheet.id,
        rowIndex: 0,
        channelId: channels[1].id,
        pass: 1,
        rawText: '#unreadable',
        value: null,
        flag: 'unreadable',
        frameTime: 2.02,
        enteredBy: f.users.reader.id,
        version: 1,
        updatedAt: expect.any(String),
        warnings: [],
      },
    ]);
    const created = await readingAudit();
    expect(created.length).toBe(auditBefore + 2);
    expect(created.filter((e) => e.action === 'create').map((e) => (e.after as { rawText: string }).rawText)).toEqual(
      expect.arrayContaining(['21.50', '#unreadable']),
    );

    for (const resend of [body, { ...body, rowIndex: 0 }, { ...body, readings: body.readings.map((r) => ({ ...r, baseVersion: 1 })) }]) {
      const again = await save(sheet, 0, resend);
      expect(again.status, JSON.stringify(again.body)).toBe(200);
      expect((again.body as SaveRowResponse).readings).toEqual(saved);
    }
    expect((await readingAudit()).length).toBe(auditBefore + 2);

    const progress = await call(t.http, 'get', `/api/sheets/${sheet.id}`, f.tokens.reader);
    expect(progress.body.progress).toEqual({ pass1: { done: 2, total: 6 }, pass2: { done: 0, total: 6 } });
    const mismatch = await save(sheet, 1, { ...body, rowIndex: 0 });
    expect(mismatch.status).toBe(400);
    expect(mismatch.body.message).toBe('rowIndex in the body (0) must equal the row in the path (1)');
  });

  it('a change needs the stored version: a stale one gets 409 with the stored reading', async () => {
    const sheet = await openSheet('Stale edits');
    const cell = (rawText: string, baseVersion?: number | null) => ({ pass: 1, readings: [{ channelId: channels[0].id, rawText, frameTime: 4, baseVersion }] });
    expect((await save(sheet, 2, cell('30.1'))).status).toBe(200);
    const changed = await save(sheet, 2, cell('30.7', 1));
    expect(changed.status, JSON.stringify(changed.body)).toBe(200);
    expect((changed.body as SaveRowResponse).readings[0]).toMatchObject({ rawText: '30.7', value: 30.7, version: 2 });
    const trail = (await readingAudit()).find((e) => e.action === 'update' && (e.after as { rawText: string }).rawText === '30.7');
    expect(trail?.before).toMatchObject({ rawText: '30.1', version: 1 });
    expect(trail?.after).toMatchObject({ rawText: '30.7', version: 2, rowIndex: 2, pass: 1 });

    const auditBefore = (await readingAudit()).length;
    for (const stale of [cell('31.0', 1), cell('31.0'), cell('31.0', null)]) {
      const res = await save(sheet, 2, stale);
      expect(res.status).toBe(409);
      expect(res.body.message).toMatch(/^This value was changed elsewhere/);
      expect(res.body.current).toMatchObject({ channelId: channels[0].id, rowIndex: 2, pass: 1, rawText: '30.7', version: 2 });
    }
    const firstClaimingVersion = await save(sheet, 1, cell('12.0', 3));
    expect(firstClaimingVersion.status).toBe(409);
    expect(firstClaimingVersion.body.current).toBeNull();
    expect((await readingAudit()).length).toBe(auditBefore);
    const stored = await listPass(sheet, 1, f.tokens.reader);
    expect((stored.body as Reading[]).map((r) => [r.rowIndex, r.rawText, r.version])).toEqual([[2, '30.7', 2]]);
  });

  it('a value the parser refuses fails the whole row with 400 naming the channel; limits only warn', async () => {
    const sheet = await openSheet('Parse errors and limits');
    const bad = await save(sheet, 1, {
      pass: 1,
      readings: [
        { channelId: channels[0].id, rawText: '40.2' },
        { channelId: channels[1].id, rawText: '1 234' },
      ],
    });
    expect(bad.status).toBe(400);
    expect(bad.body.message).toEqual([expect.stringMatching(/^readings\.1\.rawText \(P1\): \S/)]);
    expect((await listPass(sheet, 1, f.tokens.reader)).body).toEqual([]);

    const outOfRange = await save(sheet, 1, {
      pass: 1,
      readings: [
        { channelId: channels[0].id, rawText: '95.0' },
        { channelId: channels[1].id, rawText: '450' },
      ],
    });
    expect(outOfRange.status, JSON.stringify(outOfRange.body)).toBe(200);
    const [t1, p1] = (outOfRange.body as SaveRowResponse).readings;
    expect(t1.warnings.map((w) => w.code)).toEqual(['above-plausible']);
    expect(p1.warnings.map((w) => w.code)).toEqual(['outside-operating']);
    const listed = (await listPass(sheet, 1, f.tokens.lead)).body as Reading[];
    expect(listed.map((r) => [r.rawText, r.warnings.length])).toEqual([
      ['95.0', 1],
      ['450', 1],
    ]);

    const outside = await save(sheet, 3, { pass: 1, readings: [{ channelId: channels[0].id, rawText: '1' }] });
    expect(outside.status).toBe(400);
    expect(outside.body.message).toBe('rowIndex must be a row of this sheet, from 0 to 2, got 3');
    const foreign = await save(sheet, 0, { pass: 1, readings: [{ channelId: sheet.id, rawText: '1' }] });
    expect(foreign.status).toBe(400);
    expect(foreign.body.message).toEqual(['readings.0.channelId is not a channel of this sheet']);
  });

  it('only the assigned person types into a pass, whatever roles others hold', async () => {
    const sheet = await openSheet('Pass owners');
    const row = (pass: number) => ({ pass, readings: [{ channelId: channels[0].id, rawText: '20.0' }] });
    for (const [actor, pass] of [
      ['reader', 2],
      ['checker', 1],
      ['lead', 1],
      ['engineer', 2],
    ] as const) {
      const res = await save(sheet, 0, row(pass), f.tokens[actor]);
      expect(res.status, `${actor} pass ${pass}`).toBe(403);
      expect(res.body.message).toBe(`Only the sheet’s assigned ${pass === 1 ? 'reader' : 'checker'} may enter or finish pass ${pass}`);
    }
    expect((await save(sheet, 0, row(2), f.tokens.checker)).status).toBe(200);
    expect((await save(sheet, 0, row(3), f.tokens.reader)).status).toBe(400);
    expect((await call(t.http, 'put', `/api/sheets/${sheet.id}/rows/0`, f.tokens.outsider).send(row(1))).status).toBe(404);
  });

  it('pass 1 stays hidden from the checker until pass 2 is finished, which needs every cell', async () => {
    const sheet = await openSheet('Blind second pass');
    const values = ['20.1', '101', '20.4', '102', '20.9', '104'];
    for (const row of [0, 1, 2]) {
      const res = await save(sheet, row, {
        pass: 1,
        readings: channels.map((c, i) => ({ channelId: c.id, rawText: values[row * 2 + i], frameTime: 2 + row * 2 })),
      });
      expect(res.status, JSON.stringify(res.body)).toBe(200);
    }
    const hidden = await listPass(sheet, 1, f.tokens.checker);
    expect(hidden.status).toBe(403);
    expect(hidden.body.message).toBe('Pass 1 is hidden until you finish pass 2');
    expect(hidden.body).not.toHaveProperty('current');
    const readerEarly = await listPass(sheet, 2, f.tokens.reader);
    expect(readerEarly.status).toBe(403);
    expect(readerEarly.body.message).toBe('Pass 2 is hidden until the checker finishes it');
    for (const actor of ['reader', 'lead', 'engineer'] as const) expect((await listPass(sheet, 1, f.tokens[actor])).status, actor).toBe(200);
    expect((await listPass(sheet, 3 as 1, f.tokens.lead)).status).toBe(400);

    const checkerRow = (row: number) => ({ pass: 2, readings: channels.map((c, i) => ({ channelId: c.id, rawText: values[row * 2 + i] })) });
    expect((await save(sheet, 0, checkerRow(0), f.tokens.checker)).status).toBe(200);
    const early = await call(t.http, 'post', `/api/sheets/${sheet.id}/passes/2/finish`, f.tokens.checker);
    expect(early.status).toBe(409);
    expect(early.body.message).toMatch(/^Pass 2 cannot be finished: 4 of 6 cells have no entry yet/);
    expect((await listPass(sheet, 1, f.tokens.checker)).status).toBe(403);
    expect((await call(t.http, 'post', `/api/sheets/${sheet.id}/passes/2/finish`, f.tokens.reader)).status).toBe(403);

    for (const row of [1, 2]) expect((await save(sheet, row, checkerRow(row), f.tokens.checker)).status).toBe(200);
    const done = await call(t.http, 'post', `/api/sheets/${sheet.id}/passes/2/finish`, f.tokens.checker);
    expect(done.status, JSON.stringify(done.body)).toBe(200);
    expect(done.body as PassFinish).toEqual({ sheetId: sheet.id, pass: 2, finishedAt: expect.any(String) });
    const again = await call(t.http, 'post', `/api/sheets/${sheet.id}/passes/2/finish`, f.tokens.checker);
    expect(again.body).toEqual(done.body);

    const revealed = await listPass(sheet, 1, f.tokens.checker);
    expect(revealed.status).toBe(200);
    expect((revealed.body as Reading[]).map((r) => r.rawText)).toEqual(values);
    expect((await listPass(sheet, 2, f.tokens.reader)).status).toBe(200);
    const readerFinish = await call(t.http, 'post', `/api/sheets/${sheet.id}/passes/1/finish`, f.tokens.reader);
    expect(readerFinish.status).toBe(200);
    const progress = await call(t.http, 'get', `/api/sheets/${sheet.id}`, f.tokens.lead);
    expect(progress.body.progress).toEqual({ pass1: { done: 6, total: 6 }, pass2: { done: 6, total: 6 } });
  });
  it('readings keep their channel, sheet, run and recording: deleting or replacing any of them is refused (409)', async () => {
    const spare = await call(t.http, 'post', `/api/campaigns/${f.campaign.id}/channels`, f.tokens.lead).send({
      ...gauges[0],
      name: 'Spare thermometer',
      symbol: 'T9',
    });
    expect(spare.status, JSON.stringify(spare.body)).toBe(201);
    const spareId = (spare.body as Channel).id;
    const made = await call(t.http, 'post', `/api/runs/${run.id}/sheets`, f.tokens.engineer).send({
      name: 'Spare channel',
      startTime: 0,
      endTime: 4,
      interval: 2,
      channelIds: [spareId],
    });
    expect(made.status, JSON.stringify(made.body)).toBe(201);
    const sheet = made.body as Sheet;
    const assigned = await call(t.http, 'put', `/api/sheets/${sheet.id}/assignment`, f.tokens.lead).send({
      readerId: f.users.reader.id,
      checkerId: f.users.checker.id,
    });
    expect(assigned.status).toBe(200);
    expect((await save(sheet, 0, { pass: 1, readings: [{ channelId: spareId, rawText: '21.5' }] })).status).toBe(200);

    const moved = await call(t.http, 'patch', `/api/sheets/${sheet.id}`, f.tokens.engineer).send({ channelIds: [channels[0].id] });
    expect(moved.status, JSON.stringify(moved.body)).toBe(200);
    const refused = await call(t.http, 'delete', `/api/channels/${spareId}`, f.tokens.lead);
    expect(refused.status, JSON.stringify(refused.body)).toBe(409);
    expect(refused.body.message).toMatch(/1 reading on record/);
    const still = await call(t.http, 'get', `/api/campaigns/${f.campaign.id}/channels`, f.tokens.lead);
    expect((still.body as Channel[]).map((c) => c.id)).toContain(spareId);

    // Deleting the sheet would cascade its readings away: refused too, and the reading stays.
    const sheetDelete = await call(t.http, 'delete', `/api/sheets/${sheet.id}`, f.tokens.lead);
    expect(sheetDelete.status, JSON.stringify(sheetDelete.body)).toBe(409);
    expect(sheetDelete.body.message).toMatch(/holds 1 reading/);
    // The sheet no longer lists the channel, so the pass listing omits it; the refusal proves the reading is still stored.
    const again = await call(t.http, 'delete', `/api/channels/${spareId}`, f.tokens.lead);
    expect(again.status).toBe(409);
    expect(again.body.message).toMatch(/1 reading on record/);

    // The run's recording and the run itself hold the readings' frames: both are kept from now on.
    for (const [method, path] of [
      ['delete', `/api/runs/${run.id}/recording`],
      ['delete', `/api/runs/${run.id}`],
    ] as const) {
      const res = await call(t.http, method, path, f.tokens.lead);
      expect(res.status, `${path} ${JSON.stringify(res.body)}`).toBe(409);
      expect(res.body.message).toMatch(/reading.* typed from its recording/);
    }
    const replacement = await upload(t.http, f.tokens.lead, run.id, await media.unique(media.minute()));
    expect(replacement.status, JSON.stringify(replacement.body)).toBe(409);
    expect(replacement.body.message).toMatch(/cannot replace its recording/);
    expect((await call(t.http, 'get', `/api/runs/${run.id}/recording`, f.tokens.lead)).body.status).toBe('ready');
  });
  it('counts progress on the sheet’s current plan only: entries off a shortened plan or a dropped channel are kept, not counted', async () => {
    const sheet = await openSheet('Progress on the current plan');
    // Rows 0 (0 s) and 2 (4 s), both channels: four of six cells.
    for (const rowIndex of [0, 2]) {
      const saved = await save(sheet, rowIndex, {
        pass: 1,
        rowIndex,
        readings: [
          { channelId: channels[0].id, rawText: '21.5', frameTime: 2 + rowIndex * 2 },
          { channelId: channels[1].id, rawText: '3.2', frameTime: 2 + rowIndex * 2 },
        ],
      });
      expect(saved.status, JSON.stringify(saved.body)).toBe(200);
    }
    const progressOf = async () => (await call(t.http, 'get', `/api/sheets/${sheet.id}`, f.tokens.lead)).body.progress;
    expect(await progressOf()).toEqual({ pass1: { done: 4, total: 6 }, pass2: { done: 0, total: 6 } });
    // Shortened to rows 0 and 1 (0–2 s): row 2's entries stay stored but no longer count.
    const shorter = await call(t.http, 'patch', `/api/sheets/${sheet.id}`, f.tokens.lead).send({ endTime: 2 });
    expect(shorter.status, JSON.stringify(shorter.body)).toBe(200);
    expect(shorter.body.progress).toEqual({ pass1: { done: 2, total: 4 }, pass2: { done: 0, total: 4 } });
    // The second channel dropped: one cell of two.
    const fewer = await call(t.http, 'patch', `/api/sheets/${sheet.id}`, f.tokens.lead).send({ channelIds: [channels[0].id] });
    expect(fewer.status, JSON.stringify(fewer.body)).toBe(200);
    expect(await progressOf()).toEqual({ pass1: { done: 1, total: 2 }, pass2: { done: 0, total: 2 } });
    // Both back: every entry counts again, nothing was lost.
    const back = await call(t.http, 'patch', `/api/sheets/${sheet.id}`, f.tokens.lead).send({ endTime: 4, channelIds: channels.map((c) => c.id) });
    expect(back.status, JSON.stringify(back.body)).toBe(200);
    expect(await progressOf()).toEqual({ pass1: { done: 4, total: 6 }, pass2: { done: 0, total: 6 } });
  });
});
