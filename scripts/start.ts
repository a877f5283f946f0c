// `npm start`: one command from a fresh checkout to a running Dialsheet with demo data.
// Starts (or reuses) an embedded PostgreSQL in STORAGE_DIR unless DATABASE_URL is given, and a
// local mail catcher unless SMTP_URL is given; builds, migrates, seeds and runs the server.
// Ctrl-C stops everything this run started and nothing else.
import fs from 'node:fs';
import path from 'node:path';
import { migrateAndSeed, startApp, startMailCatcher, type AppSettings } from './lib/app';
import { ConfigError, readStartConfig, repoRoot, type StartConfig } from './lib/config';
import { defineCluster, ensureDatabase, initCluster, databaseUrl, psqlHint, runningPort, startCluster, stopCluster, type Cluster } from './lib/postgres';
import { canConnect, describeExit, run, Services, stopAll, succeeded, tag } from './lib/processes';

const say = (line: string) => process.stdout.write(`${tag('start')} ${line}\n`);

let cluster: Cluster | undefined;
let clusterStartedHere = false;
let shuttingDown = false;

const services = new Services((proc, exit) => {
  void shutdown(`${proc.name} ${describeExit(exit)} unexpectedly; stopping the rest.`, 1);
});

class Interrupted extends Error {}

/** Stops what this run started, in order: app and mail catcher, then the database. */
async function shutdown(reason: string, code: number): Promise<void> {
  if (shuttingDown) return;
  shuttingDown = true;
  if (reason) process.stderr.write(`${tag('start')} ${reason.replace(/\n/g, '\n    ')}\n`);
  say('stopping ...');
  await services.stopAll();
  await stopAll();
  if (cluster && clusterStartedHere) {
    try {
      await stopCluster(cluster);
      say('PostgreSQL stopped.');
    } catch (error) {
      process.stderr.write(`${tag('start')} ${(error as Error).message}\n`);
      code = code || 1;
    }
  }
  say('stopped.');
  process.exit(code);
}

for (const signal of ['SIGINT', 'SIGTERM', 'SIGHUP'] as const) {
  process.on(signal, () => void shutdown('', 0));
}

/** Throws once a shutdown has begun, so setup does not start anything new behind it. */
function guard(): void {
  if (shuttingDown) throw new Interrupted();
}

async function prepareDatabase(config: StartConfig): Promise<string> {
  if (config.databaseUrl) {
    say('using the database in DATABASE_URL.');
    return config.databaseUrl;
  }
  cluster = await defineCluster({ dir: path.join(config.storageDir, 'postgres'), port: config.pgPort });
  if (await initCluster(cluster)) {
    say(`created a PostgreSQL cluster in ${path.relative(repoRoot, cluster.dir) || cluster.dir}`);
  }
  guard();
  const running = runningPort(cluster);
  if (running !== undefined && (await canConnect(running))) {
    cluster.port = running;
    say(`PostgreSQL is already running on 127.0.0.1:${running}; using it (it keeps running after this app stops).`);
  } else {
    clusterStartedHere = true;
    await startCluster(cluster);
    say(`PostgreSQL started on 127.0.0.1:${cluster.port} (log: ${path.relative(repoRoot, cluster.logFile)})`);
  }
  guard();
  if (await ensureDatabase(cluster, 'dialsheet')) say('created database "dialsheet".');
  return databaseUrl(cluster, 'dialsheet');
}

function banner(config: StartConfig, settings: AppSettings, mailCatcher: boolean): void {
  const url = `http://${config.host === '0.0.0.0' ? '127.0.0.1' : config.host}:${config.port}`;
  const accounts: Array<[string, string]> = [
    ['admin@demo.test', 'platform administrator'],
    ['lead@demo.test', 'lead'],
    ['engineer@demo.test', 'engineer'],
    ['reader@demo.test', 'reader'],
    ['checker@demo.test', 'checker'],
  ];
  const lines = [
    `Dialsheet is running at ${url}`,
    '',
    `Demo sign-ins (password: ${config.demoPassword}):`,
    ...accounts.map(([email, role]) => `  ${email.padEnd(20)} ${role}`),
    '',
    mailCatcher
      ? `E-mail the app sends is caught locally: ${url}/admin/mail (files in ${path.relative(repoRoot, settings.mailCatcherDir)})`
      : `E-mail goes to ${config.smtpUrl}`,
  ];
  if (cluster) {
    lines.push('Database shell:', `  ${psqlHint(cluster, 'dialsheet')}`);
    if (!clusterStartedHere) lines.push('(PostgreSQL was already running and will keep running.)');
  }
  lines.push('', 'Ctrl-C stops the app and the database it started.');
  const width = Math.min(72, Math.max(...lines.map((l) => l.length)) + 2);
  const rule = '─'.repeat(width);
  process.stdout.write(`\n${rule}\n${lines.map((l) => (l ? ` ${l}` : '')).join('\n')}\n${rule}\n\n`);
}

async function main(): Promise<void> {
  let config: StartConfig;
  try {
    config = readStartConfig();
  } catch (error) {
    if (error instanceof ConfigError) {
      process.stderr.write(`Configuration error: ${error.message}\n`);
      process.exit(2);
    }
    throw error;
  }
  fs.mkdirSync(config.storageDir, { recursive: true });

  const dbUrl = await prepareDatabase(config);
  guard();

  say('building (npm run build) ...');
  const build = await run('build', 'npm', ['run', 'build'], { cwd: repoRoot });
  guard();
  if (!succeeded(build)) throw new Error(`the build ${describeExit(build)}; see the [build] lines above`);

  const mailCatcherDir = path.join(config.storageDir, 'mail');
  let smtpUrl = config.smtpUrl;
  if (!smtpUrl) {
    await startMailCatcher(services, { port: config.mailCatcherPort, dir: mailCatcherDir });
    smtpUrl = `smtp://127.0.0.1:${config.mailCatcherPort}`;
    guard();
  }

  const settings: AppSettings = {
    port: config.port,
    host: config.host,
    databaseUrl: dbUrl,
    storageDir: config.storageDir,
    smtpUrl,
    mailCatcherDir,
    demoPassword: config.demoPassword,
    appUrl: config.appUrl ?? `http://127.0.0.1:${config.port}`,
    demoVideosDir: path.join(config.storageDir, 'demo-videos'),
  };
  // The demo runs' recordings are generated once with ffmpeg and cached; the generator skips runs
  // whose files are already there and unchanged, so later starts pay nothing here.
  say('preparing the demo videos (first start only: about two minutes) ...');
  const demo = await run('demo', process.execPath, ['--import', 'tsx', 'scripts/demo/generate-videos.ts', '--out', settings.demoVideosDir!], {
    cwd: repoRoot,
  });
  guard();
  if (!succeeded(demo)) throw new Error(`the demo video generator ${describeExit(demo)}; see the [demo] lines above`);
  await migrateAndSeed(settings);
  guard();
  await startApp(services, settings);
  guard();
  banner(config, settings, !config.smtpUrl);
}

main().catch((error: unknown) => {
  if (error instanceof Interrupted || shuttingDown) return;
  void shutdown(`could not start: ${(error as Error).message}`, 1);
});
