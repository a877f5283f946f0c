// The dataset of chosen runs as a stream of records, oldest knowledge first: a header, the runs,
// channels (with calibrations), sheets and analyses, then every sheet cell in order. The same
// stream is what a release freezes (as canonical JSON lines, hashed while written) and what a
// draft export reads live, so both kinds of export go through one set of writers.
//
// Cells come from a server-side cursor (pg-query-stream through TypeORM's QueryRunner.stream),
// so memory stays flat however many readings there are.

import type { CalibrationChain, SyncMarks } from '@dialsheet/common';
import { describeSync, sheetRowTimes, toVideoTime } from '@dialsheet/common';
import { compileChain, type CompiledChain } from '@dialsheet/common/dist/analysis';
import type { PoolClient } from 'pg';
import QueryStream from 'pg-query-stream';
import type { Readable } from 'node:stream';
import type { QueryRunner } from 'typeorm';

export const SNAPSHOT_FORMAT = 'dialsheet-snapshot';
/**
 * Rows fetched from the cursor per round trip. Small enough that a batch dies young in V8's
 * nursery: with 1000 the export bench's server grew by 300 MB (batches outlived a scavenge while
 * waiting for the socket and were promoted), with 100 it made ten times the round trips.
 */
const CURSOR_BATCH = 250;
export const SNAPSHOT_VERSION = 1;

export interface PersonName {
  id: string;
  name: string;
}

export interface SnapshotHeader {
  type: 'header';
  format: typeof SNAPSHOT_FORMAT;
  version: typeof SNAPSHOT_VERSION;
  campaign: { id: string; name: string; decimalComma: boolean };
  runIds: string[];
}

export interface SnapshotRun {
  type: 'run';
  id: string;
  name: string;
  runDate: string | null;
  configuration: string;
  operator: string;
  sync: SyncMarks | null;
  /** Video time at test time 0 and test seconds per video second, from the sync marks. */
  syncSummary: { videoTimeAtTestZero: number; rate: number } | null;
  recording: { fileName: string; sha256: string; sizeBytes: number } | null;
}

export interface SnapshotChannel {
  type: 'channel';
  id: string;
  name: string;
  symbol: string;
  quantity: string;
  rawUnit: string;
  resolution: number;
  rangeMin: number;
  rangeMax: number;
  fullScale: number | null;
  accuracy: unknown;
  position: number;
  calibration: { chain: CalibrationChain; engineeringUnit: string; version: number } | null;
  /** The unit engineering values are in (the raw unit without a calibration). */
  engineeringUnit: string;
  /** Why the calibration could not be applied (engineering values are then empty). */
  calibrationProblem: string | null;
}

export interface SnapshotSheet {
  type: 'sheet';
  id: string;
  runId: string;
  name: string;
  startTime: number;
  endTime: number;
  interval: number;
  rows: number;
  channelIds: string[];
  reader: PersonName | null;
  checker: PersonName | null;
  pass1FinishedAt: string | null;
  pass2FinishedAt: string | null;
}

export interface SnapshotAnalysis {
  type: 'analysis';
  id: string;
  name: string;
  kind: string;
  note: string | null;
  runIds: string[];
  status: string;
  error: string | null;
  computedAt: string | null;
  input: unknown;
  result: unknown;
}

export interface SnapshotEntry {
  text: string;
  value: number | null;
  flag: string | null;
  /** Presentation time of the frame the entry was typed at, s. */
  frameTime: number | null;
  by: string | null;
}

export interface SnapshotResolution {
  text: string;
  value: number | null;
  flag: string | null;
  reason: string;
  by: string | null;
}

export type CellStatus = 'agreed' | 'resolved' | 'unchecked' | 'mismatch' | 'missing';

export interface SnapshotCell {
  type: 'cell';
  runId: string;
  sheetId: string;
  channelId: string;
  row: number;
  testTime: number;
  videoTime: number | null;
  status: CellStatus;
  /** The entry that counts: the agreed one, the resolution, or pass 1 alone; null while open. */
  final: { text: string; value: number | null; flag: string | null; framePts: number | null } | null;
  engineeringValue: number | null;
  pass1: SnapshotEntry | null;
  pass2: SnapshotEntry | null;
  resolution: SnapshotResolution | null;
}

export type SnapshotRecord = SnapshotHeader | SnapshotRun | SnapshotChannel | SnapshotSheet | SnapshotAnalysis | SnapshotCell;

/**
 * What the dataset streams carry: the records before the cells one by one, the cells in batches
 * (an array), so a million cells cost a thousand hops through the async generators, not a million.
 */
export type SnapshotItem = Exclude<SnapshotRecord, SnapshotCell> | SnapshotCell[];

/** Cells per batch of a dataset stream. */
export const CELL_BATCH = 250;

/**
 * The rows an object-mode stream has buffered, as arrays: one await per batch the cursor
 * delivers instead of one per row (a for-await over the stream costs a promise per row).
 */
export async function* rowBatches<T>(stream: Readable): AsyncGenerator<T[]> {
  let ended = false;
  let failure: Error | null = null;
  stream.on('end', () => (ended = true));
  stream.on('error', (error: Error) => (failure = error));
  for (;;) {
    if (failure) throw failure;
    const batch: T[] = [];
    let row: T | null;
    while ((row = stream.read() as T | null) !== null) batch.push(row);
    if (batch.length > 0) {
      yield batch;
      continue;
    }
    if (ended || stream.readableEnded) return;
    await new Promise<void>((resolve) => {
      const done = () => {
        stream.off('readable', done);
        stream.off('end', done);
        stream.off('error', done);
        resolve();
      };
      stream.on('readable', done);
      stream.on('end', done);
      stream.on('error', done);
    });
  }
}

/**
 * One record as one canonical line: the objects are built with a fixed key order above and
 * JSON.stringify keeps it, numbers in their shortest round-trip form, no whitespace, so the same
 * data gives the same bytes and the same SHA-256.
 */
export function snapshotLine(record: SnapshotRecord): string {
  return `${JSON.stringify(record)}\n`;
}

/** Two stored entries say the same thing (as the mismatch list decides: same exact decimal, or same flag). */
function sameEntry(a: { value: number | null; flag: string | null; canonical: string | null }, b: typeof a): boolean {
  if (a.flag !== null || b.flag !== null) return a.flag === b.flag;
  if (a.canonical !== null && b.canonical !== null) return a.canonical === b.canonical;
  return a.value === b.value;
}

/**
 * The SQL test of an open mismatch between entries r1 and r2 without a resolution res, the same
 * rule as sameEntry (flagged cells are always looked at); used by the release checks and dashboard.
 */
export const MISMATCH_SQL = `(r1.id IS NOT NULL AND r2.id IS NOT NULL AND NOT (
    r1.flag IS NULL AND r2.flag IS NULL AND coalesce(r1.canonical, r1.value::text) = coalesce(r2.canonical, r2.value::text)))`;

interface CellRow {
  ord: string | number;
  row_index: number;
  channel_id: string;
  t1: string | null;
  v1: number | null;
  c1: string | null;
  f1: string | null;
  ft1: number | null;
  u1: string | null;
  t2: string | null;
  v2: number | null;
  c2: string | null;
  f2: string | null;
  ft2: number | null;
  u2: string | null;
  tr: string | null;
  vr: number | null;
  cr: string | null;
  fr: string | null;
  rr: string | null;
  ur: string | null;
}

/**
 * Every cell of the given sheets in sheet order, then row, then the sheet's channel order; a cell
 * no pass has reached yet is listed too (status missing), so a draft shows its gaps.
 */
export const CELLS_SQL = `
  SELECT s.ord, g.i AS row_index, sc.channel_id,
         r1.raw_text AS t1, r1.value AS v1, r1.canonical AS c1, r1.flag AS f1, r1.frame_time AS ft1, r1.entered_by AS u1,
         r2.raw_text AS t2, r2.value AS v2, r2.canonical AS c2, r2.flag AS f2, r2.frame_time AS ft2, r2.entered_by AS u2,
         res.raw_text AS tr, res.value AS vr, res.canonical AS cr, res.flag AS fr, res.reason AS rr, res.resolved_by AS ur
    FROM unnest($1::uuid[], $2::int[]) WITH ORDINALITY AS s(sheet_id, row_count, ord)
    JOIN sheet_channels sc ON sc.sheet_id = s.sheet_id
    CROSS JOIN LATERAL generate_series(0, s.row_count - 1) AS g(i)
    LEFT JOIN readings r1 ON r1.sheet_id = s.sheet_id AND r1.row_index = g.i AND r1.channel_id = sc.channel_id AND r1.pass = 1
    LEFT JOIN readings r2 ON r2.sheet_id = s.sheet_id AND r2.row_index = g.i AND r2.channel_id = sc.channel_id AND r2.pass = 2
    LEFT JOIN resolutions res ON res.sheet_id = s.sheet_id AND res.row_index = g.i AND res.channel_id = sc.channel_id
   ORDER BY s.ord, g.i, sc.position`;

const iso = (d: Date | string | null): string | null => (d === null ? null : new Date(d).toISOString());

/**
 * Streams the dataset of `runIds` (all of the campaign's, in the order given) through `runner`,
 * which the caller holds in a transaction so every record sees the same database state.
 */
export async function* readSnapshot(runner: QueryRunner, campaignId: string, runIds: readonly string[]): AsyncGenerator<SnapshotItem> {
  const [campaign] = (await runner.query('SELECT id, name, decimal_comma FROM campaigns WHERE id = $1', [campaignId])) as Array<{
    id: string;
    name: string;
    decimal_comma: boolean;
  }>;
  const runRows = (await runner.query(
    `SELECT r.id, r.name, r.run_date, r.configuration, r.operator, r.sync,
            rec.original_name, rec.sha256, rec.size_bytes
       FROM runs r LEFT JOIN recordings rec ON rec.run_id = r.id
      WHERE r.campaign_id = $1 AND r.id = ANY($2::uuid[])
      ORDER BY r.name, r.id`,
    [campaignId, runIds],
  )) as Array<{
    id: string;
    name: string;
    run_date: string | null;
    configuration: string;
    operator: string;
    sync: SyncMarks | null;
    original_name: string | null;
    sha256: string | null;
    size_bytes: string | null;
  }>;
  const orderedRunIds = runRows.map((r) => r.id);
  yield {
    type: 'header',
    format: SNAPSHOT_FORMAT,
    version: SNAPSHOT_VERSION,
    campaign: { id: campaign.id, name: campaign.name, decimalComma: campaign.decimal_comma },
    runIds: orderedRunIds,
  };
  const syncOf = new Map<string, SyncMarks | null>();
  for (const r of runRows) {
    syncOf.set(r.id, r.sync);
    let syncSummary: SnapshotRun['syncSummary'] = null;
    if (r.sync) {
      try {
        syncSummary = { videoTimeAtTestZero: toVideoTime(r.sync, 0), rate: describeSync(r.sync).scale };
      } catch {
        // Marks that no longer validate give no summary; the marks themselves are still listed.
      }
    }
    yield {
      type: 'run',
      id: r.id,
      name: r.name,
      runDate: r.run_date,
      configuration: r.configuration,
      operator: r.operator,
      sync: r.sync,
      syncSummary,
      recording: r.sha256 ? { fileName: r.original_name ?? '', sha256: r.sha256, sizeBytes: Number(r.size_bytes) } : null,
    };
  }

  const sheetRows = (await runner.query(
    `SELECT s.id, s.run_id, s.name, s.start_time, s.end_time, s.interval, s.pass1_finished_at, s.pass2_finished_at,
            s.reader_id, ru.name AS reader_name, s.checker_id, cu.name AS checker_name,
            array(SELECT sc.channel_id FROM sheet_channels sc WHERE sc.sheet_id = s.id ORDER BY sc.position) AS channel_ids
       FROM sheets s
       LEFT JOIN users ru ON ru.id = s.reader_id
       LEFT JOIN users cu ON cu.id = s.checker_id
      WHERE s.run_id = ANY($1::uuid[])
      ORDER BY array_position($1::uuid[], s.run_id), s.start_time, s.name, s.id`,
    [orderedRunIds],
  )) as Array<{
    id: string;
    run_id: string;
    name: string;
    start_time: number;
    end_time: number;
    interval: number;
    pass1_finished_at: Date | null;
    pass2_finished_at: Date | null;
    reader_id: string | null;
    reader_name: string | null;
    checker_id: string | null;
    checker_name: string | null;
    channel_ids: string[];
  }>;

  const channelRows = (await runner.query(
    `SELECT c.id, c.name, c.symbol, c.quantity, c.raw_unit, c.resolution, c.range_min, c.range_max, c.full_scale, c.accuracy, c.position,
            cal.chain, cal.engineering_unit, cal.version AS cal_version
       FROM channels c LEFT JOIN channel_calibrations cal ON cal.channel_id = c.id
      WHERE c.campaign_id = $1
        AND c.id IN (SELECT sc.channel_id FROM sheet_channels sc JOIN sheets s ON s.id = sc.sheet_id WHERE s.run_id = ANY($2::uuid[]))
      ORDER BY c.position, c.id`,
    [campaignId, orderedRunIds],
  )) as Array<{
    id: string;
    name: string;
    symbol: string;
    quantity: string;
    raw_unit: string;
    resolution: number;
    range_min: number;
    range_max: number;
    full_scale: number | null;
    accuracy: unknown;
    position: number;
    chain: CalibrationChain | null;
    engineering_unit: string | null;
    cal_version: number | null;
  }>;
  const compiled = new Map<string, CompiledChain | null>();
  for (const c of channelRows) {
    let chain: CompiledChain | null = null;
    let problem: string | null = null;
    try {
      chain = compileChain(c.chain, c.raw_unit);
    } catch (error) {
      problem = error instanceof Error ? error.message : String(error);
    }
    compiled.set(c.id, chain);
    yield {
      type: 'channel',
      id: c.id,
      name: c.name,
      symbol: c.symbol,
      quantity: c.quantity,
      rawUnit: c.raw_unit,
      resolution: c.resolution,
      rangeMin: c.range_min,
      rangeMax: c.range_max,
      fullScale: c.full_scale,
      accuracy: c.accuracy ?? null,
      position: c.position,
      calibration: c.chain ? { chain: c.chain, engineeringUnit: c.engineering_unit ?? c.raw_unit, version: c.cal_version ?? 1 } : null,
      engineeringUnit: c.chain ? (c.engineering_unit ?? c.raw_unit) : c.raw_unit,
      calibrationProblem: problem,
    };
  }

  const sheets: Array<{ id: string; runId: string; times: number[]; video: Array<number | null> }> = [];
  for (const s of sheetRows) {
    const times = sheetRowTimes(s.start_time, s.end_time, s.interval);
    const sync = syncOf.get(s.run_id) ?? null;
    const video = times.map((t) => {
      if (!sync) return null;
      try {
        return toVideoTime(sync, t);
      } catch {
        return null;
      }
    });
    sheets.push({ id: s.id, runId: s.run_id, times, video });
    yield {
      type: 'sheet',
      id: s.id,
      runId: s.run_id,
      name: s.name,
      startTime: s.start_time,
      endTime: s.end_time,
      interval: s.interval,
      rows: times.length,
      channelIds: s.channel_ids,
      reader: s.reader_id ? { id: s.reader_id, name: s.reader_name ?? '' } : null,
      checker: s.checker_id ? { id: s.checker_id, name: s.checker_name ?? '' } : null,
      pass1FinishedAt: iso(s.pass1_finished_at),
      pass2FinishedAt: iso(s.pass2_finished_at),
    };
  }

  // Analyses that use any of the runs (a balance may also use others; it is listed whole).
  const analyses = (await runner.query(
    `SELECT id, name, kind, note, run_ids, status, error, computed_at, input, result
       FROM analyses WHERE campaign_id = $1 AND run_ids && $2::uuid[]
      ORDER BY kind DESC, name, id`,
    [campaignId, orderedRunIds],
  )) as Array<{
    id: string;
    name: string;
    kind: string;
    note: string | null;
    run_ids: string[];
    status: string;
    error: string | null;
    computed_at: Date | null;
    input: unknown;
    result: unknown;
  }>;
  for (const a of analyses) {
    yield {
      type: 'analysis',
      id: a.id,
      name: a.name,
      kind: a.kind,
      note: a.note,
      runIds: a.run_ids,
      status: a.status,
      error: a.error,
      computedAt: iso(a.computed_at),
      input: a.input,
      result: a.result,
    };
  }
  if (sheets.length === 0) return;

  // Names of everyone who typed or resolved in these sheets (few people, however many cells).
  const sheetIds = sheets.map((s) => s.id);
  const people = (await runner.query(
    `SELECT u.id, u.name FROM users u
      WHERE u.id IN (SELECT DISTINCT entered_by FROM readings WHERE sheet_id = ANY($1::uuid[]))
         OR u.id IN (SELECT DISTINCT resolved_by FROM resolutions WHERE sheet_id = ANY($1::uuid[]))`,
    [sheetIds],
  )) as PersonName[];
  const names = new Map(people.map((p) => [p.id, p.name]));
  const nameOf = (id: string | null): string | null => (id === null ? null : (names.get(id) ?? 'Former member'));

  // pg-query-stream on the runner's own connection (inside its transaction), fetching
  // CURSOR_BATCH rows per round trip (TypeORM's QueryRunner.stream would fetch 100).
  const client = (await runner.connect()) as PoolClient;
  const stream = client.query(new QueryStream(CELLS_SQL, [sheetIds, sheets.map((s) => s.times.length)], { batchSize: CURSOR_BATCH, highWaterMark: CURSOR_BATCH }));
  try {
    for await (const rows of rowBatches<CellRow>(stream)) {
      const batch: SnapshotCell[] = [];
      for (const raw of rows) {
        const sheet = sheets[Number(raw.ord) - 1];
        const pass1: SnapshotEntry | null =
          raw.t1 === null ? null : { text: raw.t1, value: raw.v1, flag: raw.f1, frameTime: raw.ft1, by: nameOf(raw.u1) };
        const pass2: SnapshotEntry | null =
          raw.t2 === null ? null : { text: raw.t2, value: raw.v2, flag: raw.f2, frameTime: raw.ft2, by: nameOf(raw.u2) };
        const resolution: SnapshotResolution | null =
          raw.tr === null ? null : { text: raw.tr, value: raw.vr, flag: raw.fr, reason: raw.rr ?? '', by: nameOf(raw.ur) };
        let status: CellStatus;
        let final: SnapshotCell['final'] = null;
        if (pass1 && pass2) {
          const e1 = { value: raw.v1, flag: raw.f1, canonical: raw.c1 };
          const e2 = { value: raw.v2, flag: raw.f2, canonical: raw.c2 };
          if (raw.f1 === null && raw.f2 === null && sameEntry(e1, e2)) {
            status = 'agreed';
            final = { text: pass1.text, value: pass1.value, flag: null, framePts: pass1.frameTime };
          } else if (resolution) {
            status = 'resolved';
            const er = { value: raw.vr, flag: raw.fr, canonical: raw.cr };
            // The frame of the pass the resolution sided with; none when it differs from both.
            const framePts = sameEntry(er, e1) ? pass1.frameTime : sameEntry(er, e2) ? pass2.frameTime : null;
            final = { text: resolution.text, value: resolution.value, flag: resolution.flag, framePts };
          } else {
            status = 'mismatch';
          }
        } else if (pass1) {
          status = 'unchecked';
          final = { text: pass1.text, value: pass1.value, flag: pass1.flag, framePts: pass1.frameTime };
        } else {
          status = 'missing';
        }
        const chain = compiled.get(raw.channel_id) ?? null;
        const engineeringValue = final && final.value !== null && chain ? chain.apply(final.value) : null;
        batch.push({
          type: 'cell',
          runId: sheet.runId,
          sheetId: sheet.id,
          channelId: raw.channel_id,
          row: raw.row_index,
          testTime: sheet.times[raw.row_index],
          videoTime: sheet.video[raw.row_index],
          status,
          final,
          engineeringValue: engineeringValue !== null && Number.isFinite(engineeringValue) ? engineeringValue : null,
          pass1,
          pass2,
          resolution,
        });
      }
      yield batch;
    }
  } finally {
    // Ends the cursor when the consumer stops early (a client that went away).
    stream.destroy();
  }
}

/** Parses the lines of a stored snapshot back into the items of a dataset stream. */
export async function* parseSnapshot(lines: AsyncIterable<string>): AsyncGenerator<SnapshotItem> {
  let batch: SnapshotCell[] = [];
  for await (const line of lines) {
    if (line.length === 0) continue;
    const record = JSON.parse(line) as SnapshotRecord;
    if (record.type === 'cell') {
      batch.push(record);
      if (batch.length >= CELL_BATCH) {
        yield batch;
        batch = [];
      }
      continue;
    }
    if (batch.length > 0) {
      yield batch;
      batch = [];
    }
    yield record;
  }
  if (batch.length > 0) yield batch;
}
