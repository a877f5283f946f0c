// Starting the built backend pieces: the local mail catcher, migrations, demo seed and the server.
// Shared by `npm start` and the browser-test step of `npm test`.
import fs from 'node:fs';
import path from 'node:path';
import { reachableHost, repoRoot } from './config';
import { canConnect, describeExit, httpOk, isPortFree, run, succeeded, waitFor, type Output, type Proc, type Services } from './processes';

export interface AppSettings {
  port: number;
  host: string;
  databaseUrl: string;
  storageDir: string;
  smtpUrl: string;
  mailCatcherDir: string;
  demoPassword: string;
  appUrl: string;
  /** Generated demo recordings the seed attaches to the demo runs (once); absent in tests. */
  demoVideosDir?: string;
}

export function appEnvironment(settings: AppSettings): NodeJS.ProcessEnv {
  return {
    ...process.env,
    PORT: String(settings.port),
    HOST: settings.host,
    DATABASE_URL: settings.databaseUrl,
    STORAGE_DIR: settings.storageDir,
    SMTP_URL: settings.smtpUrl,
    MAIL_CATCHER_DIR: settings.mailCatcherDir,
    DEMO_PASSWORD: settings.demoPassword,
    APP_URL: settings.appUrl,
    ...(settings.demoVideosDir ? { DEMO_VIDEOS_DIR: settings.demoVideosDir } : {}),
  };
}

/** A compiled backend entry point; a clear error when the build did not produce it. */
export function backendEntry(relative: string): string {
  const file = path.join(repoRoot, 'backend', 'dist', relative);
  if (!fs.existsSync(file)) {
    throw new Error(`${path.relative(repoRoot, file)} does not exist; the backend build did not produce it`);
  }
  return file;
}

async function requireFreePort(port: number, host: string, variable: string): Promise<void> {
  if (!(await isPortFree(port, host))) {
    throw new Error(`port ${port} on ${host} is already in use by another program; stop it or set ${variable} to a free port`);
  }
}

function diedWhileWaiting(proc: Proc): () => string | undefined {
  return () => (proc.running ? undefined : `${proc.name} ${describeExit(proc.exit!)} before it was ready`);
}

export async function startMailCatcher(
  services: Services,
  options: { port: number; dir: string; output?: Output; portVariable?: string },
): Promise<Proc> {
  await requireFreePort(options.port, '127.0.0.1', options.portVariable ?? 'MAIL_CATCHER_PORT');
  fs.mkdirSync(options.dir, { recursive: true });
  const proc = services.start('mail', process.execPath, [backendEntry('cli/mail-catcher.js')], {
    cwd: repoRoot,
    env: { ...process.env, MAIL_CATCHER_PORT: String(options.port), MAIL_CATCHER_DIR: options.dir },
    output: options.output,
  });
  await waitFor('mail catcher', () => canConnect(options.port), 30_000, diedWhileWaiting(proc));
  return proc;
}

/** Applies migrations, then the (idempotent) demo seed. */
export async function migrateAndSeed(settings: AppSettings, output?: (name: string) => Output): Promise<void> {
  const env = appEnvironment(settings);
  for (const name of ['migrate', 'seed']) {
    const exit = await run(name, process.execPath, [backendEntry(`cli/${name}.js`)], { cwd: repoRoot, env, output: output?.(name) });
    if (!succeeded(exit)) throw new Error(`${name} ${describeExit(exit)}`);
  }
}

export function healthUrl(settings: Pick<AppSettings, 'host' | 'port'>): string {
  return `http://${reachableHost(settings.host)}:${settings.port}/api/health`;
}

export async function startApp(services: Services, settings: AppSettings, output?: Output): Promise<Proc> {
  await requireFreePort(settings.port, settings.host, 'PORT');
  fs.mkdirSync(settings.storageDir, { recursive: true });
  const proc = services.start('app', process.execPath, [backendEntry('main.js')], {
    cwd: repoRoot,
    env: appEnvironment(settings),
    output,
  });
  const url = healthUrl(settings);
  await waitFor(`the app (${url})`, () => httpOk(url), 90_000, diedWhileWaiting(proc));
  return proc;
}
