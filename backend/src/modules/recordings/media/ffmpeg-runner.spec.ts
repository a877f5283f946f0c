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
});
