// `npm run bench -- export`: 1 000 000 readings exported as CSV (long format) through the API,
// streamed from the database. In a throw-away Dialsheet, one run with a long, tiny recording gets
// four sheets of 41 667 rows × 6 channels (1 000 008 cells); both passes of every cell are
// inserted in bulk by SQL (they agree), so the export walks 2 000 016 readings. The export is the
// lead's draft export of that run (GET /api/campaigns/:id/export?format=csv-long&runIds=…): the
// path that reads live data through a server-side cursor.
//
// Figures: the server's memory growth during the export (peak RSS from the kernel's VmHWM, reset
// just before, and 50 ms samples, minus the RSS right before; target ≤ 100 MB) and the rows per
// second the client receives, beside PostgreSQL's own COPY of the same query's rows to a file in
// the same run (the ratio ours ÷ COPY, target ≥ 0.3). Two rounds each, alternating, the better
// round of each counted (the first of each warms caches). The exported file is checked: one line
// per cell after the header and the provenance lines. Printed beside it: the same run signed as a
// release (time to snapshot and hash) and its CSV exported from the stored snapshot.
import http from 'node:http';
import fs from 'node:fs';
import path from 'node:path';
import { connectDatabase } from './lib/database';
import { panelChannels, memberId, openSheet, runWithRecording } from './lib/fixtures';
import { runBenchmark, secondsSince, startStack } from './lib/harness';
import { memoryOf, resetPeak, round, RssSampler } from './lib/measure';
import { makeTestVideo } from './lib/videos';
import { CELLS_SQL } from '../backend/src/modules/exports/snapshot';

const SHEETS = 4;
/** 0 to 4166.6 s every 0.1 s: 41 667 rows; × 6 channels × 4 sheets = 1 000 008 cells. */
const SHEET = { startTime: 0, endTime: 4166.6, interval: 0.1 };
/** Long enough for the sheets, tiny and slow so that processing it takes seconds. */
const VIDEO = { seconds: 4200, width: 64, height: 36, fps: 1, gop: 60 };
const ROUNDS = 2;
const MEMORY_TARGET_MB = 100;
const RATIO_TARGET = 0.3;

interface Download {
  seconds: number;
  bytes: number;
  lines: number;
  status: number;
}

/** GETs `url` and counts bytes and lines as they arrive, keeping nothing. */
function download(url: URL, authorization: string): Promise<Download> {
  return new Promise((resolve, reject) => {
    const started = process.hrtime.bigint();
    const req = http.get(url, { headers: { authorization } }, (res) => {
      let bytes = 0;
      let lines = 0;
      res.on('data', (chunk: Buffer) => {
        bytes += chunk.length;
        for (let i = chunk.indexOf(10); i !== -1; i = chunk.indexOf(10, i + 1)) lines++;
      });
      res.on('end', () => resolve({ seconds: secondsSince(started), bytes, lines, status: res.statusCode ?? 0 }));
      res.on('error', reject);
    });
    req.on('error', reject);
  });
}

runBenchmark('export', 25 * 60_000, async (scratch) => {
  const root = scratch.tempDir('export');
  const stack = await startStack(scratch, root, { worker: true });
  const db = await connectDatabase(scratch, stack.databaseUrl);
  const pid = stack.app.child.pid;
  if (pid === undefined) throw new Error('the app process has no pid');

  let started = process.hrtime.bigint();
  const channels = await panelChannels(stack);
  const video = await makeTestVideo(root, 'long.mp4', VIDEO);
  const { run } = await runWithRecording(stack, 'Bench export', video, 0);
  const readerId = await memberId(stack, 'reader@demo.test');
  const checkerId = await memberId(stack, 'checker@demo.test');
  const sheets = [];
  for (let i = 0; i < SHEETS; i++) {
    sheets.push(await openSheet(stack, run.id, { name: `Export sheet ${i + 1}`, ...SHEET, channelIds: channels.map((c) => c.id) }, readerId, checkerId));
  }
  console.log(`set-up through the API in ${secondsSince(started).toFixed(1)} s: ${SHEETS} sheets of ${sheets[0].rowCount} rows × ${channels.length} channels`);

  // Both passes of every cell, agreeing, typed at the row's frame: values vary per row and channel.
  started = process.hrtime.bigint();
  await db.query(
    `INSERT INTO readings (sheet_id, row_index, channel_id, pass, raw_text, value, canonical, frame_time, entered_by)
     SELECT s.id, g.i, sc.channel_id, p.pass, v.text, v.text::float8, v.text, g.i * 0.1, CASE p.pass WHEN 1 THEN $2::uuid ELSE $3::uuid END
       FROM sheets s
       JOIN sheet_channels sc ON sc.sheet_id = s.id
       CROSS JOIN generate_series(0, $4::int - 1) AS g(i)
       CROSS JOIN (VALUES (1), (2)) AS p(pass)
       CROSS JOIN LATERAL (SELECT (((g.i * 7 + sc.position * 13) % 4000) / 10.0 - 20)::numeric(8, 1)::text AS text) v
      WHERE s.run_id = $1`,
    [run.id, readerId, checkerId, sheets[0].rowCount],
  );
  await db.query('UPDATE sheets SET pass1_finished_at = now(), pass2_finished_at = now() WHERE run_id = $1', [run.id]);
  await db.query('ANALYZE readings');
  const [{ cells, readings }] = (
    await db.query<{ cells: string; readings: string }>(
      `SELECT count(*) FILTER (WHERE r.pass = 1) AS cells, count(*) AS readings FROM readings r JOIN sheets s ON s.id = r.sheet_id WHERE s.run_id = $1`,
      [run.id],
    )
  ).rows;
  const cellCount = Number(cells);
  console.log(`bulk insert of ${readings} readings (${cellCount} cells, both passes) in ${secondsSince(started).toFixed(1)} s`);

  // The baseline: PostgreSQL writes the rows of the export's own query to a file itself.
  const sheetIds = sheets.map((s) => s.id);
  const literal = (values: Array<string | number>, type: string) => `'{${values.join(',')}}'::${type}[]`;
  const copySql = CELLS_SQL.replace('$1::uuid[]', literal(sheetIds, 'uuid')).replace('$2::int[]', literal(sheets.map((s) => s.rowCount), 'int'));
  // Inside the cluster's own directory: the server's system user may write there.
  const copyFile = path.join(root, 'postgres', 'data', 'bench-copy.csv');

  const url = new URL(`/api/campaigns/${stack.campaignId}/export?format=csv-long&runIds=${run.id}`, stack.baseUrl);
  const peakReset = resetPeak(pid);
  if (!peakReset) console.log('note: cannot reset the server’s VmHWM here; the peak comes from 50 ms samples only');
  const copyRates: number[] = [];
  const exportRates: number[] = [];
  let growth = 0;
  for (let i = 1; i <= ROUNDS; i++) {
    started = process.hrtime.bigint();
    const copied = await db.query(`COPY (${copySql}) TO '${copyFile}' WITH (FORMAT csv, HEADER)`);
    const copySeconds = secondsSince(started);
    const copyBytes = fs.statSync(copyFile).size;
    fs.rmSync(copyFile);
    copyRates.push(cellCount / copySeconds);

    const before = memoryOf(pid).rssMiB;
    if (peakReset) resetPeak(pid);
    const sampler = new RssSampler(pid, 50);
    sampler.start();
    const got = await download(url, stack.api.authorization);
    const peak = Math.max(sampler.stop(), peakReset ? memoryOf(pid).hwmMiB : 0);
    if (got.status !== 200) throw new Error(`export answered HTTP ${got.status}`);
    // Lines: the header, one per cell, and the "#" provenance lines (DRAFT, the run, the software).
    const expectedLines = cellCount + 1 + 3;
    if (got.lines !== expectedLines) throw new Error(`export had ${got.lines} lines, expected ${expectedLines}`);
    exportRates.push(cellCount / got.seconds);
    growth = Math.max(growth, peak - before);
    console.log(
      `round ${i}/${ROUNDS}: COPY ${copied.rowCount} rows in ${copySeconds.toFixed(2)} s = ${Math.round(copyRates.at(-1)!)} rows/s (${(copyBytes / 1e6).toFixed(0)} MB); ` +
        `export ${cellCount} rows in ${got.seconds.toFixed(2)} s = ${Math.round(exportRates.at(-1)!)} rows/s (${(got.bytes / 1e6).toFixed(0)} MB); ` +
        `server RSS ${before.toFixed(0)} MiB before, peak ${peak.toFixed(0)} MiB (growth ${(peak - before).toFixed(1)} MiB)`,
    );
  }
  // Beside the headline: the same rows signed as a release (snapshot written and hashed in the
  // signing transaction) and exported from the stored snapshot, re-hashed while read.
  started = process.hrtime.bigint();
  const release = await stack.api.json<{ id: string; number: number; readingCount: number }>('POST', `/api/campaigns/${stack.campaignId}/releases`, {
    title: 'Bench release',
    runIds: [run.id],
    sign: true,
  });
  const signSeconds = secondsSince(started);
  const releaseUrl = new URL(`/api/releases/${release.id}/export?format=csv-long`, stack.baseUrl);
  const beforeRelease = memoryOf(pid).rssMiB;
  if (peakReset) resetPeak(pid);
  const releaseSampler = new RssSampler(pid, 50);
  releaseSampler.start();
  const fromSnapshot = await download(releaseUrl, stack.api.authorization);
  const releasePeak = Math.max(releaseSampler.stop(), peakReset ? memoryOf(pid).hwmMiB : 0);
  if (fromSnapshot.status !== 200) throw new Error(`release export answered HTTP ${fromSnapshot.status}`);
  const releaseGrowth = releasePeak - beforeRelease;
  const releaseRate = cellCount / fromSnapshot.seconds;
  console.log(
    `release ${release.number} of ${release.readingCount} cells signed in ${signSeconds.toFixed(1)} s; its CSV from the snapshot in ` +
      `${fromSnapshot.seconds.toFixed(2)} s = ${Math.round(releaseRate)} rows/s, server memory growth ${releaseGrowth.toFixed(1)} MiB`,
  );

  const ours = Math.max(...exportRates);
  const copy = Math.max(...copyRates);
  console.log(`best: export ${Math.round(ours)} rows/s, COPY ${Math.round(copy)} rows/s, ratio ${(ours / copy).toFixed(2)} (target ≥ ${RATIO_TARGET}); memory growth ${growth.toFixed(1)} MiB (target ≤ ${MEMORY_TARGET_MB})`);
  return {
    name: 'export',
    value: round(growth, 1),
    unit: 'MB',
    stat: 'max',
    target: `<= ${MEMORY_TARGET_MB}`,
    ratio: round(ours / copy, 2),
    memory_mb: round(growth, 1),
    rows_per_s: Math.round(ours),
    copy_rows_per_s: Math.round(copy),
    ratio_target: `>= ${RATIO_TARGET}`,
    release_sign_s: round(signSeconds, 1),
    release_export_rows_per_s: Math.round(releaseRate),
    release_export_memory_mb: round(releaseGrowth, 1),
    rows: cellCount,
  };
});
