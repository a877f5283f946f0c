// `npm run bench -- save-row`: how long a reader waits for a saved row while 50 readers enter
// rows at once, over real HTTP on loopback. In a throw-away Dialsheet, 50 sheets (one per reader,
// as the server locks the sheet row during a save) of six channels are open for the demo reader;
// each reader has its own keep-alive connection and PUTs successive rows of six readings
// (/api/sheets/:id/rows/:rowIndex, pass 1).
//
// The load model (the headline): a reader saves a row after reading six displays off the video
// and typing them, which takes seconds: each value means finding the display, reading it and
// typing four to six keys and Enter. One row per second per reader is a deliberately fast upper
// bound (six values a second is data-entry speed with no reading at all), so each reader here
// presses Enter for the next row 0.5–1.5 s (uniformly, mean 1 s) after pressing it for the last
// one: 50 readers offer about 50 saves/s. The entry screen queues a row while the previous one is
// still being saved, so a reader's next save starts when it is due or when the previous answer
// came, whichever is later, and its latency is counted from when it was due (a slow answer is
// not hidden by the reader waiting for it). 60 s of it, as issue 7 asks, after 5 s at the same
// pace that warm the app's connection pool and are not counted; the figure is the p99 of all the
// saves of those 60 s, target ≤ 50 ms with zero errors.
//
// Beside it, printed but not the headline: one reader alone (the unloaded cost of a save, SQL
// statements per save) and all 50 saving back to back with no pause, which measures throughput
// (saves/s): with every client always waiting, latency there is clients ÷ throughput by
// Little's law, not what a reader waits for. Afterwards the database must hold every
// acknowledged row exactly once, as typed, each reading with its audit entry (zero lost). A
// profile follows the throughput run: CPU per save of the app, of PostgreSQL and of this load
// generator, and how busy the app's connection pool was.
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
const CLOSED_MS = 15_000;
/** Issue 7: 50 readers saving rows for 60 s. */
const PACED_MS = 60_000;
const PACED_WARM_UP_MS = 5_000;
/** One row per reader per second on average: a fast reader's upper bound (see the top of the file). */
const PACE_MIN_MS = 500;
const PACE_MAX_MS = 1_500;
const P99_TARGET_MS = 50;
/** Saves per second the readers offer: one row each per mean pause. */
const OFFERED_PER_S = CLIENTS / ((PACE_MIN_MS + PACE_MAX_MS) / 2 / 1000);
/** Rows at 0.1 s from 0 to 125 s: 1251 per sheet, more than any client reaches. */
const SHEET = { startTime: 0, endTime: 125, interval: 0.1 };
/** A tiny recording is enough: the rows need a processed video to exist, not to be watched. */
const VIDEO = { seconds: 130, width: 64, height: 36, fps: 2, gop: 20 };

interface Outcome {
  sheet: number;
  row: number;
  ms: number;
  ok: boolean;
  /** Paced rows: how long the row waited in the reader's queue behind the previous one (part of ms). */
  queuedMs?: number;
  /** Paced rows: when the row was due, in ms from the start of the phase. */
  dueAt?: number;
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

  /** Saves rows back to back until `untilMs` (performance.now()). */
  async loop(untilMs: number, out: Outcome[]): Promise<void> {
    while (performance.now() < untilMs && this.nextRow < this.rowCount) out.push(await this.save());
  }

  /**
   * A reader: the next row is due `pause()` ms after the last one was due; it is sent when due, or
   * when the previous answer came if that is later (the entry screen's queue), and its latency is
   * counted from when it was due. Rows due from `untilMs` on are not sent.
   */
  async paced(start: number, firstDue: number, untilMs: number, out: Outcome[], pause: () => number): Promise<void> {
    let due = firstDue;
    while (due < untilMs && this.nextRow < this.rowCount) {
      const wait = due - performance.now();
      if (wait > 0) await sleep(wait);
      const late = Math.max(0, performance.now() - due);
      const outcome = await this.save();
      out.push({ ...outcome, ms: outcome.ms + late, queuedMs: late, dueAt: due - start });
      due += pause();
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

runBenchmark('save-row', 6 * 60_000, async (scratch) => {
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

  // 2. The headline: 50 readers at a fast reader's pace for 60 s, after PACED_WARM_UP_MS at the
  // same pace that is not counted (like the throughput run's): until then the app's pool holds
  // the one connection the lone client used, and each connection it opens for the readers is a
  // new PostgreSQL process with cold caches. Those saves are still checked for errors and loss.
  const pacedWarmUp: Outcome[] = [];
  const paced: Outcome[] = [];
  const pause = () => PACE_MIN_MS + Math.random() * (PACE_MAX_MS - PACE_MIN_MS);
  const warmStart = performance.now();
  await Promise.all(clients.map((c) => c.paced(warmStart, warmStart + Math.random() * PACE_MAX_MS, warmStart + PACED_WARM_UP_MS, pacedWarmUp, pause)));
  const pacedCpuBefore = { app: cpuMsOf(stack.app.child.pid!) ?? 0, pg: treeCpuMs(postmaster) };
  started = process.hrtime.bigint();
  const pacedStart = performance.now();
  const pacedUntil = pacedStart + PACED_MS;
  // Each reader's first row is due at a random moment of a first pause: people do not press Enter in step.
  await Promise.all(clients.map((c) => c.paced(pacedStart, pacedStart + Math.random() * PACE_MAX_MS, pacedUntil, paced, pause)));
  const pacedSeconds = secondsSince(started);
  const pacedCpu = {
    app: ((cpuMsOf(stack.app.child.pid!) ?? 0) - pacedCpuBefore.app) / paced.length,
    pg: (treeCpuMs(postmaster) - pacedCpuBefore.pg) / paced.length,
  };
  console.log(
    summary(`${CLIENTS} readers, one row each every ${PACE_MIN_MS / 1000}–${PACE_MAX_MS / 1000} s (fast readers; latency from when the row was due)`, paced, pacedSeconds),
  );
  const answerMs = paced.map((o) => o.ms - (o.queuedMs ?? 0));
  console.log(
    `  the server's answer alone (send to reply, without the wait behind a reader's previous row): p50 ${percentile(answerMs, 50).toFixed(1)} ms, ` +
      `p99 ${percentile(answerMs, 99).toFixed(1)} ms; rows that had to wait for the previous one: ${paced.filter((o) => (o.queuedMs ?? 0) > 1).length}`,
  );
  // Whether the slowest 1% came in one burst (a stall of the whole machine) or spread over the minute.
  const slowest = [...paced].sort((a, b) => b.ms - a.ms).slice(0, Math.max(1, Math.ceil(paced.length / 100)));
  const slowSeconds = [...new Set(slowest.map((o) => Math.floor((o.dueAt ?? 0) / 1000)))].sort((a, b) => a - b);
  console.log(`  the slowest 1% (${slowest.length} saves, ≥ ${slowest[slowest.length - 1].ms.toFixed(0)} ms) were due in second(s) ${slowSeconds.join(', ')} of the run`);
  console.log(`  CPU per save at this pace: app ${pacedCpu.app.toFixed(2)} ms, PostgreSQL ${pacedCpu.pg.toFixed(2)} ms (idle work such as the job queue's polling included)`);

  // 3. Throughput: all clients back to back, no pause; the first seconds warm up and are not counted.
  // Readers that finished early sat idle while the others caught up; a kept-alive connection the
  // server is closing at that moment would fail the first request, so each starts on a fresh one.
  for (const c of clients) c.agent.destroy();
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
  const closedRate = closed.length / closedSeconds;
  console.log(summary(`throughput, ${CLIENTS} clients back to back (no reader works like this)`, closed, closedSeconds));
  console.log(
    `  by Little's law the mean wait there is clients ÷ throughput = ${CLIENTS} ÷ ${closedRate.toFixed(0)}/s ≈ ${((CLIENTS / closedRate) * 1000).toFixed(0)} ms: ` +
      `a measure of capacity (${(closedRate / OFFERED_PER_S).toFixed(1)}× the ${OFFERED_PER_S} saves/s ${CLIENTS} fast readers offer), not of a reader's wait`,
  );
  const { rows: waits } = await db.query<{ mean: number; max: number; calls: string }>(
    `SELECT mean_exec_time AS mean, max_exec_time AS max, calls::bigint AS calls FROM pg_stat_statements s JOIN pg_database d ON d.oid = s.dbid
      WHERE d.datname = current_database() AND s.query ILIKE 'SELECT%FROM%sheets%FOR UPDATE%' ORDER BY calls DESC LIMIT 1`,
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

  // 4. Nothing lost: every acknowledged row is stored once, as typed, with its audit entries.
  const all = [...primer, ...serial, ...pacedWarmUp, ...paced, ...warmUp, ...closed];
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
  const pacedMs = paced.map((o) => o.ms);
  const p99 = percentile(pacedMs, 99);
  const pacedErrors = paced.filter((o) => !o.ok).length;
  console.log(
    `p99 with ${CLIENTS} readers at one row per second each for ${PACED_MS / 1000} s: ${p99.toFixed(1)} ms (target ≤ ${P99_TARGET_MS}), ` +
      `errors ${pacedErrors}, lost ${lost}; throughput back to back ${closedRate.toFixed(0)} saves/s (p99 ${percentile(closedMs, 99).toFixed(1)} ms)`,
  );
  return {
    name: 'save-row',
    value: round(p99, 1),
    unit: 'ms',
    stat: 'p99',
    target: `<= ${P99_TARGET_MS}`,
    errors,
    lost,
    count: paced.length,
    p50: round(percentile(pacedMs, 50), 1),
    p95: round(percentile(pacedMs, 95), 1),
    max: round(Math.max(...pacedMs), 1),
    answer_p99: round(percentile(answerMs, 99), 1),
    pace: `${PACE_MIN_MS}-${PACE_MAX_MS} ms between rows per reader`,
    saves_per_s: round(closedRate, 0),
    back_to_back_p99: round(percentile(closedMs, 99), 1),
    back_to_back_p50: round(percentile(closedMs, 50), 1),
    alone_p50: round(percentile(serial.map((o) => o.ms), 50), 1),
    statements_per_save: round(statementsPerSave, 1),
    cpu_ms_per_save_app: round(cpu.app, 2),
    cpu_ms_per_save_pg: round(cpu.pg, 2),
  };
});
