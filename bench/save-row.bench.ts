// `npm run bench -- save-row`: how long saving one row of readings takes while 50 people save at
// once, over real HTTP on loopback. In a throw-away Dialsheet, 50 sheets (one per client, as the
// server locks the sheet row during a save) of six channels are open for the demo reader; each
// client has its own keep-alive connection and PUTs successive rows of six readings
// (/api/sheets/:id/rows/:rowIndex, pass 1).
//
// Phases: one client alone (the unloaded cost of a save); then all 50 saving back to back with no
// pause (the headline: every client always has a save in flight, so this is the worst sustained
// load 50 people can make); then all 50 with a pause of 0.5–1.5 s between rows (still faster
// than anyone reads six displays). Figures: latency p50/p95/p99/max per phase, saves per second,
// errors; target p99 ≤ 50 ms with zero errors. Afterwards the database must hold every
// acknowledged row exactly once, as typed, each reading with its audit entry (zero lost).
// A profile follows: SQL statements per save (pg_stat_statements), CPU per save of the app, of
// PostgreSQL and of this load generator, and how busy the app's connection pool was.
//
// The database runs with fsync off (throw-away cluster), so commit waits no disk: the figures
// are for the app and PostgreSQL's work, not a disk's flush latency.
import http from 'node:http';
import type { Channel, SaveRowRequest, SaveRowResponse } from '@dialsheet/common';
import { connectDatabase, postmasterPid } from './lib/database';
import { panelChannels, memberId, openSheet, runWithRecording } from './lib/fixtures';
import { runBenchmark, secondsSince, sleep, startStack } from './lib/harness';
import { ApiClient } from './lib/http-client';
import { cpuMsOf, median, percentile, round, treeCpuMs } from './lib/measure';
import { makeTestVideo } from './lib/videos';

const CLIENTS = 50;
const SERIAL_SAVES = 150;
const WARM_UP_MS = 3_000;
const CLOSED_MS = 20_000;
const PACED_MS = 15_000;
const PACE_MIN_MS = 500;
const PACE_MAX_MS = 1_500;
const P99_TARGET_MS = 50;
/** Rows at 0.1 s from 0 to 125 s: 1251 per sheet, more than any client reaches. */
const SHEET = { startTime: 0, endTime: 125, interval: 0.1 };
/** A tiny recording is enough: the rows need a processed video to exist, not to be watched. */
const VIDEO = { seconds: 130, width: 64, height: 36, fps: 2, gop: 20 };

interface Outcome {
  sheet: number;
  row: number;
  ms: number;
  ok: boolean;
}

/** The six values typed for a row: plausible, different from row to row, exact as text. */
function rowTexts(row: number): string[] {
  const t = (base: number) => (base + (row % 200) / 10).toFixed(1);
  return [t(20), t(30), t(15), t(25), (2.5 + (row % 100) / 1000).toFixed(3), (5 + (row % 8) * 0.5).toFixed(1)];
}

class SaveClient {
  readonly agent = new http.Agent({ keepAlive: true, maxSockets: 1 });
  nextRow = 0;
  readonly errors: string[] = [];

  constructor(
    readonly index: number,
    readonly sheetId: string,
    private readonly channels: Channel[],
    private readonly authorization: string,
    private readonly url: URL,
    readonly rowCount: number,
  ) {}

  /** PUTs the next row; resolves with its latency and whether the answer was the promised one. */
  save(): Promise<Outcome> {
    const row = this.nextRow++;
    const texts = rowTexts(row);
    const body: SaveRowRequest = {
      pass: 1,
      readings: this.channels.map((channel, i) => ({ channelId: channel.id, rawText: texts[i], frameTime: Math.floor(row * 0.1 * 2) / 2 })),
    };
    const payload = Buffer.from(JSON.stringify(body));
    const url = new URL(`/api/sheets/${this.sheetId}/rows/${row}`, this.url);
    return new Promise((resolve) => {
      const started = process.hrtime.bigint();
      const done = (ok: boolean, problem?: string) => {
        const ms = Number(process.hrtime.bigint() - started) / 1e6;
        if (problem && this.errors.length < 5) this.errors.push(`row ${row}: ${problem}`);
        resolve({ sheet: this.index, row, ms, ok });
      };
      const request = http.request(
        url,
        {
          method: 'PUT',
          agent: this.agent,
          headers: { authorization: this.authorization, 'content-type': 'application/json', 'content-length': String(payload.length) },
        },
        (response) => {
          const chunks: Buffer[] = [];
          response.on('data', (chunk: Buffer) => chunks.push(chunk));
          response.on('error', (error) => done(false, error.message));
          response.on('end', () => {
            const text = Buffer.concat(chunks).toString('utf8');
            if (response.statusCode !== 200) return done(false, `HTTP ${response.statusCode} ${text.slice(0, 200)}`);
            try {
              const answer = JSON.parse(text) as SaveRowResponse;
              const good = answer.readings.length === texts.length && answer.readings.every((r, i) => r.rawText === texts[i] && r.rowIndex === row);
              done(good, good ? undefined : `the answer does not echo the row: ${text.slice(0, 200)}`);
            } catch {
              done(false, `the answer is not JSON: ${text.slice(0, 200)}`);
            }
          });
        },
      );
      request.setTimeout(10_000, () => request.destroy(new Error('no answer within 10 s')));
      request.on('error', (error) => done(false, error.message));
      request.end(payload);
    });
  }

  /** Saves rows one after another until `untilMs` (performance.now()), pausing `pause()` ms between them. */
  async loop(untilMs: number, out: Outcome[], pause?: () => number): Promise<void> {
    while (performance.now() < untilMs && this.nextRow < this.rowCount) {
      out.push(await this.save());
      if (pause) await sleep(Math.min(pause(), Math.max(0, untilMs - performance.now())));
    }
  }
}

function summary(label: string, outcomes: Outcome[], seconds: number): string {
  const ms = outcomes.map((o) => o.ms);
  const f = (p: number) => percentile(ms, p).toFixed(1);
  const errors = outcomes.filter((o) => !o.ok).length;
  return (
    `${label}: ${outcomes.length} saves in ${seconds.toFixed(1)} s (${(outcomes.length / seconds).toFixed(0)}/s), ` +
    `p50 ${f(50)} ms, p95 ${f(95)} ms, p99 ${f(99)} ms, max ${Math.max(...ms).toFixed(1)} ms, errors ${errors}`
  );
}

runBenchmark('save-row', 5 * 60_000, async (scratch) => {
  const root = scratch.tempDir('save-row');
  const stack = await startStack(scratch, root, {
    worker: true,
    // For the profile: statement counts and times per query text.
    postgresSettings: { shared_preload_libraries: "'pg_stat_statements'", 'pg_stat_statements.track': "'top'" },
  });
  const db = await connectDatabase(scratch, stack.databaseUrl);
  await db.query('CREATE EXTENSION IF NOT EXISTS pg_stat_statements');
  const postmaster = await postmasterPid(db);

  let started = process.hrtime.bigint();
  const channels = await panelChannels(stack);
  const video = await makeTestVideo(root, 'rows.mp4', VIDEO);
  const { run } = await runWithRecording(stack, 'Bench save-row', video, 0);
  const readerId = await memberId(stack, 'reader@demo.test');
  const checkerId = await memberId(stack, 'checker@demo.test');
  const sheets = [];
  for (let i = 0; i < CLIENTS; i++) {
    sheets.push(await openSheet(stack, run.id, { name: `Bench sheet ${i + 1}`, ...SHEET, channelIds: channels.map((c) => c.id) }, readerId, checkerId));
  }
  const reader = await ApiClient.signIn(stack.baseUrl, 'reader@demo.test', stack.demoPassword);
  console.log(
    `set-up in ${secondsSince(started).toFixed(1)} s: ${channels.length} channels, a processed ${VIDEO.seconds} s recording with sync, ` +
      `${CLIENTS} sheets of ${sheets[0].rowCount} rows assigned to the demo reader`,
  );

  const base = new URL(stack.baseUrl);
  const clients = sheets.map((sheet, i) => new SaveClient(i, sheet.id, channels, reader.authorization, base, sheet.rowCount));
  scratch.add('close the client connections', () => clients.forEach((c) => c.agent.destroy()));

  // 1. One client alone: what a save costs when nothing else happens.
  const serial: Outcome[] = [];
  const primer: Outcome[] = [];
  for (let i = 0; i < 20; i++) primer.push(await clients[0].save());
  await db.query('SELECT pg_stat_statements_reset()');
  started = process.hrtime.bigint();
  for (let i = 0; i < SERIAL_SAVES; i++) serial.push(await clients[0].save());
  const serialSeconds = secondsSince(started);
  const statements = await db.query<{ calls: string }>(
    `SELECT coalesce(sum(calls), 0)::bigint AS calls FROM pg_stat_statements s JOIN pg_database d ON d.oid = s.dbid
      WHERE d.datname = current_database() AND s.query NOT ILIKE '%pg_stat_statements%'`,
  );
  const statementsPerSave = Number(statements.rows[0].calls) / SERIAL_SAVES;
  console.log(summary('1 client alone', serial, serialSeconds));
  console.log(`  SQL statements per save: ${statementsPerSave.toFixed(1)} (pg_stat_statements, BEGIN/COMMIT included)`);
  const top = await db.query<{ calls: string; mean: number; query: string }>(
    `SELECT calls::bigint AS calls, mean_exec_time AS mean, regexp_replace(query, '\\s+', ' ', 'g') AS query
       FROM pg_stat_statements s JOIN pg_database d ON d.oid = s.dbid
      WHERE d.datname = current_database() AND s.query NOT ILIKE '%pg_stat_statements%'
      ORDER BY calls DESC, total_exec_time DESC LIMIT 12`,
  );
  for (const q of top.rows) {
    console.log(`    ${(Number(q.calls) / SERIAL_SAVES).toFixed(1)}× per save, ${q.mean.toFixed(3)} ms each: ${q.query.slice(0, 110)}`);
  }

  // 2. All clients back to back, no pause; the first seconds warm up and are not counted.
  const warmUp: Outcome[] = [];
  const closed: Outcome[] = [];
  const pool: number[] = [];
  const poolOpen: number[] = [];
  const lockWaits: number[] = [];
  let sampling = true;
  const sampler = (async () => {
    while (sampling) {
      const { rows } = await db.query<{ open: number; active: number; locks: number }>(
        `SELECT count(*)::int AS open, count(*) FILTER (WHERE state <> 'idle')::int AS active,
                count(*) FILTER (WHERE wait_event_type = 'Lock')::int AS locks
           FROM pg_stat_activity WHERE application_name = 'dialsheet' AND datname = current_database()`,
      );
      pool.push(rows[0].active);
      poolOpen.push(rows[0].open);
      lockWaits.push(rows[0].locks);
      await sleep(100);
    }
  })();
  const warmUntil = performance.now() + WARM_UP_MS;
  await Promise.all(clients.map((c) => c.loop(warmUntil, warmUp)));
  await db.query('SELECT pg_stat_statements_reset()');
  const cpuBefore = { app: cpuMsOf(stack.app.child.pid!) ?? 0, pg: treeCpuMs(postmaster), us: process.cpuUsage() };
  pool.length = 0;
  poolOpen.length = 0;
  lockWaits.length = 0;
  started = process.hrtime.bigint();
  const closedUntil = performance.now() + CLOSED_MS;
  await Promise.all(clients.map((c) => c.loop(closedUntil, closed)));
  const closedSeconds = secondsSince(started);
  sampling = false;
  await sampler;
  const us = process.cpuUsage(cpuBefore.us);
  const cpu = {
    app: ((cpuMsOf(stack.app.child.pid!) ?? 0) - cpuBefore.app) / closed.length,
    pg: (treeCpuMs(postmaster) - cpuBefore.pg) / closed.length,
    client: (us.user + us.system) / 1000 / closed.length,
  };
  console.log(summary(`${CLIENTS} clients, no pause`, closed, closedSeconds));
  const { rows: waits } = await db.query<{ mean: number; max: number; calls: string }>(
    `SELECT mean_exec_time AS mean, max_exec_time AS max, calls::bigint AS calls FROM pg_stat_statements s JOIN pg_database d ON d.oid = s.dbid
      WHERE d.datname = current_database() AND s.query ILIKE 'SELECT%FROM "sheets"%FOR UPDATE%' ORDER BY calls DESC LIMIT 1`,
  );
  console.log(
    `  CPU per save: app ${cpu.app.toFixed(2)} ms, PostgreSQL ${cpu.pg.toFixed(2)} ms, this load generator ${cpu.client.toFixed(2)} ms ` +
      `(${(cpu.app + cpu.pg + cpu.client).toFixed(2)} ms in all; this machine has 2 cores shared with whatever else runs)`,
  );
  console.log(
    `  app connections busy in PostgreSQL: median ${median(pool)}, max ${Math.max(...pool)} of ${Math.max(...poolOpen)} open (the app's pool); ` +
      `waiting on a lock: max ${Math.max(...lockWaits)}` +
      (waits[0] ? `; the sheet-row lock query took ${waits[0].mean.toFixed(2)} ms on average, ${waits[0].max.toFixed(1)} ms at most` : ''),
  );

  // 3. All clients with a typing pause between rows.
  const paced: Outcome[] = [];
  started = process.hrtime.bigint();
  const pacedUntil = performance.now() + PACED_MS;
  const pause = () => PACE_MIN_MS + Math.random() * (PACE_MAX_MS - PACE_MIN_MS);
  // Each client starts at a random moment of the first pause, as people do not press Enter in step.
  await Promise.all(clients.map(async (c) => (await sleep(Math.random() * PACE_MAX_MS), c.loop(pacedUntil, paced, pause))));
  console.log(summary(`${CLIENTS} clients, ${PACE_MIN_MS / 1000}–${PACE_MAX_MS / 1000} s between rows`, paced, secondsSince(started)));

  // 4. Nothing lost: every acknowledged row is stored once, as typed, with its audit entries.
  const all = [...primer, ...serial, ...warmUp, ...closed, ...paced];
  const saved = new Map<string, Outcome>();
  for (const o of all) if (o.ok) saved.set(`${o.sheet}:${o.row}`, o);
  const sheetIndex = new Map(sheets.map((s, i) => [s.id, i]));
  const { rows: stored } = await db.query<{ sheet_id: string; row_index: number; n: number; texts: string[] }>(
    `SELECT r.sheet_id, r.row_index, count(*)::int AS n, array_agg(r.raw_text ORDER BY sc.position) AS texts
       FROM readings r JOIN sheet_channels sc ON sc.sheet_id = r.sheet_id AND sc.channel_id = r.channel_id
      WHERE r.pass = 1 AND r.sheet_id = ANY($1::uuid[])
      GROUP BY r.sheet_id, r.row_index`,
    [sheets.map((s) => s.id)],
  );
  let lost = 0;
  let wrong = 0;
  const found = new Set<string>();
  for (const row of stored) {
    const key = `${sheetIndex.get(row.sheet_id)}:${row.row_index}`;
    found.add(key);
    if (row.n !== channels.length || row.texts.join('|') !== rowTexts(row.row_index).join('|')) wrong++;
  }
  for (const key of saved.keys()) if (!found.has(key)) lost++;
  const unacknowledged = [...found].filter((key) => !saved.has(key)).length;
  const { rows: counts } = await db.query<{ readings: number; distinct_cells: number; audits: number }>(
    `SELECT (SELECT count(*)::int FROM readings WHERE sheet_id = ANY($1::uuid[])) AS readings,
            (SELECT count(DISTINCT (sheet_id, row_index, channel_id, pass))::int FROM readings WHERE sheet_id = ANY($1::uuid[])) AS distinct_cells,
            (SELECT count(*)::int FROM audit_entries WHERE entity_type = 'reading' AND action = 'create') AS audits`,
    [sheets.map((s) => s.id)],
  );
  const c = counts[0];
  const duplicates = c.readings - c.distinct_cells;
  console.log(
    `database: ${saved.size} rows acknowledged, ${stored.length} stored; lost ${lost}, stored differently from what was typed ${wrong}, ` +
      `stored without an acknowledgement ${unacknowledged}, duplicate readings ${duplicates}, ` +
      `readings ${c.readings} with ${c.audits} audit entries`,
  );
  const errors = all.filter((o) => !o.ok).length;
  if (errors > 0) {
    console.log(`first errors: ${clients.flatMap((cl) => cl.errors.map((e) => `sheet ${cl.index + 1} ${e}`)).slice(0, 5).join('; ')}`);
  }
  const exhausted = clients.filter((cl) => cl.nextRow >= cl.rowCount).length;
  if (exhausted > 0) console.log(`note: ${exhausted} client(s) ran out of rows before the time was up`);
  if (lost > 0 || wrong > 0 || duplicates > 0 || c.audits !== c.readings) {
    throw new Error(`the database does not hold exactly what was acknowledged (lost ${lost}, wrong ${wrong}, duplicates ${duplicates}, audits ${c.audits}/${c.readings})`);
  }

  const closedMs = closed.map((o) => o.ms);
  const p99 = percentile(closedMs, 99);
  const pacedMs = paced.map((o) => o.ms);
  console.log(`p99 with ${CLIENTS} clients saving back to back: ${p99.toFixed(1)} ms (target ≤ ${P99_TARGET_MS}), errors ${errors}, lost ${lost}`);
  return {
    name: 'save-row',
    value: round(p99, 1),
    unit: 'ms',
    stat: 'p99',
    target: `<= ${P99_TARGET_MS}`,
    errors,
    lost,
    count: closed.length,
    p50: round(percentile(closedMs, 50), 1),
    p95: round(percentile(closedMs, 95), 1),
    saves_per_s: round(closed.length / closedSeconds, 0),
    paced_p99: round(percentile(pacedMs, 99), 1),
    alone_p50: round(percentile(serial.map((o) => o.ms), 50), 1),
    statements_per_save: round(statementsPerSave, 1),
  };
});
