// What every benchmark shares: a time budget, clean-up that also runs on failure or Ctrl-C, the
// one-line JSON result at the very end, and a throw-away Dialsheet (its own PostgreSQL cluster,
// storage directory and app process, all on 127.0.0.1) to measure against.
import { randomBytes } from 'node:crypto';
import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { backendEntry, healthUrl } from '../../scripts/lib/app';
import { repoRoot } from '../../scripts/lib/config';
import { databaseUrl, defineCluster, destroyCluster, ensureDatabase, initCluster, startCluster } from '../../scripts/lib/postgres';
import { describeExit, httpOk, run, Services, succeeded, waitFor, type Proc, type SpawnOptions } from '../../scripts/lib/processes';
import type { BenchResult } from '../../scripts/lib/bench-targets';
import { ApiClient } from './http-client';

export type { BenchResult } from '../../scripts/lib/bench-targets';

type Cleanup = () => Promise<void> | void;

/** Things to undo at the end, undone in reverse order; one failing step does not stop the rest. */
export class Scratch {
  private readonly steps: Array<{ what: string; undo: Cleanup }> = [];

  add(what: string, undo: Cleanup): void {
    this.steps.push({ what, undo });
  }

  async cleanUp(): Promise<void> {
    while (this.steps.length > 0) {
      const { what, undo } = this.steps.pop()!;
      try {
        await undo();
      } catch (error) {
        console.error(`clean-up: could not ${what}: ${(error as Error).message}`);
      }
    }
  }

  /** A fresh directory under the system's temporary directory, removed at the end. */
  tempDir(label: string): string {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), `dialsheet-bench-${label}-`));
    // When we run as root, PostgreSQL runs as its own system user and must pass through here.
    fs.chmodSync(dir, 0o711);
    this.add(`remove ${dir}`, () => fs.rmSync(dir, { recursive: true, force: true }));
    return dir;
  }
}

/**
 * Runs a benchmark body within `budgetMs`, cleans up whatever happens, prints the result as the
 * last line of stdout and exits: 0 when the measurement ran, 1 when it failed or ran out of time.
 */
export function runBenchmark(name: string, budgetMs: number, body: (scratch: Scratch) => Promise<BenchResult>): void {
  const scratch = new Scratch();
  let finishing: Promise<void> | undefined;
  const finish = (code: number, result?: BenchResult): Promise<void> => {
    finishing ??= (async () => {
      clearTimeout(timer);
      await scratch.cleanUp();
      if (result) console.log(JSON.stringify(result));
      process.exit(code);
    })();
    return finishing;
  };
  const timer = setTimeout(() => {
    console.error(`bench ${name}: still running after its budget of ${Math.round(budgetMs / 1000)} s; stopping`);
    void finish(1);
  }, budgetMs);
  for (const signal of ['SIGINT', 'SIGTERM', 'SIGHUP'] as const) {
    process.on(signal, () => {
      // The signal may come twice (to our process group and relayed by tsx); say it once.
      if (!finishing) console.error(`bench ${name}: ${signal} received; cleaning up`);
      void finish(1);
    });
  }
  body(scratch).then(
    (result) => finish(0, result),
    (error: unknown) => {
      const cause = error instanceof Error && error.cause instanceof Error ? ` (${error.cause.message})` : '';
      console.error(`bench ${name} failed: ${error instanceof Error ? error.message : String(error)}${cause}`);
      return finish(1);
    },
  );
}

// Ports other parts of the project (and the developer's own servers) use by default.
const RESERVED_PORTS = new Set([3000, 3100, 2525, 2526, 5432, 5433, 5434, 55432]);

/** A port the operating system says is free on 127.0.0.1 right now. */
export async function freePort(): Promise<number> {
  for (let attempt = 0; attempt < 20; attempt++) {
    const port = await new Promise<number>((resolve, reject) => {
      const server = net.createServer();
      server.once('error', reject);
      server.listen({ port: 0, host: '127.0.0.1', exclusive: true }, () => {
        const address = server.address() as net.AddressInfo;
        server.close(() => resolve(address.port));
      });
    });
    if (!RESERVED_PORTS.has(port)) return port;
  }
  throw new Error('no free TCP port found on 127.0.0.1');
}

export const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

/** Seconds (with a fraction) from a `process.hrtime.bigint()` reading to now. */
export function secondsSince(start: bigint): number {
  return Number(process.hrtime.bigint() - start) / 1e9;
}

function tail(file: string, lines: number): string {
  try {
    return fs.readFileSync(file, 'utf8').trimEnd().split('\n').slice(-lines).join('\n');
  } catch {
    return '(no log)';
  }
}

export interface Stack {
  /** e.g. http://127.0.0.1:41234 */
  baseUrl: string;
  app: Proc;
  /** The app's STORAGE_DIR. */
  storageDir: string;
  /** The app's output (it would drown the figures on screen). */
  logFile: string;
  /** Signed in as the seeded lead of the demo campaign. */
  api: ApiClient;
  /** The demo campaign, where the lead may create runs and upload. */
  campaignId: string;
  /** Password of every seeded demo account (reader@demo.test, checker@demo.test, ...). */
  demoPassword: string;
  /** The app's database, for set-up in bulk and for checking what was stored. */
  databaseUrl: string;
  /** The app's environment, for more processes on the same database and storage (startScaleOutProcess). */
  env: NodeJS.ProcessEnv;
}

export interface StackOptions {
  /** WORKER=on runs the processing jobs inside the app process. */
  worker: boolean;
  /** Extra postgresql.conf settings, e.g. to load pg_stat_statements for a profile. */
  postgresSettings?: Record<string, string>;
}

const BENCH_DATABASE = 'dialsheet_bench';

/**
 * A whole throw-away Dialsheet in `root`: PostgreSQL cluster (durability off, it is thrown away),
 * migrated and seeded database, the built app with its own storage directory. Everything it
 * starts is registered with `scratch`, so it is stopped and removed at the end.
 */
export async function startStack(scratch: Scratch, root: string, options: StackOptions): Promise<Stack> {
  const started = process.hrtime.bigint();
  // Figures from a busy machine mean little; say how busy it was.
  const load = os.loadavg()[0];
  console.log(`machine: ${os.cpus().length} CPUs, load average ${load.toFixed(1)} (1 min) at start${load > os.cpus().length ? ' — busy, figures will be pessimistic' : ''}`);
  const cluster = await defineCluster({ dir: path.join(root, 'postgres'), port: await freePort(), throwaway: true });
  Object.assign(cluster.settings, options.postgresSettings ?? {});
  scratch.add('remove the benchmark database cluster', () => destroyCluster(cluster));
  await initCluster(cluster);
  await startCluster(cluster);
  await ensureDatabase(cluster, BENCH_DATABASE);

  const port = await freePort();
  const baseUrl = `http://127.0.0.1:${port}`;
  const storageDir = path.join(root, 'storage');
  const logFile = path.join(root, 'app.log');
  fs.mkdirSync(storageDir, { recursive: true });
  const demoPassword = `bench-${randomBytes(9).toString('base64url')}`;
  const appDatabaseUrl = databaseUrl(cluster, BENCH_DATABASE);
  const env: NodeJS.ProcessEnv = {
    ...process.env,
    PORT: String(port),
    HOST: '127.0.0.1',
    APP_URL: baseUrl,
    DATABASE_URL: appDatabaseUrl,
    STORAGE_DIR: storageDir,
    STORAGE_DRIVER: 'local',
    JWT_SECRET: randomBytes(32).toString('hex'),
    DEMO_PASSWORD: demoPassword,
    // Nothing here sends mail; should something try, it must not reach a developer's catcher.
    SMTP_URL: `smtp://127.0.0.1:${await freePort()}`,
    MAIL_CATCHER_DIR: path.join(root, 'mail'),
    WORKER: options.worker ? 'on' : 'off',
    // Values a developer's shell may carry that would change what is measured; empty = unset.
    DEMO_VIDEOS_DIR: '',
    UPLOAD_MAX_BYTES: '',
    MEDIA_URL_TTL_SECONDS: '',
  };
  for (const name of ['migrate', 'seed']) {
    const exit = await run(name, process.execPath, [backendEntry(`cli/${name}.js`)], { cwd: repoRoot, env, output: { file: logFile } });
    if (!succeeded(exit)) throw new Error(`${name} ${describeExit(exit)}; last lines of its output:\n${tail(logFile, 20)}`);
  }

  const app = startProcess(scratch, 'app', process.execPath, [backendEntry('main.js')], { cwd: repoRoot, env, output: { file: logFile } });
  await waitFor(`the app (${baseUrl})`, () => httpOk(healthUrl({ host: '127.0.0.1', port })), 90_000, () =>
    app.running ? undefined : `it ${describeExit(app.exit!)} before it was ready:\n${tail(logFile, 30)}`,
  );

  const api = await ApiClient.signIn(baseUrl, 'lead@demo.test', demoPassword);
  const campaigns = await api.json<Array<{ id: string; myRoles: string[] }>>('GET', '/api/campaigns');
  const campaign = campaigns.find((c) => c.myRoles.includes('lead'));
  if (!campaign) throw new Error('the seeded lead is lead of no campaign; did the seed run?');
  console.log(
    `app ready in ${secondsSince(started).toFixed(1)} s: ${baseUrl} (WORKER=${env.WORKER}), PostgreSQL on 127.0.0.1:${cluster.port}, signed in as the seeded lead`,
  );
  return { baseUrl, app, storageDir, logFile, api, campaignId: campaign.id, demoPassword, databaseUrl: appDatabaseUrl, env };
}

/**
 * One more process of the stack's app on its database and storage, as a scaled-out deployment runs
 * them: an API server on `port` (WORKER=off, so it takes no jobs) or the job worker without HTTP
 * (backend/src/cli/worker.ts). Its output goes to the stack's log; it is stopped at the end.
 */
export async function startScaleOutProcess(
  scratch: Scratch,
  stack: Stack,
  name: string,
  role: { api: { port: number } } | { worker: true },
): Promise<{ proc: Proc; baseUrl: string | null }> {
  const options = { cwd: repoRoot, output: { file: stack.logFile } };
  if ('worker' in role) {
    // The worker has no HTTP to poll; its start-up line in the shared log says it is taking jobs.
    const before = fs.existsSync(stack.logFile) ? fs.statSync(stack.logFile).size : 0;
    const proc = startProcess(scratch, name, process.execPath, [backendEntry('cli/worker.js')], { ...options, env: { ...stack.env, WORKER: 'on' } });
    await waitFor(`the ${name} process`, async () => fs.readFileSync(stack.logFile, 'utf8').slice(before).includes('worker running'), 60_000, () =>
      proc.running ? undefined : `it ${describeExit(proc.exit!)} before it was ready:\n${tail(stack.logFile, 30)}`,
    );
    return { proc, baseUrl: null };
  }
  const { port } = role.api;
  const baseUrl = `http://127.0.0.1:${port}`;
  const env = { ...stack.env, PORT: String(port), APP_URL: baseUrl, WORKER: 'off' };
  const proc = startProcess(scratch, name, process.execPath, [backendEntry('main.js')], { ...options, env });
  await waitFor(`the ${name} process (${baseUrl})`, () => httpOk(healthUrl({ host: '127.0.0.1', port })), 90_000, () =>
    proc.running ? undefined : `it ${describeExit(proc.exit!)} before it was ready:\n${tail(stack.logFile, 30)}`,
  );
  return { proc, baseUrl };
}

/**
 * Starts a long-running process that is stopped at the end; with its output in a log file, an
 * exit nobody asked for is reported with the last lines of that log.
 */
export function startProcess(scratch: Scratch, name: string, command: string, args: string[], options: SpawnOptions): Proc {
  const services = new Services((proc, exit) => {
    const output = options.output;
    const log = typeof output === 'object' && 'file' in output ? `; last lines of its log:\n${tail(output.file, 30)}` : '';
    console.error(`${proc.name} ${describeExit(exit)} during the benchmark${log}`);
  });
  scratch.add(`stop ${name}`, () => services.stopAll());
  return services.start(name, command, args, options);
}

/** Runs a command, failing with its error output. */
export async function runTool(command: string, args: string[], cwd: string): Promise<void> {
  const log = path.join(cwd, `${path.basename(command)}.log`);
  const exit = await run(path.basename(command), command, args, { cwd, output: { file: log } });
  if (!succeeded(exit)) throw new Error(`${command} ${describeExit(exit)}:\n${tail(log, 15)}`);
  fs.rmSync(log, { force: true });
}
