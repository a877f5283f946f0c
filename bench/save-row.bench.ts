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
// Then the same paced load for 60 s across two API processes (WORKER=off) and one worker
// process on the same database and storage, half the readers on each (the issue's scale-out
// deployment); its p99 and lost rows are in the result line as two_api_p99 and two_api_lost.
//
// The database runs with fsync off (throw-away cluster), so commit waits no disk: the figures
// are for the app and PostgreSQL's work, not a disk's flush latency.
import { connectDatabase, postmasterPid } from './lib/database';
import { panelChannels, memberId, openSheet, runWithRecording } from './lib/fixtures';
import { freePort, runBenchmark, secondsSince, sleep, startScaleOutProcess, startStack } from './lib/harness';
import { ApiClient } from './lib/http-client';
import { cpuMsOf, median, percentile, round, treeCpuMs } from './lib/measure';
import { checkStored, SaveClient, type Outcome } from './lib/save-load';
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

function summary(label: string, outcomes: Outcome[], seconds: number): string {
  const ms = outcomes.map((o) => o.ms);
  const f = (p: number) => percentile(ms, p).toFixed(1);
  const errors = outcomes.filter((o) => !o.ok).length;
  return (
    `${label}: ${outcomes.length} saves in ${seconds.toFixed(1)} s (${(outcomes.length / seconds).toFixed(0)}/s), ` +
    `p50 ${f(50)} ms, p95 ${f(95)} ms, p99 ${f(99)} ms, max ${Math.max(...ms).toFixed(1)} ms, errors ${errors}`
  );
}

runBenchmark('save-row', 9 * 60_000, async (scratch) => {
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

  // 4. Scale-out: the same paced load across two API processes (WORKER=off) and one worker process
  // on the same database and storage, half the readers on each API process, as a deployment behind a
  // load balancer runs. The single app above stops first (it ran the jobs), so the machine's two
  // cores are shared by the same kind of work as before plus one more Node process.
  const scaleStarted = process.hrtime.bigint();
  await stack.app.stop();
  const apiA = await startScaleOutProcess(scratch, stack, 'api-a', { api: { port: await freePort() } });
  const apiB = await startScaleOutProcess(scratch, stack, 'api-b', { api: { port: await freePort() } });
  await startScaleOutProcess(scratch, stack, 'worker', { worker: true });
  for (const c of clients) c.agent.destroy();
  const spread = clients.map((old, i) => {
    const client = new SaveClient(i, old.sheetId, channels, reader.authorization, new URL(i % 2 === 0 ? apiA.baseUrl! : apiB.baseUrl!), old.rowCount);
    client.nextRow = old.nextRow;
    return client;
  });
  scratch.add('close the scale-out client connections', () => spread.forEach((c) => c.agent.destroy()));
  console.log(`scale-out: API processes ${apiA.baseUrl} and ${apiB.baseUrl} (WORKER=off) and a worker process up in ${secondsSince(scaleStarted).toFixed(1)} s`);
  const scaleWarmUp: Outcome[] = [];
  const scaled: Outcome[] = [];
  const scaleWarmStart = performance.now();
  await Promise.all(spread.map((c) => c.paced(scaleWarmStart, scaleWarmStart + Math.random() * PACE_MAX_MS, scaleWarmStart + PACED_WARM_UP_MS, scaleWarmUp, pause)));
  started = process.hrtime.bigint();
  const scaleStart = performance.now();
  await Promise.all(spread.map((c) => c.paced(scaleStart, scaleStart + Math.random() * PACE_MAX_MS, scaleStart + PACED_MS, scaled, pause)));
  const scaledSeconds = secondsSince(started);
  console.log(summary(`${CLIENTS} readers across 2 API processes + 1 worker, same pace`, scaled, scaledSeconds));
  const scaledAnswerMs = scaled.map((o) => o.ms - (o.queuedMs ?? 0));
  console.log(`  the server's answer alone: p50 ${percentile(scaledAnswerMs, 50).toFixed(1)} ms, p99 ${percentile(scaledAnswerMs, 99).toFixed(1)} ms`);

  // 5. Nothing lost: every acknowledged row is stored once, as typed, with its audit entries.
  const sheetIds = sheets.map((s) => s.id);
  const all = [...primer, ...serial, ...pacedWarmUp, ...paced, ...warmUp, ...closed, ...scaleWarmUp, ...scaled];
  const check = await checkStored(db, sheetIds, channels.length, all);
  const { lost, wrong, duplicates } = check;
  const scaledLost = (await checkStored(db, sheetIds, channels.length, [...scaleWarmUp, ...scaled])).lost;
  console.log(
    `database: ${check.acknowledged} rows acknowledged, ${check.stored} stored; lost ${lost} (${scaledLost} of them in the scale-out phase), ` +
      `stored differently from what was typed ${wrong}, stored without an acknowledgement ${check.unacknowledged}, duplicate readings ${duplicates}, ` +
      `readings ${check.readings} with ${check.audits} audit entries`,
  );
  const errors = all.filter((o) => !o.ok).length;
  if (errors > 0) {
    console.log(`first errors: ${[...clients, ...spread].flatMap((cl) => cl.errors.map((e) => `sheet ${cl.index + 1} ${e}`)).slice(0, 5).join('; ')}`);
  }
  const exhausted = spread.filter((cl) => cl.nextRow >= cl.rowCount).length;
  if (exhausted > 0) console.log(`note: ${exhausted} client(s) ran out of rows before the time was up`);
  if (lost > 0 || wrong > 0 || duplicates > 0 || check.audits !== check.readings) {
    throw new Error(`the database does not hold exactly what was acknowledged (lost ${lost}, wrong ${wrong}, duplicates ${duplicates}, audits ${check.audits}/${check.readings})`);
  }

  const closedMs = closed.map((o) => o.ms);
  const pacedMs = paced.map((o) => o.ms);
  const p99 = percentile(pacedMs, 99);
  const pacedErrors = paced.filter((o) => !o.ok).length;
  console.log(
    `p99 with ${CLIENTS} readers at one row per second each for ${PACED_MS / 1000} s: ${p99.toFixed(1)} ms (target ≤ ${P99_TARGET_MS}), ` +
      `errors ${pacedErrors}, lost ${lost}; throughput back to back ${closedRate.toFixed(0)} saves/s (p99 ${percentile(closedMs, 99).toFixed(1)} ms)`,
  );
  const scaledMs = scaled.map((o) => o.ms);
  const scaledP99 = percentile(scaledMs, 99);
  const scaledErrors = [...scaleWarmUp, ...scaled].filter((o) => !o.ok).length;
  console.log(
    `p99 with ${CLIENTS} readers across 2 API processes + 1 worker for ${PACED_MS / 1000} s: ${scaledP99.toFixed(1)} ms (target ≤ ${P99_TARGET_MS}), ` +
      `errors ${scaledErrors}, lost ${scaledLost}`,
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
    two_api_p99: round(scaledP99, 1),
    two_api_p50: round(percentile(scaledMs, 50), 1),
    two_api_count: scaled.length,
    two_api_errors: scaledErrors,
    two_api_lost: scaledLost,
  };
});
