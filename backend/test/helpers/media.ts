import { execFile } from 'node:child_process';
import { randomUUID } from 'node:crypto';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';

const run = promisify(execFile);

async function ffmpeg(args: string[]): Promise<void> {
  await run('ffmpeg', ['-hide_banner', '-nostdin', '-loglevel', 'error', '-y', ...args], { maxBuffer: 16 * 1024 * 1024 });
}

/** Small test videos made with ffmpeg's lavfi sources, each kind made once per test file. */
export class TestMedia {
  readonly dir = mkdtempSync(join(tmpdir(), 'dialsheet-media-'));
  private made = new Map<string, string>();

  private async once(name: string, make: (out: string) => Promise<void>): Promise<string> {
    const existing = this.made.get(name);
    if (existing) return existing;
    const out = join(this.dir, name);
    await make(out);
    this.made.set(name, out);
    return out;
  }

  /** 2 s of testsrc2, 320×240, 30 fps, H.264 with the index (moov) at the end, as cameras write it. */
  clip(): Promise<string> {
    return this.once('clip.mp4', (out) =>
      ffmpeg(['-f', 'lavfi', '-i', 'testsrc2=s=320x240:r=30:d=2', '-c:v', 'libx264', '-preset', 'ultrafast', '-pix_fmt', 'yuv420p', out]),
    );
  }

  /** Camera-style: one keyframe every 300 frames (so a single GOP in 3 s). */
  camera(): Promise<string> {
    return this.once('camera.mp4', (out) =>
      ffmpeg([
        '-f', 'lavfi', '-i', 'testsrc2=s=320x240:r=30:d=3',
        '-c:v', 'libx264', '-preset', 'ultrafast', '-g', '300', '-keyint_min', '300', '-sc_threshold', '0', '-pix_fmt', 'yuv420p', out,
      ]),
    );
  }

  /** Just over a minute at a low size and rate (62 s, 160×120, 5 fps): room for minute-long sheets, quick to process. */
  minute(): Promise<string> {
    return this.once('minute.mp4', (out) =>
      ffmpeg(['-f', 'lavfi', '-i', 'testsrc2=s=160x120:r=5:d=62', '-c:v', 'libx264', '-preset', 'ultrafast', '-pix_fmt', 'yuv420p', out]),
    );
  }

  /** Variable frame rate: 30 fps, except every other frame dropped between 1 s and 2 s. */
  vfr(): Promise<string> {
    return this.once('vfr.mp4', (out) =>
      ffmpeg([
        '-f', 'lavfi', '-i', 'testsrc2=s=320x240:r=30:d=3',
        '-vf', "select='not(between(t\\,1\\,2)*mod(n\\,2))'", '-fps_mode', 'vfr',
        '-c:v', 'libx264', '-preset', 'ultrafast', '-pix_fmt', 'yuv420p', '-video_track_timescale', '90000', out,
      ]),
    );
  }

  /** Long enough to still be transcoding a few seconds after it starts (720p, 12 s). */
  long(): Promise<string> {
    return this.once('long.mp4', (out) =>
      ffmpeg(['-f', 'lavfi', '-i', 'testsrc2=s=1280x720:r=30:d=12', '-c:v', 'libx264', '-preset', 'ultrafast', '-g', '300', '-pix_fmt', 'yuv420p', out]),
    );
  }

  /** The same video with a random comment, so its bytes (and SHA-256) are new. */
  async unique(source: Promise<string> | string, name = `${randomUUID()}.mp4`): Promise<string> {
    const out = join(this.dir, name);
    await ffmpeg(['-i', await source, '-c', 'copy', '-metadata', `comment=${randomUUID()}`, '-f', 'mp4', out]);
    return out;
  }

  /** The first `fraction` of a unique clip: the type is right, the index is missing. */
  async truncated(fraction = 0.6): Promise<string> {
    const whole = readFileSync(await this.unique(this.clip()));
    const out = join(this.dir, `truncated-${randomUUID()}.mp4`);
    writeFileSync(out, whole.subarray(0, Math.floor(whole.length * fraction)));
    return out;
  }

  /** A real MP4 head followed by filler up to `size` bytes: passes the type check, fails the size limit. */
  async oversized(size: number): Promise<string> {
    const head = readFileSync(await this.clip());
    const out = join(this.dir, `big-${randomUUID()}.mp4`);
    const body = Buffer.alloc(size, 0x5a);
    head.copy(body, 0, 0, Math.min(head.length, size));
    writeFileSync(out, body);
    return out;
  }

  /** Removes every file this instance made. */
  remove(): void {
    rmSync(this.dir, { recursive: true, force: true });
  }

  file(name: string, content: string | Buffer): string {
    const out = join(this.dir, name);
    writeFileSync(out, content);
    return out;
  }
}
