import type { Analysis, AuditEntry, CampaignDashboard, Page, Release, Run, Sheet } from '@dialsheet/common';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { TestMedia } from '../helpers/media';
import { createSyncedRun } from '../helpers/recordings';
import { startTestApp, type TestApp } from '../helpers/test-app';
import { call, enter, finish, FLOW_CHAIN, openSheet, releaseWorld, resolve, signRelease, typedSheet, type ReleaseWorld } from './release-fixture';

async function auditOf(t: TestApp, w: ReleaseWorld, entityType: string): Promise<AuditEntry[]> {
  const res = await call(t.http, 'get', `/api/campaigns/${w.f.campaign.id}/audit?entityType=${entityType}&limit=200`, w.f.tokens.lead);
  expect(res.status).toBe(200);
  return (res.body as Page<AuditEntry>).items;
}

describe('releases: request, sign, lock, correction, new version', () => {
  let t: TestApp;
  let media: TestMedia;
  let w: ReleaseWorld;

  beforeAll(async () => {
    t = await startTestApp();
    media = new TestMedia();
    w = await releaseWorld(t, media, 'Heat-recovery core releases');
  }, 120_000);
  afterAll(async () => {
    await t.close();
    media.remove();
  });

  it('takes a request from an engineer, refuses to sign unfinished data with a list of what is open, then signs it as release 1', async () => {
    const { f } = w;
    const sheet = await openSheet(t, w, 'Soak, first look');
    await enter(t, w, sheet, 1, [
      ['21.4', '2.315'],
      ['21.6', '2.320'],
    ]);

    const base = `/api/campaigns/${f.campaign.id}/releases`;
    // Readers and checkers cannot ask; strangers learn nothing; bad input is a clear 400.
    expect((await call(t.http, 'post', base, f.tokens.reader).send({ title: 'x', runIds: [w.run.id] })).status).toBe(403);
    expect((await call(t.http, 'post', base, f.tokens.outsider).send({ title: 'x', runIds: [w.run.id] })).status).toBe(404);
    const noTitle = await call(t.http, 'post', base, f.tokens.engineer).send({ title: '  ', runIds: [w.run.id] });
    expect(noTitle.status).toBe(400);
    expect(JSON.stringify(noTitle.body.message)).toContain('title is required');
    const noRuns = await call(t.http, 'post', base, f.tokens.engineer).send({ title: 'x', runIds: [] });
    expect(noRuns.status).toBe(400);
    expect(JSON.stringify(noRuns.body.message)).toContain('runIds must list at least one run');
    const strange = '00000000-0000-4000-8000-000000000000';
    const foreign = await call(t.http, 'post', base, f.tokens.engineer).send({ title: 'x', runIds: [strange] });
    expect(foreign.status).toBe(400);
    expect(JSON.stringify(foreign.body.message)).toContain(`${strange} is not a run of this campaign`);
    // Only a lead signs, even in the same call.
    const selfSigned = await call(t.http, 'post', base, f.tokens.engineer).send({ title: 'x', runIds: [w.run.id], sign: true });
    expect(selfSigned.status).toBe(403);

    const requested = await call(t.http, 'post', base, f.tokens.engineer).send({ title: 'Soak run, checked', note: 'first look', runIds: [w.run.id] });
    expect(requested.status, JSON.stringify(requested.body)).toBe(201);
    const request = requested.body as Release;
    expect(request).toMatchObject({
      status: 'requested',
      number: null,
      title: 'Soak run, checked',
      runIds: [w.run.id],
      requestedBy: { id: f.users.engineer.id, displayName: f.users.engineer.name },
      signedBy: null,
      contentHash: null,
    });
    // Any member reads it; only a lead signs it.
    expect((await call(t.http, 'get', `/api/releases/${request.id}`, f.tokens.reader)).status).toBe(200);
    expect((await call(t.http, 'get', `/api/releases/${request.id}`, f.tokens.outsider)).status).toBe(404);
    expect((await call(t.http, 'post', `/api/releases/${request.id}/sign`, f.tokens.engineer).send({})).status).toBe(403);

    // Neither pass is finished: the sign is refused, naming the run and the sheet.
    const early = await call(t.http, 'post', `/api/releases/${request.id}/sign`, f.tokens.lead).send({});
    expect(early.status).toBe(409);
    expect(early.body.message).toBe(`The release cannot be signed yet: run “${w.run.name}”: sheet Soak, first look (passes 1 and 2 unfinished)`);

    await finish(t, w, sheet, 1);
    await enter(t, w, sheet, 2, [
      ['21.40', '2.351'],
      ['21.6', '2.320'],
    ]);
    await finish(t, w, sheet, 2);
    const open = await call(t.http, 'post', `/api/releases/${request.id}/sign`, f.tokens.lead).send({});
    expect(open.status).toBe(409);
    expect(open.body.message).toBe(`The release cannot be signed yet: run “${w.run.name}”: 1 open mismatch to resolve`);
    // Nothing was numbered or locked by the refusals.
    expect((await call(t.http, 'get', `/api/releases/${request.id}`, f.tokens.lead)).body).toMatchObject({ status: 'requested', number: null });

    await resolve(t, w, sheet, 0, w.V.id, '2.315', 'The frame shows 2.315');
    const signed = await call(t.http, 'post', `/api/releases/${request.id}/sign`, f.tokens.lead).send({ note: 'Signed after the resolution' });
    expect(signed.status, JSON.stringify(signed.body)).toBe(200);
    const release = signed.body as Release;
    expect(release).toMatchObject({
      status: 'published',
      number: 1,
      note: 'Signed after the resolution',
      readingCount: 4,
      signedBy: { id: f.users.lead.id },
      supersedesId: null,
      supersededById: null,
    });
    expect(release.contentHash).toMatch(/^[0-9a-f]{64}$/);
    const again = await call(t.http, 'post', `/api/releases/${request.id}/sign`, f.tokens.lead).send({});
    expect(again.status).toBe(409);
    expect(again.body.message).toBe('This release is already published as release 1');

    // The run carries the lock; the trail has the request, the signature and the lock.
    const run = (await call(t.http, 'get', `/api/runs/${w.run.id}`, f.tokens.reader)).body as Run & { lock?: unknown };
    const [row] = (await t.dataSource.query('SELECT locked_release_id, locked_release_number FROM runs WHERE id = $1', [w.run.id])) as Array<{
      locked_release_id: string;
      locked_release_number: number;
    }>;
    expect(row).toEqual({ locked_release_id: release.id, locked_release_number: 1 });
    expect(run.id).toBe(w.run.id);
    const trail = await auditOf(t, w, 'release');
    expect(trail.map((e) => [e.action, e.reason])).toEqual([
      ['update', 'Release 1 signed'],
      ['create', 'Release requested'],
    ]);
    const runTrail = await auditOf(t, w, 'run');
    expect(runTrail[0]).toMatchObject({ entityId: w.run.id, action: 'update', reason: 'Locked by release 1', after: { lockedReleaseNumber: 1 } });

    // A published release cannot be changed even with SQL access.
    await expect(t.dataSource.query(`UPDATE releases SET title = 'changed' WHERE id = $1`, [release.id])).rejects.toThrow(/published and cannot be changed/);
  });

  it('refuses every write to a released run’s data with a 409 naming the release number', async () => {
    const { f } = w;
    const [{ id: sheetId }] = (await t.dataSource.query('SELECT id FROM sheets WHERE run_id = $1', [w.run.id])) as Array<{ id: string }>;
    const message = `Run “${w.run.name}” is locked by release 1: its data can no longer change; a correction needs a new release version`;
    const writes: Array<[string, 'post' | 'put' | 'patch' | 'delete', string, object]> = [
      ['reader', 'put', `/api/sheets/${sheetId}/rows/0`, { pass: 1, readings: [{ channelId: w.T.id, rawText: '22.0' }] }],
      ['checker', 'post', `/api/sheets/${sheetId}/passes/2/finish`, {}],
      ['lead', 'put', `/api/sheets/${sheetId}/resolutions/0/${w.V.id}`, { rawText: '2.351', reason: 'second look' }],
      ['engineer', 'patch', `/api/sheets/${sheetId}`, { name: 'Renamed' }],
      ['lead', 'put', `/api/sheets/${sheetId}/assignment`, { readerId: null }],
      ['lead', 'delete', `/api/sheets/${sheetId}`, {}],
      ['engineer', 'post', `/api/runs/${w.run.id}/sheets`, { name: 'More', startTime: 0, endTime: 2, interval: 1, channelIds: [w.T.id] }],
      ['lead', 'patch', `/api/runs/${w.run.id}`, { notes: 'late note' }],
      ['lead', 'delete', `/api/runs/${w.run.id}`, {}],
      ['lead', 'put', `/api/runs/${w.run.id}/sync`, { first: { videoTime: 3, testTime: 0 } }],
      ['lead', 'delete', `/api/runs/${w.run.id}/recording`, {}],
      ['engineer', 'put', `/api/runs/${w.run.id}/display-regions`, { regions: [{ channelId: w.T.id, x: 0.1, y: 0.1, width: 0.2, height: 0.1 }] }],
      ['engineer', 'put', `/api/channels/${w.V.id}/calibration`, { chain: { steps: [{ ...FLOW_CHAIN.steps[0], a: 41 }] }, baseVersion: 1 }],
    ];
    for (const [actor, method, path, body] of writes) {
      const res = await call(t.http, method, path, f.tokens[actor as 'lead']).send(body);
      expect(res.status, `${method} ${path}: ${JSON.stringify(res.body)}`).toBe(409);
      expect(JSON.stringify(res.body.message), `${method} ${path}`).toContain(method === 'put' && path.includes('calibration') ? 'release 1' : message);
    }
  });

  it('opens a correction (lead, with a reason), lets the data change, and signs the next version superseding release 1', async () => {
    const { f } = w;
    const path = `/api/runs/${w.run.id}/correction`;
    expect((await call(t.http, 'post', path, f.tokens.engineer).send({ reason: 'typo' })).status).toBe(403);
    const noReason = await call(t.http, 'post', path, f.tokens.lead).send({ reason: ' ' });
    expect(noReason.status).toBe(400);
    expect(JSON.stringify(noReason.body.message)).toContain('reason is required');
    const opened = await call(t.http, 'post', path, f.tokens.lead).send({ reason: 'Row 1 T1 re-read from the frame' });
    expect(opened.status, JSON.stringify(opened.body)).toBe(200);
    expect(opened.body).toEqual({ runId: w.run.id, releaseNumber: 1 });
    expect((await call(t.http, 'post', path, f.tokens.lead).send({ reason: 'again' })).status).toBe(409);
    const trail = await auditOf(t, w, 'run');
    expect(trail[0]).toMatchObject({ action: 'update', reason: 'Correction opened on release 1: Row 1 T1 re-read from the frame', after: { lockedReleaseNumber: null } });

    // The data may change again (a lead resolves differently).
    const [{ id: sheetId }] = (await t.dataSource.query('SELECT id FROM sheets WHERE run_id = $1', [w.run.id])) as Array<{ id: string }>;
    const changed = await call(t.http, 'put', `/api/sheets/${sheetId}/resolutions/0/${w.V.id}`, f.tokens.lead).send({
      rawText: '2.316',
      reason: 'Zoomed in: the last digit is a 6',
      baseVersion: 1,
    });
    expect(changed.status, JSON.stringify(changed.body)).toBe(200);

    const [first] = ((await call(t.http, 'get', `/api/campaigns/${f.campaign.id}/releases`, f.tokens.reader)).body as Release[]).filter((r) => r.number === 1);
    const second = await signRelease(t, w, 'Soak run, corrected');
    expect(second).toMatchObject({ status: 'published', number: 2, supersedesId: first.id, readingCount: 4 });
    expect(second.contentHash).not.toBe(first.contentHash);
    expect((await call(t.http, 'get', `/api/releases/${first.id}`, f.tokens.lead)).body).toMatchObject({ number: 1, supersededById: second.id, contentHash: first.contentHash });
    const release = (await auditOf(t, w, 'release'))[0];
    expect(release.reason).toBe('Release 2 signed; supersedes release 1');
  });

  it('keeps the analyses as signed: the release answers with the stable value frozen in its snapshot', async () => {
    // A campaign of its own: the dashboard test below counts this campaign's mismatches.
    const w = await releaseWorld(t, media, 'Heat-recovery core frozen analyses');
    const run = w.run;
    // Two sheets on the run give four readings of T1 (at 0 and 2 s twice): enough for a fit.
    await typedSheet(t, w, 'Frozen analysis A', run);
    await typedSheet(t, w, 'Frozen analysis B', run);
    const created = await call(t.http, 'post', `/api/campaigns/${w.f.campaign.id}/analyses`, w.f.tokens.engineer).send({
      kind: 'stable-value',
      name: 'T1 at 2 s, frozen',
      input: { runId: run.id, channelId: w.T.id, window: { from: 0, to: 2 }, tStar: 2 },
    });
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    const live = created.body as Analysis;
    const draftAsk = await call(t.http, 'post', `/api/campaigns/${w.f.campaign.id}/releases`, w.f.tokens.engineer).send({ title: 'Not signed yet', runIds: [run.id] });
    expect((await call(t.http, 'get', `/api/releases/${(draftAsk.body as Release).id}/analyses`, w.f.tokens.lead)).status).toBe(409);
    const release = await signRelease(t, w, 'Frozen analyses', [run.id]);

    const res = await call(t.http, 'get', `/api/releases/${release.id}/analyses`, w.f.tokens.reader);
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const frozen = (res.body as Analysis[]).find((a) => a.id === live.id);
    expect(frozen).toBeDefined();
    expect(frozen!.input).toEqual(live.input);
    expect(frozen!.result).toEqual(live.result);
    expect(frozen!.status).toBe('current');
    expect(frozen!.staleReason).toBeNull();
    expect((await call(t.http, 'get', `/api/releases/${release.id}/analyses`, w.f.tokens.outsider)).status).toBe(404);
  });

  it('lets a lead decline a request with a reason; a declined request cannot be signed', async () => {
    const { f } = w;
    const other = await createSyncedRun(t.http, f.tokens.lead, f.campaign.id, media);
    const res = await call(t.http, 'post', `/api/campaigns/${f.campaign.id}/releases`, f.tokens.engineer).send({ title: 'Too early', runIds: [other.id] });
    expect(res.status).toBe(201);
    const id = (res.body as Release).id;
    expect((await call(t.http, 'post', `/api/releases/${id}/decline`, f.tokens.engineer).send({ reason: 'no' })).status).toBe(403);
    expect((await call(t.http, 'post', `/api/releases/${id}/decline`, f.tokens.lead).send({})).status).toBe(400);
    const declined = await call(t.http, 'post', `/api/releases/${id}/decline`, f.tokens.lead).send({ reason: 'Run 2 has no sheet yet' });
    expect(declined.status).toBe(200);
    expect(declined.body).toMatchObject({ status: 'declined', declineReason: 'Run 2 has no sheet yet', number: null });
    const sign = await call(t.http, 'post', `/api/releases/${id}/sign`, f.tokens.lead).send({});
    expect(sign.status).toBe(409);
    expect(sign.body.message).toBe('This request was declined; create a new release to sign');
    // A run without sheets cannot be released at all.
    const direct = await call(t.http, 'post', `/api/campaigns/${f.campaign.id}/releases`, f.tokens.lead).send({ title: 'Empty', runIds: [other.id], sign: true });
    expect(direct.status).toBe(409);
    expect(direct.body.message).toContain('it has no sheet, so there are no readings to release');
    // …and the refused create-and-sign left no request behind.
    const titles = ((await call(t.http, 'get', `/api/campaigns/${f.campaign.id}/releases`, f.tokens.lead)).body as Release[]).map((r) => r.title);
    expect(titles).not.toContain('Empty');
    expect((await call(t.http, 'get', '/api/releases/not-a-uuid', f.tokens.lead)).status).toBe(404);
  });

  it('gives leads and engineers the dashboard (progress, open mismatches, rates, releases) and refuses readers and checkers', async () => {
    const { f } = w;
    const run3 = await createSyncedRun(t.http, f.tokens.lead, f.campaign.id, media);
    const sheet: Sheet = await typedSheet(t, w, 'Dashboard sheet', run3);
    const half = await openSheet(t, w, 'Half done', run3);
    await enter(t, w, half, 1, [['20.0', '1.000']]);

    for (const actor of ['reader', 'checker'] as const) {
      const res = await call(t.http, 'get', `/api/campaigns/${f.campaign.id}/dashboard`, f.tokens[actor]);
      expect(res.status).toBe(403);
    }
    expect((await call(t.http, 'get', `/api/campaigns/${f.campaign.id}/dashboard`, f.tokens.outsider)).status).toBe(404);
    const res = await call(t.http, 'get', `/api/campaigns/${f.campaign.id}/dashboard`, f.tokens.engineer);
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const board = res.body as CampaignDashboard;
    const first = board.runs.find((r) => r.id === w.run.id);
    expect(first).toMatchObject({ lockedBy: { number: 2 }, readyToRelease: true, synced: true, hasRecording: true });
    const third = board.runs.find((r) => r.id === run3.id);
    expect(third?.readyToRelease).toBe(false);
    expect(third?.sheets.find((s) => s.id === sheet.id)).toMatchObject({ rows: 2, cells: 4, pass1Entered: 4, pass2Entered: 4, pass1Finished: true, pass2Finished: true, openMismatches: 0 });
    expect(third?.sheets.find((s) => s.id === half.id)).toMatchObject({ rows: 2, cells: 4, pass1Entered: 2, pass2Entered: 0, pass1Finished: false, openMismatches: 0 });
    // Rates over cells both passes reached: in the two full sheets the reader and the checker typed
    // 4 + 4 cells, V1 differed in 1 + 2 of them (3 of 4 V1 cells), T1 in none.
    const rate = (userId: string, symbol: string) => board.readerRates.find((r) => r.userId === userId && r.channelSymbol === symbol);
    expect(rate(f.users.reader.id, 'V1')).toMatchObject({ compared: 4, mismatches: 3, rate: 0.75 });
    expect(rate(f.users.checker.id, 'T1')).toMatchObject({ compared: 4, mismatches: 0, rate: 0 });
    expect(board.releases.map((r) => [r.number, r.status])).toEqual([[null, 'declined'], [2, 'published'], [1, 'published']]);
    expect(board.analyses).toEqual({ total: 0, stale: 0, failed: 0 });
  });
});
