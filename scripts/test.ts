// `npm test`: every check the project has, in one run, against a throw-away PostgreSQL.
// Steps run in order and the run goes on after a failure, so one run shows every problem; the
// exit status is non-zero when any step failed. `npm test -- backend-api` runs one step (and the
// steps it needs). The last line is always
//   total: N passed, M failed[, K skipped]
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { migrateAndSeed, startApp, startMailCatcher, type AppSettings } from './lib/app';
import { ConfigError, readPort, readTestConfig, repoRoot, type TestConfig } from './lib/config';
import { databaseUrl, defineCluster, destroyCluster, ensureDatabase, initCluster, startCluster, stopCluster, UnreachableError, type Cluster } from './lib/postgres';
import { describeExit, run, Services, stopAll, succeeded, type Exit } from './lib/processes';

interface Counts {
  passed: number;
  failed: number;
  skipped: number;
}

interface Outcome {
  ok: boolean;
  counts?: Counts;
  note?: string;
}

interface StepResult extends Outcome {
  name: string;
  seconds?: number;
}

const results: StepResult[] = [];
let interrupted = false;
const bold = (text: string) => (process.stdout.isTTY && !process.env.NO_COLOR ? `\x1b[1m${text}\x1b[0m` : text);

for (const signal of ['SIGINT', 'SIGTERM', 'SIGHUP'] as const) {
  process.on(signal, () => {
    if (interrupted) return;
    interrupted = true;
    process.stderr.write(`\n${signal}: stopping the running step; the remaining steps are not run.\n`);
    void stopAll();
  });
}

/** Steps in run order, and the steps each one needs. `npm test -- NAME...` runs only those (and what they need). */
const steps: Record<string, string[]> = {
  lint: [],
  'build common': [],
  'type-check': ['build common'],
  'common unit': [],
  'scripts unit': [],
  'backend unit': ['build common'],
  'test database': [],
  'backend api': ['build common', 'test database'],
  'frontend components': [],
  'build all': [],
  'browser tests': ['test database', 'build all'],
};
const slug = (name: string) => name.replace(/ /g, '-');
let selected = new Set(Object.keys(steps));

function selectSteps(args: string[]): string | undefined {
  const wanted = args.filter((arg) => arg !== '--');
  if (wanted.length === 0) return undefined;
  const bySlug = new Map(Object.keys(steps).map((name) => [slug(name), name]));
  const unknown = wanted.filter((arg) => !bySlug.has(arg));
  if (unknown.length) return `Unknown step ${unknown.join(', ')}. Steps: ${[...bySlug.keys()].join(', ')}`;
  selected = new Set();
  const add = (name: string) => {
    selected.add(name);
    steps[name].forEach(add);
  };
  wanted.forEach((arg) => add(bySlug.get(arg)!));
  return undefined;
}

async function step(name: string, action: () => Promise<Outcome>): Promise<StepResult | undefined> {
  if (!selected.has(name)) return undefined;
  if (interrupted) {
    const result = { name, ok: false, note: 'not run (interrupted)' };
    results.push(result);
    return result;
  }
  process.stdout.write(`\n${bold(`━━ ${name} ━━`)}\n`);
  const started = performance.now();
  let outcome: Outcome;
  try {
    outcome = await action();
  } catch (error) {
    outcome = { ok: false, note: (error as Error).message };
  }
  if (interrupted) outcome = { ...outcome, ok: false, note: 'interrupted' };
  const seconds = (performance.now() - started) / 1000;
  const result: StepResult = { name, ...outcome, seconds };
  results.push(result);
  const verdict = result.ok ? 'passed' : 'FAILED';
  process.stdout.write(`${bold(`━━ ${name}: ${verdict}`)} (${seconds.toFixed(1)} s)${result.note ? ` — ${result.note}` : ''}\n`);
  return result;
}

function fromExit(exit: Exit, what: string): Outcome {
  return succeeded(exit) ? { ok: true } : { ok: false, note: `${what} ${describeExit(exit)}` };
}

/** The environment of every step: the caller's, minus a database a test must not touch. */
function baseEnv(extra: NodeJS.ProcessEnv = {}): NodeJS.ProcessEnv {
  const env: NodeJS.ProcessEnv = { ...process.env, ...extra };
  if (!('DATABASE_URL' in extra)) delete env.DATABASE_URL;
  return env;
}

function binary(name: string, dir: string): string {
  for (const base of [dir, repoRoot]) {
    const file = path.join(base, 'node_modules', '.bin', name);
    if (fs.existsSync(file)) return file;
  }
  throw new Error(`${name} is not installed (node_modules/.bin/${name} not found)`);
}

/** Where vitest writes its JSON reports; made in main() once the arguments are known to be good. */
let reportDir = '';

/** Runs vitest with a JSON report next to its normal output and reads the test counts from it. */
async function vitest(name: string, cwd: string, args: string[], env: NodeJS.ProcessEnv): Promise<Outcome> {
  const report = path.join(reportDir, `${name.replace(/[^a-z0-9]+/gi, '-')}.json`);
  const exit = await run(
    name,
    binary('vitest', cwd),
    ['run', ...args, '--reporter=default', '--reporter=json', `--outputFile=${report}`],
    { cwd, env, output: 'inherit' },
  );
  if (!fs.existsSync(report)) {
    return { ok: false, note: `vitest ${describeExit(exit)} before running any test (no test files found, or a startup error: see its output above)` };
  }
  const json = JSON.parse(fs.readFileSync(report, 'utf8')) as {
    numTotalTests?: number;
    numPassedTests?: number;
    numFailedTests?: number;
    numPendingTests?: number;
    numTodoTests?: number;
    numFailedTestSuites?: number;
  };
  const counts: Counts = {
    passed: json.numPassedTests ?? 0,
    failed: json.numFailedTests ?? 0,
    skipped: (json.numPendingTests ?? 0) + (json.numTodoTests ?? 0),
  };
  if ((json.numTotalTests ?? 0) === 0) {
    const why = succeeded(exit) ? 'no tests found' : `vitest ${describeExit(exit)} and ran no test (no test files found, or a startup error: see its output above)`;
    return { ok: false, counts, note: why };
  }
  if (!succeeded(exit)) {
    const suites = counts.failed === 0 && json.numFailedTestSuites ? `; ${json.numFailedTestSuites} test file(s) failed to load` : '';
    return { ok: false, counts, note: `vitest ${describeExit(exit)}${suites}` };
  }
  return { ok: counts.failed === 0, counts };
}

function freshDir(dir: string): string {
  fs.rmSync(dir, { recursive: true, force: true });
  fs.mkdirSync(dir, { recursive: true });
  return dir;
}

function tail(file: string, count: number): string {
  try {
    return fs.readFileSync(file, 'utf8').trimEnd().split('\n').slice(-count).join('\n');
  } catch {
    return '';
  }
}

/** Length of the demo video the browser tests read: long enough for a few sheet rows, short to make. */
const E2E_DEMO_SECONDS = 40;

async function browserTests(config: TestConfig, cluster: Cluster | undefined, buildOk: boolean): Promise<Outcome> {
  if (!buildOk) return { ok: false, note: 'the build failed, so there is no app to test' };
  if (!cluster) return { ok: false, note: 'no test database' };
  const port = readPort(process.env, 'E2E_PORT', 3100);
  const mailPort = readPort(process.env, 'E2E_MAIL_CATCHER_PORT', 2526);
  const runDir = path.join(config.storageDir, 'test-run');
  const log = path.join(runDir, 'e2e-app.log');
  fs.mkdirSync(runDir, { recursive: true });
  fs.writeFileSync(log, '');
  const settings: AppSettings = {
    port,
    host: '127.0.0.1',
    databaseUrl: databaseUrl(cluster, 'dialsheet_e2e_test'),
    storageDir: freshDir(path.join(runDir, 'e2e')),
    smtpUrl: `smtp://127.0.0.1:${mailPort}`,
    mailCatcherDir: freshDir(path.join(runDir, 'e2e-mail')),
    demoPassword: config.demoPassword,
    appUrl: `http://127.0.0.1:${port}`,
    // Three short demo runs (kept between test runs: the generator skips unchanged files), so the
    // browser tests transcribe the same kind of video a new user sees after `npm start`; each test
    // file that writes keeps to its own run (run 3 is released and locked by the release test).
    demoVideosDir: path.join(config.storageDir, 'test-run', 'demo-videos'),
  };
  let died: string | undefined;
  const services = new Services((proc, exit) => {
    died = `${proc.name} ${describeExit(exit)} during the browser tests`;
    if (!interrupted) process.stderr.write(`${died} (log: ${path.relative(repoRoot, log)})\n`);
  });
  const toLog = { file: log };
  let outcome: Outcome;
  try {
    console.log(`app, mail catcher, demo video, migrate and seed log to ${path.relative(repoRoot, log)}`);
    const demo = await run(
      'demo',
      process.execPath,
      ['--import', 'tsx', 'scripts/demo/generate-videos.ts', '--out', settings.demoVideosDir!, '--runs', '3', '--duration', String(E2E_DEMO_SECONDS)],
      { cwd: repoRoot, output: toLog },
    );
    if (!succeeded(demo)) throw new Error(`the demo video generator ${describeExit(demo)}`);
    await migrateAndSeed(settings, () => toLog);
    await startMailCatcher(services, { port: mailPort, dir: settings.mailCatcherDir, output: toLog, portVariable: 'E2E_MAIL_CATCHER_PORT' });
    await startApp(services, settings, toLog);
    console.log(`app ready at ${settings.appUrl}`);
    outcome = await vitest(
      'browser tests',
      repoRoot,
      ['--config', 'e2e/vitest.config.mts', ...config.e2eOnly],
      baseEnv({
        E2E_BASE_URL: settings.appUrl,
        DEMO_PASSWORD: settings.demoPassword,
        MAIL_CATCHER_DIR: settings.mailCatcherDir,
        // What a test needs to start a second server on the same database and storage (restart drills).
        E2E_APP_SETTINGS: JSON.stringify(settings),
      }),
    );
    if (died) outcome = { ...outcome, ok: false, note: [outcome.note, died].filter(Boolean).join('; ') };
  } catch (error) {
    outcome = { ok: false, note: (error as Error).message };
  } finally {
    await services.stopAll();
  }
  if (!outcome.ok && !interrupted) {
    process.stdout.write(`last lines of ${path.relative(repoRoot, log)}:\n${tail(log, 30)}\n`);
  }
  return outcome;
}

function printSummary(): { failedSteps: number } {
  const rows = results.map((r) => {
    const c = r.counts;
    const tests = c ? [`${c.passed} passed`, c.failed ? `${c.failed} failed` : '', c.skipped ? `${c.skipped} skipped` : ''].filter(Boolean).join(', ') : '-';
    return [r.name, r.ok ? 'pass' : r.seconds === undefined ? 'not run' : 'FAIL', tests, r.seconds === undefined ? '-' : r.seconds.toFixed(1)];
  });
  const header = ['step', 'result', 'tests', 'seconds'];
  const widths = header.map((h, i) => Math.max(h.length, ...rows.map((row) => row[i].length)));
  const line = (cells: string[]) => cells.map((cell, i) => (i === 3 ? cell.padStart(widths[i]) : cell.padEnd(widths[i]))).join('  ');
  process.stdout.write(`\n${bold(line(header))}\n${line(widths.map((w) => '-'.repeat(w)))}\n`);
  for (const row of rows) process.stdout.write(`${line(row)}\n`);
  const failures = results.filter((r) => !r.ok);
  for (const r of failures) if (r.note) process.stdout.write(`  ${r.name}: ${r.note}\n`);

  let passed = 0;
  let failed = 0;
  let skipped = 0;
  for (const r of results) {
    passed += r.counts?.passed ?? 0;
    skipped += r.counts?.skipped ?? 0;
    const failedTests = r.counts?.failed ?? 0;
    // A step that failed without a failing test (lint, build, no tests found) still counts once.
    failed += r.ok ? failedTests : Math.max(1, failedTests);
  }
  process.stdout.write(`total: ${passed} passed, ${failed} failed${skipped > 0 ? `, ${skipped} skipped` : ''}\n`);
  return { failedSteps: failures.length };
}

async function main(): Promise<number> {
  let config: TestConfig;
  try {
    config = readTestConfig();
    readPort(process.env, 'E2E_PORT', 3100);
    readPort(process.env, 'E2E_MAIL_CATCHER_PORT', 2526);
  } catch (error) {
    if (error instanceof ConfigError) {
      process.stderr.write(`Configuration error: ${error.message}\n`);
      return 2;
    }
    throw error;
  }
  const problem = selectSteps(process.argv.slice(2));
  if (problem) {
    process.stderr.write(`${problem}\n`);
    return 2;
  }
  fs.mkdirSync(config.storageDir, { recursive: true });
  reportDir = fs.mkdtempSync(path.join(os.tmpdir(), 'dialsheet-test-'));
  let cluster: Cluster | undefined;
  let temporaryClusterDir: string | undefined;
  const clusterDir = path.join(config.storageDir, 'test-postgres');
  try {
    await step('lint', async () => {
      const configs = ['eslint.config.js', 'eslint.config.mjs', 'eslint.config.cjs', 'eslint.config.ts', 'eslint.config.mts', 'eslint.config.cts'];
      if (!configs.some((file) => fs.existsSync(path.join(repoRoot, file)))) {
        return { ok: false, note: 'no eslint.config.* at the repository root' };
      }
      return fromExit(await run('lint', binary('eslint', repoRoot), ['.'], { cwd: repoRoot, env: baseEnv(), output: 'inherit' }), 'eslint');
    });
    await step('build common', async () =>
      fromExit(await run('build', 'npm', ['run', 'build', '-w', 'common'], { cwd: repoRoot, env: baseEnv(), output: 'inherit' }), 'npm run build -w common'),
    );
    // The backend type-checks against common's emitted declarations, so common is built first.
    await step('type-check', async () => {
      const workspaces = fromExit(await run('typecheck', 'npm', ['run', 'typecheck'], { cwd: repoRoot, env: baseEnv(), output: 'inherit' }), 'npm run typecheck');
      // The scripts and benchmarks are not workspaces, so the workspaces' typecheck does not cover them.
      const others = [];
      for (const project of ['scripts/tsconfig.json', 'bench/tsconfig.json']) {
        others.push(
          fromExit(
            await run('typecheck', binary('tsc', repoRoot), ['-p', project], { cwd: repoRoot, env: baseEnv(), output: 'inherit' }),
            `tsc -p ${project}`,
          ),
        );
      }
      const all = [workspaces, ...others];
      const notes = all.map((outcome) => outcome.note).filter(Boolean);
      return { ok: all.every((outcome) => outcome.ok), note: notes.length ? notes.join('; ') : undefined };
    });
    await step('common unit', () => vitest('common unit', path.join(repoRoot, 'common'), [], baseEnv()));
    // The developer scripts' own tests, including the embedded-PostgreSQL helpers on a real cluster.
    await step('scripts unit', () => vitest('scripts unit', repoRoot, ['--config', 'scripts/vitest.config.mts'], baseEnv()));
    await step('backend unit', () => vitest('backend unit', path.join(repoRoot, 'backend'), ['--project', 'unit'], baseEnv()));
    await step('test database', async () => {
      // A leftover from an interrupted run is stopped and removed; each run starts empty.
      await destroyCluster(await defineCluster({ dir: clusterDir, port: config.pgTestPort, throwaway: true }));
      let fresh = await defineCluster({ dir: clusterDir, port: config.pgTestPort, throwaway: true });
      try {
        await initCluster(fresh);
      } catch (error) {
        if (!(error instanceof UnreachableError)) throw error;
        // Typical of a checkout under /root: the server's user cannot pass through it. A
        // throw-away cluster loses nothing by living in the temp directory instead.
        fs.rmSync(clusterDir, { recursive: true, force: true });
        temporaryClusterDir = fs.mkdtempSync(path.join(os.tmpdir(), 'dialsheet-test-postgres-'));
        fs.chmodSync(temporaryClusterDir, 0o711);
        console.log(`${error.message.split('\n')[0]};\nusing ${temporaryClusterDir} for the test database instead.`);
        fresh = await defineCluster({ dir: path.join(temporaryClusterDir, 'cluster'), port: config.pgTestPort, throwaway: true });
        await initCluster(fresh);
      }
      cluster = fresh;
      await startCluster(fresh);
      // "test" in the names: the API tests' global setup resets its database and refuses any
      // whose name lacks it, so a mistyped DATABASE_URL can never wipe real data.
      await ensureDatabase(fresh, 'dialsheet_api_test');
      await ensureDatabase(fresh, 'dialsheet_e2e_test');
      console.log(`PostgreSQL on 127.0.0.1:${fresh.port}, databases dialsheet_api_test and dialsheet_e2e_test`);
      return { ok: true };
    });
    const databaseReady = results.find((r) => r.name === 'test database')?.ok === true;
    await step('backend api', async () => {
      if (!cluster || !databaseReady) return { ok: false, note: 'no test database' };
      return vitest(
        'backend api',
        path.join(repoRoot, 'backend'),
        ['--project', 'api'],
        baseEnv({
          DATABASE_URL: databaseUrl(cluster, 'dialsheet_api_test'),
          STORAGE_DIR: freshDir(path.join(config.storageDir, 'test-run', 'api')),
        }),
      );
    });
    await step('frontend components', () => vitest('frontend components', path.join(repoRoot, 'frontend'), [], baseEnv()));
    const build = await step('build all', async () =>
      fromExit(await run('build', 'npm', ['run', 'build'], { cwd: repoRoot, env: baseEnv(), output: 'inherit' }), 'npm run build'),
    );
    await step('browser tests', () => browserTests(config, databaseReady ? cluster : undefined, build?.ok === true));
  } finally {
    await stopAll();
    if (cluster) {
      try {
        await stopCluster(cluster);
        console.log('\ntest PostgreSQL stopped.');
      } catch (error) {
        process.stderr.write(`could not stop the test PostgreSQL: ${(error as Error).message}\n`);
      }
    }
    if (temporaryClusterDir) fs.rmSync(temporaryClusterDir, { recursive: true, force: true });
    fs.rmSync(reportDir, { recursive: true, force: true });
  }
  const { failedSteps } = printSummary();
  if (interrupted) return 130;
  return failedSteps > 0 ? 1 : 0;
}

main().then(
  (code) => process.exit(code),
  (error: unknown) => {
    process.stderr.write(`npm test stopped: ${(error as Error).stack ?? String(error)}\n`);
    process.exit(1);
  },
);
