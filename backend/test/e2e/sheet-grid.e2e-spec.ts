import { layOutSheetGrid, type Channel, type Reading, type Run, type Sheet, type SheetGrid, type SheetGridPass, type SheetGridWire, type SheetMismatches, type SheetRow } from '@dialsheet/common';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { TestMedia } from '../helpers/media';
import { campaignFixture, createChannel, createSyncedRun, openAssignedSheet, type Fixture } from '../helpers/recordings';
import { addMember, bearer, createUser, login, startTestApp, type Http, type TestApp } from '../helpers/test-app';

// The sheet table's compact read must say exactly what the readings and mismatch routes say, to
// exactly the same people: it replaces them on the sheet page.

function call(http: Http, method: 'get' | 'post' | 'put' | 'patch', path: string, token: string) {
  return http[method](path).set(bearer(token));
}

// T1 has a plausible range and P1 an operating range, so some entries carry limit warnings.
const gauges = [
  { name: 'Warm stream inlet temperature', symbol: 'T1', quantity: 'temperature', rawUnit: '°C', resolution: 0.1, rangeMin: -50, rangeMax: 200, plausibleMin: 5, plausibleMax: 90 },
  { name: 'Supply pressure', symbol: 'P1', quantity: 'pressure', rawUnit: 'kPa', resolution: 1, rangeMin: 0, rangeMax: 600, operatingMin: 0, operatingMax: 400 },
];

/**
 * What the grid carries of a reading: the table needs no parsed value, author or time, and the
 * version and frame only of a pass the viewer may change.
 */
type GridCell = Pick<Reading, 'rowIndex' | 'channelId' | 'rawText' | 'flag' | 'warnings'> & Partial<Pick<Reading, 'version' | 'frameTime'>>;

/** The grid's cells of one pass as the readings route lists them: entered cells only, in row then channel order. */
function cellsOf(grid: SheetGrid, pass: SheetGridPass): GridCell[] {
  const width = grid.channelIds.length;
  const out: GridCell[] = [];
  pass.rawText.forEach((rawText, i) => {
    if (rawText === null) return;
    out.push({
      rowIndex: Math.floor(i / width),
      channelId: grid.channelIds[i % width],
      rawText,
      flag: pass.flag[i],
      warnings: pass.warnings[i] ?? [],
      ...(pass.edit ? { version: pass.edit.version[i] as number, frameTime: pass.edit.frameTime[i] } : {}),
    });
  });
  return out;
}

const asListed = (readings: Reading[], editable = false): GridCell[] =>
  readings.map(({ rowIndex, channelId, rawText, flag, frameTime, version, warnings }) => ({
    rowIndex,
    channelId,
    rawText,
    flag,
    warnings,
    ...(editable ? { version, frameTime } : {}),
  }));

describe('sheet grid', () => {
  let t: TestApp;
  let media: TestMedia;
  let f: Fixture;
  let run: Run;
  let channels: Channel[];

  /** Three rows (0, 2, 4 s) × two channels. */
  async function openSheet(name: string, checkerId = f.users.checker.id): Promise<Sheet> {
    return openAssignedSheet(t.http, f, run.id, channels.map((c) => c.id), { name, startTime: 0, endTime: 4, interval: 2 }, checkerId);
  }

  async function enter(sheet: Sheet, pass: 1 | 2, token: string, rows: Record<number, string[]>, baseVersion?: number): Promise<void> {
    for (const [rowIndex, texts] of Object.entries(rows)) {
      const res = await call(t.http, 'put', `/api/sheets/${sheet.id}/rows/${rowIndex}`, token).send({
        pass,
        readings: texts.map((rawText, i) => ({ channelId: channels[i].id, rawText, frameTime: 2 + Number(rowIndex) * 2 + 0.017 * (i + 1), baseVersion })),
      });
      expect(res.status, JSON.stringify(res.body)).toBe(200);
    }
  }

  /** The answer as sent (JSON text of a SheetGridWire) and as the table lays it out. */
  async function gridAnswer(sheet: Sheet, token: string): Promise<{ text: string; wire: SheetGridWire; grid: SheetGrid }> {
    const res = await call(t.http, 'get', `/api/sheets/${sheet.id}/grid`, token);
    expect(res.status, res.text).toBe(200);
    expect(res.headers['content-type']).toMatch(/^application\/json/);
    const wire = JSON.parse(res.text) as SheetGridWire;
    return { text: res.text, wire, grid: layOutSheetGrid(wire) };
  }

  async function grid(sheet: Sheet, token: string): Promise<SheetGrid> {
    return (await gridAnswer(sheet, token)).grid;
  }

  async function listed(sheet: Sheet, pass: 1 | 2, token: string): Promise<Reading[]> {
    const res = await call(t.http, 'get', `/api/sheets/${sheet.id}/readings?pass=${pass}`, token);
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    return res.body as Reading[];
  }

  beforeAll(async () => {
    t = await startTestApp();
    media = new TestMedia();
    f = await campaignFixture(t, 'Heat-recovery core sheet grid');
    channels = [];
    for (const g of gauges) channels.push(await createChannel(t.http, f.tokens.lead, f.campaign.id, g));
    run = await createSyncedRun(t.http, f.tokens.lead, f.campaign.id, media);
  }, 120_000);
  afterAll(async () => {
    await t.close();
    media.remove();
  });

  it('holds what the readings routes send, and keeps the checker blind until pass 2 is finished', async () => {
    const sheet = await openSheet('Grid against the readings routes');
    // Pass 1: a value above T1's plausible maximum, one above P1's operating maximum, a flag, and a
    // changed entry (version 2).
    await enter(sheet, 1, f.tokens.reader, { 0: ['21.50', '120'], 1: ['95.0', '#unreadable'], 2: ['22.1', '450'] });
    await enter(sheet, 1, f.tokens.reader, { 2: ['22.2', '450'] }, 1);
    // The reader may still change pass 1: the grid carries what a change sends back.
    const own = await grid(sheet, f.tokens.reader);
    expect(own.pass2).toBeNull();
    expect(cellsOf(own, own.pass1 as SheetGridPass)).toEqual(asListed(await listed(sheet, 1, f.tokens.reader), true));
    // Row 2's T1 changed (version 2); its P1 was resent as stored, which changes nothing.
    expect(own.pass1?.edit?.version).toEqual([1, 1, 1, 1, 2, 1]);
    expect(own.pass1?.edit?.frameTime[3]).toBeCloseTo(4.034, 9);
    expect((await call(t.http, 'post', `/api/sheets/${sheet.id}/passes/1/finish`, f.tokens.reader)).status).toBe(200);
    // Pass 2 so far: two of three rows; "21.5" agrees with "21.50", 95.1 and a blank differ.
    await enter(sheet, 2, f.tokens.checker, { 0: ['21.5', '120'], 1: ['95.1', ''] });

    const rows = (await call(t.http, 'get', `/api/sheets/${sheet.id}/rows`, f.tokens.engineer)).body as SheetRow[];
    const overseenAnswer = await gridAnswer(sheet, f.tokens.engineer);
    const overseen = overseenAnswer.grid;
    expect(overseen.sheetId).toBe(sheet.id);
    // As sent: entries only (pass 2 has four of six cells), each with its cell index, and the
    // values outside a limit beside their cells: T1's 95.0 (cell 2) and P1's 450 (cell 5).
    expect([...(overseenAnswer.wire.pass2?.cell ?? [])].sort()).toEqual([0, 1, 2, 3]);
    expect(overseenAnswer.wire.pass1?.version).toBeNull();
    expect(overseenAnswer.wire.pass1?.flagged).toEqual([[3, 'unreadable']]);
    expect(overseenAnswer.wire.pass2?.flagged).toEqual([[3, 'blank']]);
    expect([...(overseenAnswer.wire.pass1?.outside ?? [])].sort((a, b) => a[0] - b[0])).toEqual([
      [2, 95],
      [5, 450],
    ]);
    expect(overseenAnswer.wire.limits).toEqual([
      { plausibleMin: 5, plausibleMax: 90, operatingMin: null, operatingMax: null },
      { plausibleMin: null, plausibleMax: null, operatingMin: 0, operatingMax: 400 },
    ]);
    expect(overseen.testTimes).toEqual(rows.map((r) => r.testTime));
    expect(overseen.testTimes).toEqual([0, 2, 4]);
    expect(overseen.channelIds).toEqual(sheet.channelIds);
    // Every cell of the plan has a place; a cell without an entry is null in each column.
    expect(overseen.pass2?.rawText).toEqual(['21.5', '120', '95.1', '', null, null]);
    // Nobody but a pass's owner changes it, so the engineer gets no versions or frames.
    expect(overseen.pass1?.edit).toBeNull();
    expect(overseen.pass2?.edit).toBeNull();
    expect(cellsOf(overseen, overseen.pass1 as SheetGridPass)).toEqual(asListed(await listed(sheet, 1, f.tokens.engineer)));
    expect(cellsOf(overseen, overseen.pass2 as SheetGridPass)).toEqual(asListed(await listed(sheet, 2, f.tokens.engineer)));
    // Spot checks of the comparison itself: the limit warnings are there.
    expect(Object.keys(overseen.pass1?.warnings ?? {}).map(Number)).toEqual([2, 5]);
    expect(overseen.pass1?.warnings[2]?.[0].code).toBe('above-plausible');
    expect(overseen.pass1?.warnings[5]?.[0].code).toBe('outside-operating');
    expect(overseen.pass1?.flag[3]).toBe('unreadable');
    expect(overseen.pass2?.flag[3]).toBe('blank');
    // Leads and engineers may read the mismatch list at any time: nothing is resolved yet.
    expect(overseen.resolutions).toEqual([]);

    // The checker, before finishing: their own pass only — no pass 1, no resolutions.
    const blindAnswer = await gridAnswer(sheet, f.tokens.checker);
    const blind = blindAnswer.grid;
    expect(blind.pass1).toBeNull();
    expect(blind.resolutions).toBeNull();
    expect(cellsOf(blind, blind.pass2 as SheetGridPass)).toEqual(asListed(await listed(sheet, 2, f.tokens.checker), true));
    expect(blind.pass2?.edit?.version).toEqual([1, 1, 1, 1, null, null]);
    // Nothing of pass 1 anywhere in what was sent, not only in what the table shows.
    expect(blindAnswer.text).not.toContain('21.50');
    expect(blindAnswer.text).not.toContain('#unreadable');
    // The reader does not see pass 2 until the checker has finished it.
    const reader = await grid(sheet, f.tokens.reader);
    expect(reader.pass2).toBeNull();
    expect(reader.resolutions).toBeNull();
    // Finished: pass 1 no longer changes, so no versions or frames.
    expect(reader.pass1?.edit).toBeNull();
    expect(cellsOf(reader, reader.pass1 as SheetGridPass)).toEqual(asListed(await listed(sheet, 1, f.tokens.reader)));

    // Finished: the checker sees both passes and the resolutions, as the mismatch list shows them.
    await enter(sheet, 2, f.tokens.checker, { 2: ['22.2', '450'] });
    expect((await call(t.http, 'post', `/api/sheets/${sheet.id}/passes/2/finish`, f.tokens.checker)).status).toBe(200);
    const resolved = await call(t.http, 'put', `/api/sheets/${sheet.id}/resolutions/1/${channels[0].id}`, f.tokens.checker).send({
      rawText: '95.0',
      reason: 'The frame shows 95.0',
    });
    expect(resolved.status, JSON.stringify(resolved.body)).toBe(200);
    const open = await grid(sheet, f.tokens.checker);
    expect(cellsOf(open, open.pass1 as SheetGridPass)).toEqual(asListed(await listed(sheet, 1, f.tokens.checker)));
    expect(cellsOf(open, open.pass2 as SheetGridPass)).toEqual(asListed(await listed(sheet, 2, f.tokens.checker)));
    const list = (await call(t.http, 'get', `/api/sheets/${sheet.id}/mismatches`, f.tokens.checker)).body as SheetMismatches;
    expect(open.resolutions).toEqual(list.cells.flatMap((c) => (c.resolution ? [c.resolution] : [])));
    expect(open.resolutions).toHaveLength(1);
    expect((await grid(sheet, f.tokens.reader)).pass2).not.toBeNull();
  });

  it('answers a finished sheet as the readings route does after its channels’ limits or its plan change (finished passes are kept, never stale)', async () => {
    const sheet = await openSheet('Grid of a finished sheet');
    await enter(sheet, 1, f.tokens.reader, { 0: ['21.5', '120'], 1: ['60.0', '130'], 2: ['22.1', '450'] });
    expect((await call(t.http, 'post', `/api/sheets/${sheet.id}/passes/1/finish`, f.tokens.reader)).status).toBe(200);
    await enter(sheet, 2, f.tokens.checker, { 0: ['21.5', '120'], 1: ['60.0', '130'], 2: ['22.1', '450'] });
    expect((await call(t.http, 'post', `/api/sheets/${sheet.id}/passes/2/finish`, f.tokens.checker)).status).toBe(200);

    const before = await grid(sheet, f.tokens.engineer);
    expect(Object.keys(before.pass1?.warnings ?? {}).map(Number)).toEqual([5]);
    // Asked again, the same answer, to the byte.
    const first = await gridAnswer(sheet, f.tokens.engineer);
    expect((await gridAnswer(sheet, f.tokens.engineer)).text).toBe(first.text);

    // T1's plausible maximum lowered to 50: its 60.0 (cell 2) is now above it, in both passes.
    const lowered = await call(t.http, 'patch', `/api/channels/${channels[0].id}`, f.tokens.lead).send({ plausibleMax: 50 });
    expect(lowered.status, JSON.stringify(lowered.body)).toBe(200);
    const after = await grid(sheet, f.tokens.engineer);
    for (const pass of [1, 2] as const) {
      expect(cellsOf(after, after[`pass${pass}`] as SheetGridPass)).toEqual(asListed(await listed(sheet, pass, f.tokens.engineer)));
    }
    expect(Object.keys(after.pass1?.warnings ?? {}).map(Number)).toEqual([2, 5]);

    // The plan shortened to rows 0 and 1: row 2 is left out, as the readings route leaves it out.
    const shorter = await call(t.http, 'patch', `/api/sheets/${sheet.id}`, f.tokens.lead).send({ endTime: 2 });
    expect(shorter.status, JSON.stringify(shorter.body)).toBe(200);
    const short = await grid(sheet, f.tokens.engineer);
    expect(short.testTimes).toEqual([0, 2]);
    expect(short.pass2?.rawText).toEqual(['21.5', '120', '60.0', '130']);
    expect(cellsOf(short, short.pass1 as SheetGridPass)).toEqual(asListed(await listed(sheet, 1, f.tokens.engineer)));
  });

  it('keeps a Lead who is also the checker blind, refuses members who may see no pass and hides the sheet from outsiders', async () => {
    const leadChecker = await createUser(t.dataSource, { name: 'Lee Lead-and-checker' });
    await addMember(t.dataSource, f.campaign.id, leadChecker.id, ['lead', 'checker']);
    const token = await login(t.http, leadChecker.email);
    const sheet = await openSheet('Grid, lead as checker', leadChecker.id);
    await enter(sheet, 1, f.tokens.reader, { 0: ['19.0', '150'] });

    const blindAnswer = await gridAnswer(sheet, token);
    const blind = blindAnswer.grid;
    expect(blind.pass1).toBeNull();
    expect(blind.resolutions).toBeNull();
    // Their own pass has no entries yet: sent empty, with room for versions (they may change it).
    expect(blindAnswer.wire.pass2).toEqual({ cell: [], rawText: [], flagged: null, version: [], frameTime: [], outside: null });
    expect(blind.pass2?.rawText).toEqual([null, null, null, null, null, null]);
    expect(blind.pass2?.edit?.version).toEqual([null, null, null, null, null, null]);
    expect(blindAnswer.text).not.toContain('19.0');

    // A reader of the campaign not assigned to this sheet: both readings routes refuse, so does the grid.
    const otherReader = await createUser(t.dataSource, { name: 'Oli Other-reader' });
    await addMember(t.dataSource, f.campaign.id, otherReader.id, ['reader']);
    const otherToken = await login(t.http, otherReader.email);
    expect((await call(t.http, 'get', `/api/sheets/${sheet.id}/readings?pass=1`, otherToken)).status).toBe(403);
    const refused = await call(t.http, 'get', `/api/sheets/${sheet.id}/grid`, otherToken);
    expect(refused.status).toBe(403);
    expect(refused.body.message).toBe('The sheet’s entries are shown to its reader and checker, the Lead and Engineers only');

    const outsider = await call(t.http, 'get', `/api/sheets/${sheet.id}/grid`, f.tokens.outsider);
    expect(outsider.status).toBe(404);
    expect(outsider.body.message).toBe('Sheet not found');
    expect((await call(t.http, 'get', '/api/sheets/00000000-0000-4000-8000-00000000abcd/grid', f.tokens.lead)).status).toBe(404);
    expect((await call(t.http, 'get', '/api/sheets/not-a-sheet/grid', f.tokens.lead)).status).toBe(404);
    expect((await t.http.get(`/api/sheets/${sheet.id}/grid`)).status).toBe(401);
  });
});
