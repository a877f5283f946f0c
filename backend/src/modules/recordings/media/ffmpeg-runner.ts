import { Injectable, Logger, OnApplicationShutdown } from '@nestjs/common';
import { spawn, type ChildProcess } from 'node:child_process';
import { accessSync, constants } from 'node:fs';
import { setPriority } from 'node:os';
import { AppConfig } from '../../../config/app-config';

export type MediaTool = 'ffmpeg' | 'ffprobe';

/** Enough of ffmpeg's stderr to explain a failure in the log. */
const STDERR_TAIL_BYTES = 4096;
/** ffprobe's packet list of a two-hour 60 fps video is about 10 MB; anything far beyond is wrong. */
const DEFAULT_MAX_STDOUT_BYTES = 128 * 1024 * 1024;
/** How long a tool gets to exit after SIGTERM before SIGKILL. */
const KILL_GRACE_MS = 2000;
/**
 * util-linux's setpriv (in every Debian install): `--pdeathsig KILL` makes the kernel kill the
 * tool when the process that started it dies, even by SIGKILL, when no shutdown hook runs. Without
 * it a transcode outlives a killed server and competes with the next server's attempt.
 */
const SETPRIV = '/usr/bin/setpriv';
/** setpriv's exit status when it cannot run the tool (as a shell's "command not found"). */
const SETPRIV_EXEC_FAILED = 127;

function executable(file: string): boolean {
  try {
    accessSync(file, constants.X_OK);
    return true;
  } catch {
    return false;
  }
}

export interface RunOptions {
  /** Stops the tool (SIGTERM, then SIGKILL) when aborted. */
  signal?: AbortSignal;
  /** Receives stdout as it arrives (e.g. ffmpeg -progress pipe:1); stdout is then not collected. */
  onStdout?: (chunk: Buffer) => void;
  maxStdoutBytes?: number;
}

export interface RunResult {
  stdout: string;
  stderrTail: string;
}

export type ToolFailure = 'exit' | 'spawn' | 'aborted' | 'output-too-large';

/**
 * A tool that did not finish cleanly. `stderrTail` is for the server log only: it can hold paths
 * and internals, so clients get words from failure-reasons.ts instead.
 */
export class ToolError extends Error {
  override name = 'ToolError';
  constructor(
    readonly tool: MediaTool,
    readonly failure: ToolFailure,
    readonly exitCode: number | null,
    readonly stderrTail: string,
    message: string,
  ) {
    super(message);
  }
}

/**
 * Runs ffmpeg and ffprobe as child processes with argument arrays (never a shell), at a lower
 * CPU priority than the API, and kills whatever still runs when the application shuts down.
 */
@Injectable()
export class FfmpegRunner implements OnApplicationShutdown {
  private readonly logger = new Logger('FfmpegRunner');
  /** Each running tool with the function that stops it. */
  private readonly running = new Map<ChildProcess, () => void>();
  /** Whether tools start under setpriv, so they die with this process (Linux only). */
  private readonly lifeline = process.platform === 'linux' && executable(SETPRIV);

  constructor(private readonly config: AppConfig) {}

  run(tool: MediaTool, args: readonly string[], options: RunOptions = {}): Promise<RunResult> {
    const command = tool === 'ffmpeg' ? this.config.ffmpegPath : this.config.ffprobePath;
    const maxStdout = options.maxStdoutBytes ?? DEFAULT_MAX_STDOUT_BYTES;
    return new Promise<RunResult>((resolve, reject) => {
      if (options.signal?.aborted) {
        reject(new ToolError(tool, 'aborted', null, '', `${tool} was stopped before it started`));
        return;
      }
      const child = this.lifeline
        ? spawn(SETPRIV, ['--pdeathsig', 'KILL', '--', command, ...args], { stdio: ['ignore', 'pipe', 'pipe'], shell: false })
        : spawn(command, [...args], { stdio: ['ignore', 'pipe', 'pipe'], shell: false });
      const stdout: Buffer[] = [];
      let stdoutBytes = 0;
      let stderr = '';
      let failure: ToolFailure | null = null;
      let settled = false;

      if (child.pid !== undefined) {
        try {
          // Transcoding should never make the API slow to answer.
          setPriority(child.pid, 10);
        } catch {
          // Not permitted here; run at normal priority.
        }
      }

      const stop = (why: ToolFailure) => {
        if (failure === null) failure = why;
        if (child.exitCode !== null || child.signalCode !== null) return;
        child.kill('SIGTERM');
        setTimeout(() => {
          if (child.exitCode === null && child.signalCode === null) child.kill('SIGKILL');
        }, KILL_GRACE_MS).unref();
      };
      const onAbort = () => stop('aborted');
      this.running.set(child, onAbort);
      options.signal?.addEventListener('abort', onAbort, { once: true });

      child.stdout.on('data', (chunk: Buffer) => {
        if (options.onStdout) {
          options.onStdout(chunk);
          return;
        }
        stdoutBytes += chunk.length;
        if (stdoutBytes > maxStdout) {
          stop('output-too-large');
          return;
        }
        stdout.push(chunk);
      });
      child.stderr.on('data', (chunk: Buffer) => {
        stderr = (stderr + chunk.toString('utf8')).slice(-STDERR_TAIL_BYTES);
      });

      const finish = (error: ToolError | null) => {
        if (settled) return;
        settled = true;
        this.running.delete(child);
        options.signal?.removeEventListener('abort', onAbort);
        if (error) reject(error);
        else resolve({ stdout: Buffer.concat(stdout).toString('utf8'), stderrTail: stderr.trim() });
      };

      child.on('error', (error: NodeJS.ErrnoException) => {
        finish(new ToolError(tool, 'spawn', null, '', `${tool} could not be started (${command}): ${error.code ?? error.message}`));
      });
      child.on('close', (code, signal) => {
        const tail = stderr.trim();
        if (failure === 'aborted') finish(new ToolError(tool, 'aborted', code, tail, `${tool} was stopped`));
        else if (failure === 'output-too-large') {
          finish(new ToolError(tool, 'output-too-large', code, tail, `${tool} printed more than ${maxStdout} bytes`));
        } else if (code === 0) finish(null);
        else if (this.lifeline && code === SETPRIV_EXEC_FAILED && /^setpriv: failed to execute/m.test(tail)) {
          // The tool itself could not be started: the same failure as spawn's ENOENT/EACCES without setpriv.
          const why = /No such file or directory/.test(tail) ? 'ENOENT' : /Permission denied/.test(tail) ? 'EACCES' : lastLine(tail);
          finish(new ToolError(tool, 'spawn', null, '', `${tool} could not be started (${command}): ${why}`));
        } else {
          const how = signal ? `was killed by ${signal}` : `exited with code ${code}`;
          finish(new ToolError(tool, 'exit', code, tail, `${tool} ${how}${tail ? `: ${lastLine(tail)}` : ''}`));
        }
      });
    });
  }

  /** Stops every tool this process started; their run() promises reject as 'aborted'. */
  killAll(): void {
    for (const stop of this.running.values()) stop();
  }

  get runningCount(): number {
    return this.running.size;
  }

  onApplicationShutdown(): void {
    if (this.running.size > 0) this.logger.warn(`stopping ${this.running.size} media tool(s) at shutdown`);
    this.killAll();
  }
}

function lastLine(text: string): string {
  const lines = text.split(/\r?\n/).filter((l) => l.trim() !== '');
  return (lines[lines.length - 1] ?? '').slice(0, 300);
}
