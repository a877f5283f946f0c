import type { AuditEntry, Channel, Page, Resolution, Run, Sheet, SheetMismatches } from '@dialsheet/common';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { TestMedia } from '../helpers/media';
import { campaignFixture, createChannel, createSyncedRun, openAssignedSheet, type Fixture } from '../helpers/recordings';
import { addMember, bearer, createUser, login, startTestApp, type Http, type TestApp } from '../helpers/test-app';

function call(http: Http, method: 'get' | 'post' | 'put' | 'patch' | 'delete', path: string, token: string) {
  return http[method](path).set(bearer(token));
}

const gauges = [
  { name: 'Cool stream outlet temperature', symbol: 'T4', quantity: 'temperature', rawUnit: '°C', resolution: 0.1, rangeMin: -50, rangeMax: 200 },
  { name: 'Flow meter output', symbol: 'V1', quantity: 'voltage', rawUnit: 'V', resolution: 0.001, rangeMin: 0, rangeMax: 5 },
];

describe('mismatches and resolutions', () => {
  let t: TestApp;
  let media: TestMedia;
  let f: Fixture;
  let run: Run;
  let channels: Channel[];

  /** Two rows (0, 2 s) × two channels, reader and checker assigned. */
  async function openSheet(name: string, checkerId = f.users.checker.id): Promise<Sheet> {
    return openAssignedSheet(t.http, f, run.id, channels.map((c) => c.id), { name, startTime: 0, endTime: 2, interval: 2 }, checkerId);
  }

  async function enter(sheet: Sheet, pass: 1 | 2, token: string, rows: string[][]): Promise<void> {
    for (const [rowIndex, texts] of rows.entries()) {
      const res = await call(t.http, 'put', `/api/sheets/${sheet.id}/rows/${rowIndex}`, token).send({
        pass,
        readings: texts.map((rawText, i) => ({ channelId: channels[i].id, rawText, frameTime: 2 + rowIndex * 2 + 0.017 })),
      });
      expect(res.status, JSON.stringify(res.body)).toBe(200);
    }
  }

  function finish(sheet: Sheet, pass: 1 | 2, token: string) {
    return call(t.http, 'post', `/api/sheets/${sheet.id}/passes/${pass}/finish`, token);
  }

  function resolve(sheet: Sheet, rowIndex: number, channelId: string, body: object, token = f.tokens.checker) {
    return call(t.http, 'put', `/api/sheets/${sheet.id}/resolutions/${rowIndex}/${channelId}`, token).send(body);
  }

  beforeAll(async () => {
    t = await startTestApp();
    media = new TestMedia();
    f = await campaignFixture(t, 'Heat-recovery core resolutions');
    channels = [];
    for (const g of gauges) channels.push(await createChannel(t.http, f.tokens.lead, f.campaign.id, g));
    run = await createSyncedRun(t.http, f.tokens.lead, f.campaign.id, media);
  }, 120_000);
  afterAll(async () => {
    await t.close();
    media.remove();
  });

  it('lists differing and flagged cells only once the checker has finished; the checker then resolves with a reason', async () => {
    const sheet = await openSheet('Blind pass and resolution');
    await enter(sheet, 1, f.tokens.reader, [
      ['18.40', '2.315'],
      ['18.5', '#unreadable'],
    ]);
    expect((await finish(sheet, 1, f.tokens.reader)).status).toBe(200);
    await enter(sheet, 2, f.tokens.checker, [
      ['18.4', '2.351'],
      ['18.50', '2.340'],
    ]);

    // Before pass 2 is finished the list would reveal pass 1: refused to both passes' owners.
    const early = await call(t.http, 'get', `/api/sheets/${sheet.id}/mismatches`, f.tokens.checker);
    expect(early.status).toBe(403);
    expect(early.body.message).toBe('The mismatch list opens once pass 2 is finished');
    expect((await call(t.http, 'get', `/api/sheets/${sheet.id}/mismatches`, f.tokens.reader)).status).toBe(403);
    expect((await call(t.http, 'get', `/api/sheets/${sheet.id}/mismatches`, f.tokens.outsider)).status).toBe(404);
    const tooSoon = await resolve(sheet, 0, channels[1].id, { rawText: '2.315', reason: 'frame' });
    expect(tooSoon.status).toBe(409);

    // The engineer oversees: the list is there, not yet complete.
    const overseen = await call(t.http, 'get', `/api/sheets/${sheet.id}/mismatches`, f.tokens.engineer);
    expect(overseen.status).toBe(200);
    expect((overseen.body as SheetMismatches).complete).toBe(false);

    expect((await finish(sheet, 2, f.tokens.checker)).status).toBe(200);
    const listed = await call(t.http, 'get', `/api/sheets/${sheet.id}/mismatches`, f.tokens.checker);
    expect(listed.status).toBe(200);
    const list = listed.body as SheetMismatches;
    expect(list.complete).toBe(true);
    // "18.40"/"18.4" and "18.5"/"18.50" agree after normalising; V1 differs in row 0 and is flagged in row 1.
    expect(list.cells.map((c) => [c.rowIndex, c.channelId, c.pass1.rawText, c.pass2.rawText])).toEqual([
      [0, channels[1].id, '2.315', '2.351'],
      [1, channels[1].id, '#unreadable', '2.340'],
    ]);
    expect(list.cells[1].testTime).toBe(2);
    expect(list.open).toBe(2);
    expect(list.byChannel).toEqual([
      { channelId: channels[0].id, compared: 2, mismatches: 0, rate: 0 },
      { channelId: channels[1].id, compared: 2, mismatches: 2, rate: 1 },
    ]);

    // A reason is required; a value is parsed like an entry; an agreeing cell has nothing to resolve.
    const noReason = await resolve(sheet, 0, channels[1].id, { rawText: '2.315', reason: '   ' });
    expect(noReason.status).toBe(400);
    expect(JSON.stringify(noReason.body.message)).toContain('reason is required');
    const badValue = await resolve(sheet, 0, channels[1].id, { rawText: '2..315', reason: 'frame' });
    expect(badValue.status).toBe(400);
    const agreeing = await resolve(sheet, 0, channels[0].id, { rawText: '18.4', reason: 'frame' });
    expect(agreeing.status).toBe(409);
    expect(agreeing.body.message).toBe('The two passes agree on this cell, so there is nothing to resolve');
    expect((await resolve(sheet, 0, channels[1].id, { rawText: '2.315', reason: 'x' }, f.tokens.reader)).status).toBe(403);

    const resolved = await resolve(sheet, 0, channels[1].id, { rawText: '2.315', reason: 'The frame at 00:00:02.017 shows 2.315; pass 2 swapped two digits' });
    expect(resolved.status, JSON.stringify(resolved.body)).toBe(200);
    const resolution = resolved.body as Resolution;
    expect(resolution).toMatchObject({ rowIndex: 0, channelId: channels[1].id, rawText: '2.315', value: 2.315, flag: null, resolvedBy: f.users.checker.id, version: 1 });
    // Resending the same resolution is a no-op; a change without the stored version is stale.
    const resent = await resolve(sheet, 0, channels[1].id, { rawText: '2.315', reason: 'The frame at 00:00:02.017 shows 2.315; pass 2 swapped two digits' });
    expect(resent.status).toBe(200);
    expect((resent.body as Resolution).version).toBe(1);
    const stale = await resolve(sheet, 0, channels[1].id, { rawText: '2.351', reason: 'second look' }, f.tokens.lead);
    expect(stale.status).toBe(409);
    expect(stale.body.current).toMatchObject({ rawText: '2.315', version: 1 });
    const changed = await resolve(sheet, 0, channels[1].id, { rawText: '2.316', reason: 'Zoomed in: the last digit is a 6', baseVersion: 1 }, f.tokens.lead);
    expect(changed.status, JSON.stringify(changed.body)).toBe(200);
    expect((changed.body as Resolution).version).toBe(2);

    const after = (await call(t.http, 'get', `/api/sheets/${sheet.id}/mismatches`, f.tokens.lead)).body as SheetMismatches;
    expect(after.open).toBe(1);
    expect(after.resolved).toBe(1);
    expect(after.cells[0].resolution).toMatchObject({ rawText: '2.316', reason: 'Zoomed in: the last digit is a 6' });
    const reader = after.byPerson.find((p) => p.pass === 1);
    const checker = after.byPerson.find((p) => p.pass === 2);
    expect(reader).toMatchObject({ userId: f.users.reader.id, compared: 4, mismatches: 2, wrong: 1 });
    expect(checker).toMatchObject({ userId: f.users.checker.id, compared: 4, mismatches: 2, wrong: 1 });

    const audit = await call(t.http, 'get', `/api/campaigns/${f.campaign.id}/audit?entityType=resolution&limit=50`, f.tokens.lead);
    const entries = (audit.body as Page<AuditEntry>).items.filter((e) => (e.after as { sheetId?: string } | null)?.sheetId === sheet.id);
    expect(entries.map((e) => [e.action, (e.after as { rawText: string }).rawText, e.reason])).toEqual(
      expect.arrayContaining([
        ['create', '2.315', 'The frame at 00:00:02.017 shows 2.315; pass 2 swapped two digits'],
        ['update', '2.316', 'Zoomed in: the last digit is a 6'],
      ]),
    );
    expect(entries).toHaveLength(2);
  });

  it('a finished pass no longer changes, but a resend of what is stored still succeeds', async () => {
    const sheet = await openSheet('Finished pass is frozen');
    await enter(sheet, 1, f.tokens.reader, [
      ['20.0', '1.000'],
      ['20.1', '1.001'],
    ]);
    expect((await finish(sheet, 1, f.tokens.reader)).status).toBe(200);
    const resend = await call(t.http, 'put', `/api/sheets/${sheet.id}/rows/0`, f.tokens.reader).send({
      pass: 1,
      readings: [{ channelId: channels[0].id, rawText: '20.0', frameTime: 2.017 }],
    });
    expect(resend.status, JSON.stringify(resend.body)).toBe(200);
    const change = await call(t.http, 'put', `/api/sheets/${sheet.id}/rows/0`, f.tokens.reader).send({
      pass: 1,
      readings: [{ channelId: channels[0].id, rawText: '20.9', frameTime: 2.017, baseVersion: 1 }],
    });
    expect(change.status).toBe(409);
    expect(change.body.message).toMatch(/^Pass 1 was finished on .* and no longer changes; a wrong value is corrected by resolving it as a mismatch$/);
    const stored = await call(t.http, 'get', `/api/sheets/${sheet.id}/readings?pass=1`, f.tokens.reader);
    expect(stored.body[0]).toMatchObject({ rawText: '20.0', version: 1 });
  });

  it('a Lead who is also the checker stays blind: no mismatch list and no resolution before finishing pass 2', async () => {
    const leadChecker = await createUser(t.dataSource, { name: 'Lee Lead-and-checker' });
    await addMember(t.dataSource, f.campaign.id, leadChecker.id, ['lead', 'checker']);
    const token = await login(t.http, leadChecker.email);
    const sheet = await openSheet('Lead as checker', leadChecker.id);
    await enter(sheet, 1, f.tokens.reader, [
      ['19.0', '1.5'],
      ['19.1', '1.6'],
    ]);
    expect((await call(t.http, 'get', `/api/sheets/${sheet.id}/mismatches`, token)).status).toBe(403);
    expect((await call(t.http, 'get', `/api/sheets/${sheet.id}/readings?pass=1`, token)).status).toBe(403);
    expect((await resolve(sheet, 0, channels[0].id, { rawText: '19.0', reason: 'peek' }, token)).status).toBe(409);
  });

  it('released data is locked: saves, resolutions, sheet changes and run changes are refused with 409 naming the release', async () => {
    const sheet = await openSheet('Locked by a release');
    await enter(sheet, 1, f.tokens.reader, [['21.0', '1.1']]);
    // A published release row as signing leaves it (the release routes have their own tests);
    // the lock must name a release that exists.
    const [{ lead }] = (await t.dataSource.query(
      `SELECT user_id AS lead FROM campaign_members WHERE campaign_id = $1 AND 'lead' = ANY(roles) LIMIT 1`,
      [f.campaign.id],
    )) as Array<{ lead: string }>;
    const [{ id: releaseId }] = (await t.dataSource.query(
      `INSERT INTO releases (campaign_id, number, status, title, run_ids, requested_by, signed_by, signed_at, content_hash, reading_count, snapshot_key)
       VALUES ($1, 4, 'published', 'Lock test', ARRAY[$2]::uuid[], $3, $3, now(), repeat('a', 64), 0, 'releases/lock-test.jsonl')
       RETURNING id`,
      [f.campaign.id, run.id, lead],
    )) as Array<{ id: string }>;
    await t.dataSource.query('UPDATE runs SET locked_release_id = $1, locked_release_number = 4 WHERE id = $2', [releaseId, run.id]);
    try {
      const locked = /locked by release 4/;
      const saveRow = await call(t.http, 'put', `/api/sheets/${sheet.id}/rows/1`, f.tokens.reader).send({
        pass: 1,
        readings: [{ channelId: channels[0].id, rawText: '21.1' }],
      });
      expect(saveRow.status).toBe(409);
      expect(saveRow.body.message).toMatch(locked);
      const finishPass = await finish(sheet, 1, f.tokens.reader);
      expect(finishPass.status).toBe(409);
      expect(finishPass.body.message).toMatch(locked);
      const rename = await call(t.http, 'patch', `/api/sheets/${sheet.id}`, f.tokens.lead).send({ name: 'Renamed' });
      expect(rename.status).toBe(409);
      expect(rename.body.message).toMatch(locked);
      const newSheet = await call(t.http, 'post', `/api/runs/${run.id}/sheets`, f.tokens.lead).send({
        name: 'Another',
        startTime: 0,
        endTime: 2,
        interval: 2,
        channelIds: [channels[0].id],
      });
      expect(newSheet.status).toBe(409);
      const runEdit = await call(t.http, 'patch', `/api/runs/${run.id}`, f.tokens.lead).send({ notes: 'late note' });
      expect(runEdit.status).toBe(409);
      expect(runEdit.body.message).toMatch(locked);
      const shown = await call(t.http, 'get', `/api/sheets/${sheet.id}`, f.tokens.reader);
      expect(shown.status).toBe(200);
      expect((shown.body as Sheet).lock).toEqual({ releaseId, releaseNumber: 4 });
      // Reading stays allowed.
      expect((await call(t.http, 'get', `/api/sheets/${sheet.id}/readings?pass=1`, f.tokens.reader)).status).toBe(200);
    } finally {
      await t.dataSource.query('UPDATE runs SET locked_release_id = NULL, locked_release_number = NULL WHERE id = $1', [run.id]);
    }
  });
});
