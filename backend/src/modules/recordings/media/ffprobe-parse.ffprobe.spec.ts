// The argument builders and parsers against the real ffmpeg/ffprobe: tiny clips are generated into
// a temporary directory, probed, transcoded to proxies and checked frame time by frame time.
import { execFile } from 'node:child_process';
import { mkdtemp, rm, stat } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { VideoProbe } from '@dialsheet/common';
import { packetTimesArgs, posterArgs, probeArgs, proxyArgs, scaledSize } from './ffmpeg-args';
import { FfmpegProgressParser, type FfmpegProgress } from './ffmpeg-progress';
import { type PacketTimes, parsePacketTimes, parseProbe } from './ffprobe-parse';

const run = promisify(execFile);
const FFMPEG = 'ffmpeg';
const FFPROBE = 'ffprobe';
const BIG = { maxBuffer: 64 * 1024 * 1024 };

let dir: string;

async function ffmpeg(args: string[]): Promise<string> {
  const { stdout } = await run(FFMPEG, ['-hide_banner', '-nostdin', '-loglevel', 'error', ...args], BIG);
  return stdout;
}

async function probe(file: string): Promise<{ probe: VideoProbe; packets: PacketTimes }> {
  const [json, csv] = await Promise.all([run(FFPROBE, probeArgs(file), BIG), run(FFPROBE, packetTimesArgs(file), BIG)]);
  const packets = parsePacketTimes(csv.stdout);
  return { probe: parseProbe(json.stdout, packets), packets };
}

const file = (name: string): string => path.join(dir, name);
const H264 = ['-c:v', 'libx264', '-preset', 'ultrafast', '-pix_fmt', 'yuv420p'];

beforeAll(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), 'dialsheet-media-spec-'));
  await Promise.all([
    // Constant 30 fps, 2 s, a keyframe every second, a camera-style creation time.
    ffmpeg(['-f', 'lavfi', '-i', 'testsrc2=s=160x120:r=30:d=2', ...H264, '-g', '30', '-metadata', 'creation_time=2025-03-14T09:30:00Z', '-y', file('cfr.mp4')]),
    // 30 fps, then every other frame dropped for a second (15 fps), then 30 fps again. The mp4
    // default would fill the gaps with duplicates, so the timestamps are passed through.
    ffmpeg([
      '-f', 'lavfi', '-i', "testsrc2=s=160x120:r=30:d=3,select='lt(t\\,1)+gte(t\\,2)+not(mod(n\\,2))'",
      ...H264, '-g', '30', '-fps_mode', 'passthrough', '-y', file('vfr.mp4'),
    ]),
    // Landscape frames stored with a display matrix, as phones record portrait video. ffmpeg 5.1
    // has no -display_rotation; its mp4 muxer turns the legacy rotate tag into the matrix, but only
    // on a stream copy (rotate=270 gives the phone-style matrix that ffprobe reports as -90).
    ffmpeg(['-f', 'lavfi', '-i', 'testsrc2=s=320x180:r=30:d=1', ...H264, '-y', file('landscape.mp4')]).then(() =>
      ffmpeg(['-i', file('landscape.mp4'), '-c', 'copy', '-metadata:s:v', 'rotate=270', '-y', file('rotated.mp4')]),
    ),
    // A 1080p landscape clip, to check the proxy really scales to 720.
    ffmpeg(['-f', 'lavfi', '-i', 'testsrc2=s=1920x1080:r=30:d=0.3', ...H264, '-y', file('hd.mp4')]),
    // Phone-style timestamps: a 90 kHz clock with a few milliseconds of jitter on every frame.
    ffmpeg([
      '-f', 'lavfi', '-i', "testsrc2=s=160x120:r=30:d=2,settb=1/90000,setpts='PTS+mod(N*7\\,5)*90'",
      ...H264, '-g', '30', '-fps_mode', 'passthrough', '-enc_time_base', '-1', '-video_track_timescale', '90000', '-y', file('jitter.mp4'),
    ]),
    // A timeline that starts at 0.5 s, as some recorders write.
    ffmpeg(['-f', 'lavfi', '-i', 'testsrc2=s=160x120:r=30:d=1', ...H264, '-output_ts_offset', '0.5', '-y', file('late-start.mp4')]),
    // WebM: stream duration and frame count are N/A there.
    ffmpeg(['-f', 'lavfi', '-i', 'testsrc2=s=160x120:r=30:d=2', '-c:v', 'libvpx-vp9', '-deadline', 'realtime', '-cpu-used', '8', '-g', '30', '-y', file('clip.webm')]),
    // Audio only.
    ffmpeg(['-f', 'lavfi', '-i', 'sine=d=0.5', '-c:a', 'aac', '-y', file('sound.m4a')]),
  ]);
}, 60_000);

afterAll(async () => {
  if (dir) await rm(dir, { recursive: true, force: true });
});

describe('parseProbe on real ffprobe output', { timeout: 30_000 }, () => {
  it('reads a constant 30 fps file', async () => {
    const { probe: p, packets } = await probe(file('cfr.mp4'));
    expect(p).toMatchObject({
      durationSec: 2,
      width: 160,
      height: 120,
      displayWidth: 160,
      displayHeight: 120,
      rotation: 0,
      codec: 'h264',
      pixelFormat: 'yuv420p',
      nominalFps: 30,
      averageFps: 30,
      variableFrameRate: false,
      frameCount: 60,
      keyframeCount: 2,
      maxKeyframeInterval: 1,
      creationTime: '2025-03-14T09:30:00.000Z',
    });
    expect(p.container).toContain('mp4');
    // Frame k starts at k/30 to the microsecond ffprobe prints.
    packets.times.forEach((t, k) => expect(Math.abs(t - k / 30)).toBeLessThanOrEqual(5e-7));
    expect(packets.keyframeTimes).toEqual([0, 1]);
  });

  it('detects the 15 fps stretch of a variable-rate file from its packets', async () => {
    const { probe: p, packets } = await probe(file('vfr.mp4'));
    expect(p.frameCount).toBe(75);
    expect(p.nominalFps).toBe(30);
    expect(p.averageFps).toBe(25);
    expect(p.variableFrameRate).toBe(true);
    expect(packets.times[30]).toBe(1);
    expect(packets.times[31]).toBe(1.066667);
    expect(packets.times[45]).toBe(2);
  });

  it('reads the display-matrix rotation and swaps the displayed size', async () => {
    const { probe: p } = await probe(file('rotated.mp4'));
    expect(p.rotation).toBe(90);
    expect([p.width, p.height]).toEqual([320, 180]);
    expect([p.displayWidth, p.displayHeight]).toEqual([180, 320]);
  });

  it('takes the container duration of a WebM file', async () => {
    const { probe: p } = await probe(file('clip.webm'));
    expect(p.codec).toBe('vp9');
    expect(p.container).toBe('matroska,webm');
    expect(p.durationSec).toBe(2);
    expect(p.frameCount).toBe(60);
    expect(p.variableFrameRate).toBe(false);
  });

  it('says there is no video stream in an audio file', async () => {
    const json = await run(FFPROBE, probeArgs(file('sound.m4a')));
    expect(() => parseProbe(json.stdout, { times: [], keyframeTimes: [], ignoredPackets: 0 })).toThrow(
      'no video stream: the file holds only audio',
    );
  });
});

describe('proxy and poster from the real argument lists', { timeout: 60_000 }, () => {
  /** Runs proxyArgs through ffmpeg, collecting progress from stdout as the service would. */
  async function makeProxy(source: string, name: string, keepFullHd = false): Promise<{ updates: FfmpegProgress[]; out: string }> {
    const { probe: p } = await probe(source);
    const out = file(name);
    const { stdout } = await run(FFMPEG, proxyArgs(source, out, p, { workDir: dir, keepFullHd }), BIG);
    const parser = new FfmpegProgressParser(p.durationSec);
    return { updates: parser.push(stdout), out };
  }

  it('keeps every frame time of a variable-rate source and reports progress to 100', async () => {
    const { updates, out } = await makeProxy(file('vfr.mp4'), 'vfr-proxy.mp4');
    const source = await probe(file('vfr.mp4'));
    const proxy = await probe(out);
    expect(proxy.packets.times).toEqual(source.packets.times);
    // G = round(25 fps average) = 25 frames would span 1.33 s across the 15 fps stretch; the
    // keyframe forced at each whole second keeps every GOP within a second.
    expect(proxy.packets.keyframeTimes).toEqual([0, 0.833333, 1, 2, 2.833333]);
    expect(proxy.probe.maxKeyframeInterval).toBeLessThanOrEqual(1);
    expect(updates.length).toBeGreaterThan(0);
    expect(updates.at(-1)).toMatchObject({ percent: 100, done: true });
  });

  it('keeps jittered phone timestamps exactly instead of rounding them to a 1/30 s grid', async () => {
    const { out } = await makeProxy(file('jitter.mp4'), 'jitter-proxy.mp4');
    const source = await probe(file('jitter.mp4'));
    const proxy = await probe(out);
    expect(source.packets.times.slice(0, 3)).toEqual([0, 0.035333, 0.070667]);
    expect(proxy.packets.times).toEqual(source.packets.times);
  });

  it('starts the proxy timeline at the first frame of a source that starts late', async () => {
    const { out } = await makeProxy(file('late-start.mp4'), 'late-start-proxy.mp4');
    const source = await probe(file('late-start.mp4'));
    const proxy = await probe(out);
    expect(source.packets.times[0]).toBe(0.5);
    expect(proxy.packets.times).toHaveLength(source.packets.times.length);
    proxy.packets.times.forEach((t, k) => expect(t).toBeCloseTo(source.packets.times[k] - 0.5, 6));
  });

  it('applies the rotation: the proxy is stored upright without a display matrix', async () => {
    const { out } = await makeProxy(file('rotated.mp4'), 'rotated-proxy.mp4');
    const proxy = await probe(out);
    expect(proxy.probe.rotation).toBe(0);
    expect([proxy.probe.width, proxy.probe.height]).toEqual([180, 320]);
  });

  it('scales a 1080p source to a 720 short side, or keeps it with keepFullHd', async () => {
    const small = await probe((await makeProxy(file('hd.mp4'), 'hd-720.mp4')).out);
    expect([small.probe.width, small.probe.height]).toEqual([1280, 720]);
    expect(scaledSize(1920, 1080, 720)).toEqual({ width: 1280, height: 720 });
    const full = await probe((await makeProxy(file('hd.mp4'), 'hd-1080.mp4', true)).out);
    expect([full.probe.width, full.probe.height]).toEqual([1920, 1080]);
  });

  it('writes a poster JPEG with a 360 short side', async () => {
    const out = file('poster.jpg');
    await run(FFMPEG, posterArgs(file('hd.mp4'), out, 0.1, { workDir: dir }));
    expect((await stat(out)).size).toBeGreaterThan(1000);
    const { stdout } = await run(FFPROBE, ['-v', 'error', '-show_entries', 'stream=codec_name,width,height', '-of', 'csv=p=0', out]);
    expect(stdout.trim()).toBe('mjpeg,640,360');
  });
});
