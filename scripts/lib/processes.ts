// Child processes for the developer scripts: long-running services (app, mail catcher) and
// one-off commands (build, migrate), each with its output prefixed so interleaved logs stay readable.
import { spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import readline from 'node:readline';
import type { Readable } from 'node:stream';

export interface Exit {
  code: number | null;
  signal: NodeJS.Signals | null;
}

export function describeExit(exit: Exit): string {
  return exit.signal ? `was killed by ${exit.signal}` : `exited with code ${exit.code}`;
}

export function succeeded(exit: Exit): boolean {
  return exit.code === 0 && exit.signal === null;
}

const useColor = Boolean(process.stdout.isTTY) && !process.env.NO_COLOR;
const colors = [36, 35, 33, 32, 34, 96, 95, 93];
let nextColor = 0;

/** A short coloured tag such as "[app]" used in front of every line a child prints. */
export function tag(label: string): string {
  const text = `[${label}]`;
  if (!useColor) return text;
  const color = colors[nextColor++ % colors.length];
  return `\x1b[${color}m${text}\x1b[0m`;
}

export function pipeLines(stream: Readable, prefix: string, out: NodeJS.WritableStream, onLine?: (line: string) => void): void {
  const lines = readline.createInterface({ input: stream, crlfDelay: Infinity });
  const lead = prefix ? `${prefix} ` : '';
  lines.on('line', (line) => {
    out.write(`${lead}${line}\n`);
    onLine?.(line);
  });
}

/**
 * Where a child's output goes: line by line onto ours behind a prefix (`onLine` also sees each
 * stdout line), straight through, or into a log file.
 */
export type Output = { prefix: string; onLine?: (line: string) => void } | 'inherit' | { file: string };

export interface SpawnOptions {
  cwd?: string;
  env?: NodeJS.ProcessEnv;
  output?: Output;
}

// Every child gets its own process group so a stop reaches its own children too (npm → node,
// tsx → node), and so a terminal Ctrl-C reaches only us and we stop things in order.
const live = new Set<Proc>();

process.on('exit', () => {
  for (const proc of live) proc.signal('SIGTERM');
});

export class Proc {
  readonly child: ChildProcess;
  readonly exited: Promise<Exit>;
  exit?: Exit;
  /** Set when we asked it to stop, so its exit is not reported as a crash. */
  stopping = false;

  constructor(
    readonly name: string,
    command: string,
    args: string[],
    options: SpawnOptions = {},
  ) {
    const output = options.output ?? { prefix: tag(name) };
    let fd: number | undefined;
    let stdio: Array<'ignore' | 'pipe' | 'inherit' | number>;
    if (output === 'inherit') {
      stdio = ['ignore', 'inherit', 'inherit'];
    } else if ('file' in output) {
      fd = fs.openSync(output.file, 'a');
      stdio = ['ignore', fd, fd];
    } else {
      stdio = ['ignore', 'pipe', 'pipe'];
    }
    let env = options.env ?? process.env;
    // Colour codes make a log file or a CI log hard to read.
    const toTerminal = output === 'inherit' || 'prefix' in output ? Boolean(process.stdout.isTTY) : false;
    if (!toTerminal) env = { ...env, NO_COLOR: '1', FORCE_COLOR: '0' };
    this.child = spawn(command, args, {
      cwd: options.cwd,
      env,
      stdio,
      detached: true,
    });
    if (fd !== undefined) fs.closeSync(fd);
    if (typeof output === 'object' && 'prefix' in output) {
      pipeLines(this.child.stdout!, output.prefix, process.stdout, output.onLine);
      pipeLines(this.child.stderr!, output.prefix, process.stderr);
    }
    live.add(this);
    this.exited = new Promise<Exit>((resolve) => {
      this.child.once('error', (error) => {
        process.stderr.write(`${this.name}: could not start ${command}: ${error.message}\n`);
        this.exit = { code: 127, signal: null };
        live.delete(this);
        resolve(this.exit);
      });
      // 'close' comes after the output pipes drain, so the last lines are printed before we go
      // on; a grandchild that keeps a pipe open must not hold us up for long, hence the timer.
      const done = (code: number | null, signal: NodeJS.Signals | null) => {
        if (this.exit) return;
        this.exit = { code, signal };
        live.delete(this);
        resolve(this.exit);
      };
      this.child.once('exit', (code, signal) => {
        setTimeout(() => done(code, signal), 2000).unref();
      });
      this.child.once('close', done);
    });
  }

  get running(): boolean {
    return this.exit === undefined;
  }

  signal(signal: NodeJS.Signals): void {
    if (!this.running || this.child.pid === undefined) return;
    try {
      process.kill(-this.child.pid, signal);
    } catch {
      // Already gone.
    }
  }

  /** SIGTERM to the whole group, SIGKILL if it has not gone after `graceMs`. */
  async stop(graceMs = 10_000): Promise<Exit> {
    this.stopping = true;
    if (!this.running) return this.exit!;
    this.signal('SIGTERM');
    const timer = setTimeout(() => this.signal('SIGKILL'), graceMs);
    const exit = await this.exited;
    clearTimeout(timer);
    return exit;
  }
}

/** Runs a command to completion. */
export function run(name: string, command: string, args: string[], options: SpawnOptions = {}): Promise<Exit> {
  return new Proc(name, command, args, options).exited;
}

/** Stops every child still running (used when interrupted in the middle of a step). */
export async function stopAll(): Promise<void> {
  await Promise.all([...live].reverse().map((proc) => proc.stop()));
}

export interface Captured extends Exit {
  stdout: string;
  stderr: string;
}

/** Runs a short command and collects its output (for tools whose output we only show on failure). */
export function capture(command: string, args: string[], options: { cwd?: string; env?: NodeJS.ProcessEnv } = {}): Promise<Captured> {
  return new Promise((resolve) => {
    const child = spawn(command, args, { cwd: options.cwd, env: options.env ?? process.env, stdio: ['ignore', 'pipe', 'pipe'] });
    let stdout = '';
    let stderr = '';
    child.stdout.setEncoding('utf8').on('data', (chunk: string) => (stdout += chunk));
    child.stderr.setEncoding('utf8').on('data', (chunk: string) => (stderr += chunk));
    child.once('error', (error) => resolve({ code: 127, signal: null, stdout, stderr: stderr + error.message }));
    child.once('close', (code, signal) => resolve({ code, signal, stdout, stderr }));
  });
}

/** Long-running services that must stay up; an exit we did not ask for is reported once. */
export class Services {
  private readonly procs: Proc[] = [];

  constructor(private readonly onUnexpectedExit: (proc: Proc, exit: Exit) => void) {}

  start(name: string, command: string, args: string[], options: SpawnOptions = {}): Proc {
    const proc = new Proc(name, command, args, options);
    this.procs.push(proc);
    void proc.exited.then((exit) => {
      if (!proc.stopping) this.onUnexpectedExit(proc, exit);
    });
    return proc;
  }

  /** Stops services in reverse start order (the app before the mail catcher it sends to). */
  async stopAll(): Promise<void> {
    for (const proc of [...this.procs].reverse()) {
      proc.stopping = true;
    }
    for (const proc of [...this.procs].reverse()) {
      await proc.stop();
    }
  }
}

/** A port the operating system says is free on 127.0.0.1 right now (its choice). */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = net.createServer();
    server.once('error', reject);
    server.listen({ port: 0, host: '127.0.0.1', exclusive: true }, () => {
      const { port } = server.address() as net.AddressInfo;
      server.close(() => resolve(port));
    });
  });
}

export function isPortFree(port: number, host = '127.0.0.1'): Promise<boolean> {
  return new Promise((resolve) => {
    const server = net.createServer();
    server.once('error', () => resolve(false));
    server.listen({ port, host, exclusive: true }, () => server.close(() => resolve(true)));
  });
}

export function canConnect(port: number, host = '127.0.0.1'): Promise<boolean> {
  return new Promise((resolve) => {
    const socket = net.connect({ port, host });
    socket.setTimeout(1000);
    socket.once('connect', () => {
      // A polite close: destroying a socket with unread data sends a reset some servers log as an error.
      socket.end();
      resolve(true);
    });
    socket.on('data', () => undefined);
    socket.once('timeout', () => {
      socket.destroy();
      resolve(false);
    });
    socket.once('error', () => resolve(false));
  });
}

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

/**
 * Polls until `probe` is true. `failure` is checked first on every round so a child that died
 * while we wait is reported at once instead of after the timeout.
 */
export async function waitFor(
  what: string,
  probe: () => Promise<boolean>,
  timeoutMs: number,
  failure: () => string | undefined = () => undefined,
): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const problem = failure();
    if (problem) throw new Error(`${what}: ${problem}`);
    if (await probe()) return;
    if (Date.now() > deadline) throw new Error(`${what}: still not ready after ${Math.round(timeoutMs / 1000)} s`);
    await sleep(250);
  }
}

export async function httpOk(url: string): Promise<boolean> {
  try {
    const response = await fetch(url, { signal: AbortSignal.timeout(2000) });
    await response.arrayBuffer();
    return response.status === 200;
  } catch {
    return false;
  }
}
