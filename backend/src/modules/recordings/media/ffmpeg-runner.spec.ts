import { spawn } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { describe, expect, it } from 'vitest';
import type { AppConfig } from '../../../config/app-config';
import { FfmpegRunner, ToolError } from './ffmpeg-runner';

const runner = (overrides: Partial<AppConfig> = {}) =>
  new FfmpegRunner({ ffmpegPath: 'ffmpeg', ffprobePath: 'ffprobe', ...overrides } as AppConfig);

describe('FfmpegRunner (real ffmpeg and ffprobe)', () => {
  it('returns stdout of a tool that succeeds', async () => {
    const { stdout } = await runner().run('ffprobe', ['-v', 'error', '-version']);
    expect(stdout).toMatch(/^ffprobe version/);
  });

  it('streams stdout to a callback instead of collecting it', async () => {
    const chunks: Buffer[] = [];
    const { stdout } = await runner().run('ffprobe', ['-v', 'error', '-version'], { onStdout: (c) => chunks.push(c) });
    expect(stdout).toBe('');
    expect(Buffer.concat(chunks).toString()).toMatch(/^ffprobe version/);
  });

  it('rejects with the exit code and keeps the stderr tail for the log', async () => {
    const error = await runner()
      .run('ffprobe', ['-v', 'error', '/nonexistent/input.mp4'])
      .catch((e: unknown) => e);
    expect(error).toBeInstanceOf(ToolError);
    expect(error).toMatchObject({ tool: 'ffprobe', failure: 'exit', exitCode: 1 });
    expect((error as ToolError).stderrTail).toMatch(/No such file or directory/);
  });

  it('stops a running tool when the signal aborts, and on killAll', async () => {
    const r = runner();
    const endless = ['-hide_banner', '-nostdin', '-f', 'lavfi', '-i', 'testsrc2=s=64x64:r=10', '-f', 'null', '-'];
    const controller = new AbortController();
    const first = r.run('ffmpeg', endless, { signal: controller.signal });
    await new Promise((resolve) => setTimeout(resolve, 200));
    expect(r.runningCount).toBe(1);
    controller.abort();
    await expect(first).rejects.toMatchObject({ failure: 'aborted' });

    const second = r.run('ffmpeg', endless);
    await new Promise((resolve) => setTimeout(resolve, 200));
    r.killAll();
    await expect(second).rejects.toMatchObject({ failure: 'aborted' });
    expect(r.runningCount).toBe(0);
  });

  it('reports a tool that cannot be started', async () => {
    const error = await runner({ ffprobePath: 'ffprobe-that-does-not-exist' })
      .run('ffprobe', ['-version'])
      .catch((e: unknown) => e);
    expect(error).toMatchObject({ failure: 'spawn', tool: 'ffprobe' });
    expect((error as Error).message).toMatch(/ENOENT/);
  });

  it('stops a tool whose output grows beyond the cap', async () => {
    const error = await runner()
      .run('ffmpeg', ['-hide_banner', '-f', 'lavfi', '-i', 'testsrc2=s=64x64:r=10:d=5', '-f', 'rawvideo', 'pipe:1'], { maxStdoutBytes: 10_000 })
      .catch((e: unknown) => e);
    expect(error).toMatchObject({ failure: 'output-too-large' });
  });

  it.runIf(process.platform === 'linux')('takes its tools down with it when the server process is killed outright (SIGKILL)', async () => {
    // A server of its own: a Node process running the runner with an endless ffmpeg, printing the tool's pid.
    const module = pathToFileURL(join(__dirname, 'ffmpeg-runner.ts')).href;
    const script = [
      `import(${JSON.stringify(module)}).then((m) => {`,
      '  const { FfmpegRunner } = m.FfmpegRunner ? m : m.default;',
      "  const runner = new FfmpegRunner({ ffmpegPath: 'ffmpeg', ffprobePath: 'ffprobe' });",
      "  runner.run('ffmpeg', ['-hide_banner', '-nostdin', '-f', 'lavfi', '-i', 'testsrc2=s=64x64:r=10', '-f', 'null', '-']).catch(() => undefined);",
      "  setTimeout(() => process.stdout.write(String([...runner.running.keys()][0].pid) + '\\n'), 300);",
      '});',
    ].join('\n');
    const server = spawn(process.execPath, ['--import', 'tsx', '-e', script], { stdio: ['ignore', 'pipe', 'inherit'] });
    const toolPid = await new Promise<number>((resolve, reject) => {
      server.stdout.once('data', (chunk: Buffer) => resolve(Number(chunk.toString().trim())));
      server.once('exit', () => reject(new Error('the server process ended before starting ffmpeg')));
    });
    expect(toolPid).toBeGreaterThan(0);
    // The tool runs, and is ffmpeg itself (setpriv hands its process over to the tool).
    expect(readFileSync(`/proc/${toolPid}/cmdline`, 'utf8').split('\0')[0]).toMatch(/ffmpeg$/);
    server.kill('SIGKILL');
    // Gone, or a zombie left for init to reap: either way no longer running.
    const running = () => {
      try {
        return !/^State:\s+Z/m.test(readFileSync(`/proc/${toolPid}/status`, 'utf8'));
      } catch {
        return false;
      }
    };
    for (let i = 0; i < 50 && running(); i++) await new Promise((r) => setTimeout(r, 100));
    expect(running()).toBe(false);
  }, 60_000);
});
