import type { ExportProvenance, LongExportRow, Release, Run } from '@dialsheet/common';
import { evaluateChain } from '@dialsheet/common/dist/analysis';
import Ajv from 'ajv';
import { parse } from 'csv-parse/sync';
import ExcelJS from 'exceljs';
import { createHash } from 'node:crypto';
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { TestMedia } from '../helpers/media';
import { binary } from '../helpers/recordings';
import { startTestApp, type TestApp } from '../helpers/test-app';
import { call, releaseWorld, signRelease, typedSheet, type ReleaseWorld } from './release-fixture';

/** One expected cell, built from the database rows (not from the export code). */
interface DbCell {
  row_index: number;
  symbol: string;
  raw_unit: string;
  t1: string;
  v1: number | null;
  t2: string;
  tr: string | null;
  vr: number | null;
  rr: string | null;
  reader: string;
  checker: string;
  resolver: string | null;
  chain: { steps: unknown[] } | null;
  engineering_unit: string | null;
}

describe('exports of releases and drafts', () => {
  let t: TestApp;
  let media: TestMedia;
  let w: ReleaseWorld;
  let release: Release;
  let db: DbCell[];

  function download(path: string, token = w.f.tokens.lead): request.Test {
    return call(t.http, 'get', path, token).buffer(true).parse(binary);
  }

  /** The value that counts for a cell, as the readings and resolutions tables hold it. */
  function finalOf(c: DbCell): { text: string; value: number | null } {
    return c.tr !== null ? { text: c.tr, value: c.vr } : { text: c.t1, value: c.v1 };
  }

  beforeAll(async () => {
    t = await startTestApp();
    media = new TestMedia();
    w = await releaseWorld(t, media, 'Heat-recovery core exports');
    await typedSheet(t, w, 'Soak sheet');
    release = await signRelease(t, w, 'Soak run for export');
    db = (await t.dataSource.query(
      `SELECT r1.row_index, c.symbol, c.raw_unit, r1.raw_text AS t1, r1.value AS v1, r2.raw_text AS t2,
              res.raw_text AS tr, res.value AS vr, res.reason AS rr, u1.name AS reader, u2.name AS checker, u3.name AS resolver,
              cal.chain, cal.engineering_unit
         FROM readings r1
         JOIN readings r2 ON r2.sheet_id = r1.sheet_id AND r2.row_index = r1.row_index AND r2.channel_id = r1.channel_id AND r2.pass = 2
         JOIN channels c ON c.id = r1.channel_id
         JOIN sheet_channels sc ON sc.sheet_id = r1.sheet_id AND sc.channel_id = r1.channel_id
         JOIN users u1 ON u1.id = r1.entered_by
         JOIN users u2 ON u2.id = r2.entered_by
         LEFT JOIN resolutions res ON res.sheet_id = r1.sheet_id AND res.row_index = r1.row_index AND res.channel_id = r1.channel_id
         LEFT JOIN users u3 ON u3.id = res.resolved_by
         LEFT JOIN channel_calibrations cal ON cal.channel_id = c.id
         JOIN sheets s ON s.id = r1.sheet_id
        WHERE s.run_id = $1 AND r1.pass = 1
        ORDER BY r1.row_index, sc.position`,
      [w.run.id],
    )) as DbCell[];
    expect(db).toHaveLength(4);
  }, 180_000);
  afterAll(async () => {
    await t.close();
    media.remove();
  });

  it('CSV long reads back (csv-parse) equal to the database; a negative reading stays a number, a formula-like reason is neutralised', async () => {
    const res = await download(`/api/releases/${release.id}/export?format=csv-long`, w.f.tokens.reader);
    expect(res.status, res.body.toString()).toBe(200);
    expect(res.headers['content-type']).toBe('text/csv; charset=utf-8');
    expect(res.headers['content-disposition']).toBe('attachment; filename="dialsheet-heat-recovery-core-exports-release-1.long.csv"');
    expect(res.headers['x-dialsheet-content-hash']).toBe(release.contentHash);
    const text = (res.body as Buffer).toString('utf8');
    const comments = text.split('\n').filter((l) => l.startsWith('#'));
    expect(comments[0]).toContain(`# Release 1 of campaign "Heat-recovery core exports", signed by ${w.f.users.lead.name}`);
    expect(comments[0]).toContain(`content SHA-256 ${release.contentHash}`);
    const [{ sha256 }] = (await t.dataSource.query('SELECT sha256 FROM recordings WHERE run_id = $1', [w.run.id])) as Array<{ sha256: string }>;
    // Provenance: the recording's SHA-256 and the sync (video 2 s = test 0 s, one mark).
    expect(comments[1]).toContain(`SHA-256 ${sha256}; test time 0 s at video time 2 s, 1 test s per video s`);
    expect(text).not.toContain('DRAFT');

    const rows = parse(text, { comment: '#', columns: true, skip_empty_lines: true }) as Array<Record<string, string>>;
    expect(Object.keys(rows[0])).toEqual([
      'run', 'sheet', 'channel', 'test time [s]', 'video time [s]', 'frame pts [s]', 'raw text', 'value', 'raw unit', 'engineering value',
      'engineering unit', 'flag', 'status', 'pass 1 text', 'pass 2 text', 'reader', 'checker', 'resolution', 'resolution reason', 'resolved by',
    ]);
    expect(rows).toHaveLength(db.length);
    for (const [i, c] of db.entries()) {
      const row = rows[i];
      const final = finalOf(c);
      expect(row.run).toBe(w.run.name);
      expect(row.channel).toBe(c.symbol);
      // Rows every 2 s from 0; video time = test time + 2 s (the sync mark).
      expect(Number(row['test time [s]'])).toBe(c.row_index * 2);
      expect(Number(row['video time [s]'])).toBe(c.row_index * 2 + 2);
      expect(Number(row.value)).toBe(final.value);
      // The engineering value is the calibration chain applied to the value (common evaluateChain).
      const expected = c.chain ? evaluateChain(c.chain as never, final.value as number, c.raw_unit) : final.value;
      expect(Number(row['engineering value'])).toBeCloseTo(expected as number, 12);
      expect(row['engineering unit']).toBe(c.engineering_unit ?? c.raw_unit);
      expect(row.reader).toBe(c.reader);
      expect(row.checker).toBe(c.checker);
      expect(row['resolved by']).toBe(c.resolver ?? '');
      expect(row.status).toBe(c.tr !== null ? 'resolved' : 'agreed');
    }
    // The negative temperature is written as a bare number; the typed texts are text cells, so
    // "-3.5" gets the quote a spreadsheet needs to keep it from being a formula (OWASP).
    expect(rows[0].value).toBe('-3.5');
    expect(rows[0]['raw text']).toBe("'-3.5");
    expect(rows[0]['pass 2 text']).toBe("'-3.50");
    expect(text).toMatch(/\n[^\n]*,-3\.5,°C,-3\.5,°C,/);
    // The reason typed as "=1+2" comes out as text, never as a formula.
    expect(db[1].rr).toBe('=1+2');
    expect(rows[1]['resolution reason']).toBe("'=1+2");
    // A flag word typed with its marker stays as typed.
    expect(rows[3]['pass 1 text']).toBe('#unreadable');
    // 2.315 V × 40 SLPM/V (the fixture's linear span) = 92.6 SLPM: worked by hand.
    expect(Number(rows[1]['engineering value'])).toBeCloseTo(92.6, 10);
  });

  it('CSV wide has one row per timestamp and one "SYMBOL [unit]" column per channel', async () => {
    const res = await download(`/api/releases/${release.id}/export?format=csv-wide`);
    expect(res.status).toBe(200);
    const rows = parse((res.body as Buffer).toString('utf8'), { comment: '#', columns: true }) as Array<Record<string, string>>;
    expect(Object.keys(rows[0])).toEqual(['run', 'sheet', 'test time [s]', 'video time [s]', 'T1 [°C]', 'V1 [SLPM]']);
    expect(rows).toHaveLength(2);
    for (const row of rows) {
      const index = Number(row['test time [s]']) / 2;
      const t1 = db.find((c) => c.row_index === index && c.symbol === 'T1') as DbCell;
      const v1 = db.find((c) => c.row_index === index && c.symbol === 'V1') as DbCell;
      expect(Number(row['T1 [°C]'])).toBe(finalOf(t1).value);
      expect(Number(row['V1 [SLPM]'])).toBeCloseTo(evaluateChain(v1.chain as never, finalOf(v1).value as number, 'V'), 12);
    }
  });

  it('XLSX (exceljs) reads back equal to the database, numbers as number cells, with the five sheets and the provenance', async () => {
    const res = await download(`/api/releases/${release.id}/export?format=xlsx`);
    expect(res.status).toBe(200);
    expect(res.headers['content-disposition']).toContain('release-1.xlsx');
    const workbook = new ExcelJS.Workbook();
    await workbook.xlsx.load(res.body as never);
    expect(workbook.worksheets.map((s) => s.name)).toEqual(['readings', 'channels and calibrations', 'stable values and fits', 'balance checks', 'provenance']);
    const sheet = workbook.getWorksheet('readings') as ExcelJS.Worksheet;
    const header = (sheet.getRow(1).values as unknown[]).slice(1);
    const col = (name: string) => header.indexOf(name) + 1;
    expect(sheet.rowCount).toBe(1 + db.length);
    for (const [i, c] of db.entries()) {
      const row = sheet.getRow(i + 2);
      const value = row.getCell(col('value')).value;
      expect(typeof value).toBe('number');
      expect(value).toBe(finalOf(c).value);
      expect(row.getCell(col('pass 1 text')).value).toBe(/^[-=+@]/.test(c.t1) ? `'${c.t1}` : c.t1);
      expect(row.getCell(col('checker')).value).toBe(c.checker);
    }
    expect(sheet.getRow(2).getCell(col('value')).value).toBe(-3.5);
    expect(sheet.getRow(3).getCell(col('resolution reason')).value).toBe("'=1+2");
    const provenance = workbook.getWorksheet('provenance') as ExcelJS.Worksheet;
    const fields = new Map<string, unknown>();
    provenance.eachRow((row) => fields.set(String(row.getCell(1).value), row.getCell(2).value));
    expect(fields.get('content SHA-256')).toBe(release.contentHash);
    expect(fields.get('release number')).toBe(1);
    expect(fields.get('kind')).toBe('release');
    const channels = workbook.getWorksheet('channels and calibrations') as ExcelJS.Worksheet;
    expect(channels.getRow(3).getCell(1).value).toBe('V1');
    expect(channels.getRow(3).getCell(9).value).toBe('SLPM');
  });

  it('JSON follows its documented schema (ajv) and keeps texts exactly as typed', async () => {
    const res = await download(`/api/releases/${release.id}/export?format=json`);
    expect(res.status).toBe(200);
    const body = JSON.parse((res.body as Buffer).toString('utf8')) as { draft: boolean; provenance: ExportProvenance; readings: LongExportRow[] };
    const schema = JSON.parse(readFileSync(join(__dirname, '../../src/modules/exports/export-schema.json'), 'utf8')) as object;
    const ajv = new Ajv({ allErrors: true });
    const valid = ajv.validate(schema, body);
    expect(valid, ajv.errorsText()).toBe(true);
    // The schema can fail: a reading without its status is refused.
    const broken = structuredClone(body) as { readings: Array<Partial<LongExportRow>> };
    delete broken.readings[0].status;
    expect(ajv.validate(schema, broken)).toBe(false);
    expect(body.draft).toBe(false);
    expect(body.provenance.release).toMatchObject({ number: 1, contentHash: release.contentHash });
    expect(body.readings.map((r) => [r.channel, r.value, r.pass1Text, r.resolutionReason])).toEqual(
      db.map((c) => [c.symbol, finalOf(c).value, c.t1, c.rr]),
    );
  });

  it('keeps the release hash: two exports give the same bytes, and the stored snapshot hashes to the signed value', async () => {
    const a = await download(`/api/releases/${release.id}/export?format=csv-long`);
    const b = await download(`/api/releases/${release.id}/export?format=csv-long`, w.f.tokens.checker);
    expect(Buffer.compare(a.body as Buffer, b.body as Buffer)).toBe(0);
    const [{ snapshot_key }] = (await t.dataSource.query('SELECT snapshot_key FROM releases WHERE id = $1', [release.id])) as Array<{ snapshot_key: string }>;
    const stored = readFileSync(join(t.config.storageDir, 'objects', snapshot_key));
    expect(createHash('sha256').update(stored).digest('hex')).toBe(release.contentHash);
    // Data changed after a correction does not change what release 1 holds.
    const opened = await call(t.http, 'post', `/api/runs/${w.run.id}/correction`, w.f.tokens.lead).send({ reason: 'check hash stability' });
    expect(opened.status).toBe(200);
    await t.dataSource.query(`UPDATE channel_calibrations SET chain = '{"steps":[{"kind":"linear","a":50,"b":0,"inputUnit":"V","outputUnit":"SLPM"}]}'`);
    const c = await download(`/api/releases/${release.id}/export?format=csv-long`);
    expect(Buffer.compare(a.body as Buffer, c.body as Buffer)).toBe(0);
    // A tampered snapshot is not passed off as the release (this one is read whole before the
    // headers go out, so the answer is an error rather than a cut download).
    const tampered = stored.toString('utf8').replace('"-3.5"', '"-3.6"');
    expect(tampered).not.toBe(stored.toString('utf8'));
    writeFileSync(join(t.config.storageDir, 'objects', snapshot_key), tampered);
    const refused = await call(t.http, 'get', `/api/releases/${release.id}/export?format=csv-long`, w.f.tokens.lead);
    expect(refused.status).toBe(500);
    expect(refused.body.message).toBe('The stored snapshot of release 1 does not match its signed hash, so it is not exported');
    writeFileSync(join(t.config.storageDir, 'objects', snapshot_key), stored);
    expect((await download(`/api/releases/${release.id}/export?format=csv-long`)).status).toBe(200);
  });

  it('exports live data as a DRAFT for leads and engineers only, and answers bad requests with a clear 400/409', async () => {
    const { f } = w;
    const base = `/api/campaigns/${f.campaign.id}/export`;
    const res = await download(`${base}?format=csv-long&runIds=${w.run.id}`, f.tokens.engineer);
    expect(res.status, res.body.toString()).toBe(200);
    expect(res.headers['content-disposition']).toMatch(/^attachment; filename="dialsheet-heat-recovery-core-exports-DRAFT-\d{8}-\d{4}\.long\.csv"$/);
    expect(res.headers['x-dialsheet-export-kind']).toBe('draft');
    const text = (res.body as Buffer).toString('utf8');
    expect(text.split('\n')[0]).toMatch(/^# DRAFT - not a signed release/);
    const rows = parse(text, { comment: '#', columns: true }) as Array<Record<string, string>>;
    // The calibration was changed to 50 SLPM/V above: the draft shows the live value, 2.315 × 50.
    expect(Number(rows[1]['engineering value'])).toBeCloseTo(115.75, 10);
    const json = await download(`${base}?format=json`, f.tokens.lead);
    const body = JSON.parse((json.body as Buffer).toString('utf8')) as { draft: boolean; provenance: ExportProvenance };
    expect(body.draft).toBe(true);
    expect(body.provenance).toMatchObject({ kind: 'draft', release: null, exportedBy: f.users.lead.name });

    // Blind rule: a draft holds pass 1, which a checker must not see early.
    for (const actor of ['reader', 'checker'] as const) expect((await download(`${base}?format=csv-long`, f.tokens[actor])).status).toBe(403);
    expect((await download(`${base}?format=csv-long`, f.tokens.outsider)).status).toBe(404);
    const badFormat = await call(t.http, 'get', `${base}?format=pdf`, f.tokens.lead);
    expect(badFormat.status).toBe(400);
    expect(JSON.stringify(badFormat.body.message)).toContain('format must be one of csv-long, csv-wide, xlsx, json, got \\"pdf\\"');
    expect((await call(t.http, 'get', `/api/releases/${release.id}/export`, f.tokens.lead)).status).toBe(400);
    const badRuns = await call(t.http, 'get', `${base}?format=json&runIds=nope`, f.tokens.lead);
    expect(badRuns.status).toBe(400);
    expect(JSON.stringify(badRuns.body.message)).toContain('not a run id: nope');
    const request = await call(t.http, 'post', `/api/campaigns/${f.campaign.id}/releases`, f.tokens.engineer).send({ title: 'Later', runIds: [w.run.id] });
    const unsigned = await call(t.http, 'get', `/api/releases/${(request.body as Release).id}/export?format=json`, f.tokens.lead);
    expect(unsigned.status).toBe(409);
    expect(unsigned.body.message).toBe('Only a published release can be exported; export a draft of the campaign’s live data instead');
    const run = (await call(t.http, 'get', `/api/runs/${w.run.id}`, f.tokens.lead)).body as Run;
    expect(run.id).toBe(w.run.id);
  });
});
