// Generates the demo recordings: one camera-style MP4 per run of the heat-recovery bench plus a
// truth file listing every display refresh (value, shown text, first frame), so tests know what
// any frame shows.
//
//   node_modules/.bin/tsx scripts/demo/generate-videos.ts --out DIR [--duration S] [--runs N] [--force]
//
// A run is skipped when its video and truth file exist and were made from the same inputs
// (generator version, scenario, filter graph, fonts, encoder settings, ffmpeg build) and the video
// still has the hash recorded in its truth file.
import { execFile, spawn } from 'node:child_process';
import { createHash } from 'node:crypto';
import { createReadStream } from 'node:fs';
import { copyFile, mkdir, mkdtemp, readFile, rename, rm, stat, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { promisify, parseArgs } from 'node:util';
import { type Fonts, cameraEncodeArgs, filterGraph, sendcmdScript, withRegions } from './panel';
import { DEFAULT_DURATION_SEC, GENERATOR_VERSION, RUNS, type RunTruth, buildRunTruth } from './scenario';

const run = promisify(execFile);

/** Upper bound per file; a camera-style file of the default length stays far below it. */
const MAX_VIDEO_BYTES = 20 * 1024 * 1024;
/** Debian's fonts-dejavu-core location, used when fontconfig is not available. */
const DEBIAN_DEJAVU_DIR = '/usr/share/fonts/truetype/dejavu';

interface Options {
  out: string;
  durationSec: number;
  runs: number;
  force: boolean;
}

function usage(message?: string): never {
  if (message) console.error(`error: ${message}`);
  console.error('usage: tsx scripts/demo/generate-videos.ts --out DIR [--duration SECONDS] [--runs 1-3] [--force]');
  process.exit(2);
}

function parseOptions(argv: string[]): Options {
  let values;
  try {
    ({ values } = parseArgs({
      args: argv,
      options: {
        out: { type: 'string' },
        duration: { type: 'string' },
        runs: { type: 'string' },
        force: { type: 'boolean', default: false },
        help: { type: 'boolean', default: false },
      },
      strict: true,
    }));
  } catch (err) {
    usage((err as Error).message);
  }
  if (values.help) usage();
  if (!values.out) usage('--out DIR is required');
  const durationSec = values.duration === undefined ? DEFAULT_DURATION_SEC : Number(values.duration);
  if (!Number.isFinite(durationSec) || durationSec < 5 || durationSec > 3600) usage('--duration must be 5–3600 seconds');
  const runs = values.runs === undefined ? RUNS.length : Number(values.runs);
  if (!Number.isInteger(runs) || runs < 1 || runs > RUNS.length) usage(`--runs must be a whole number 1–${RUNS.length}`);
  return { out: path.resolve(values.out), durationSec, runs, force: values.force ?? false };
}

async function fileExists(p: string): Promise<boolean> {
  try {
    await stat(p);
    return true;
  } catch {
    return false;
  }
}

/** A DejaVu Sans Mono face through fontconfig, else at Debian's package location. */
async function findFont(style: 'Book' | 'Bold'): Promise<string> {
  const fileName = style === 'Bold' ? 'DejaVuSansMono-Bold.ttf' : 'DejaVuSansMono.ttf';
  try {
    const { stdout } = await run('fc-match', ['-f', '%{file}', `DejaVu Sans Mono:style=${style}`]);
    // fc-match answers with a substitute when the face is missing; accept only the real one.
    if (path.basename(stdout.trim()) === fileName && (await fileExists(stdout.trim()))) return stdout.trim();
  } catch {
    // fontconfig not installed: fall through to the package path.
  }
  const fallback = path.join(DEBIAN_DEJAVU_DIR, fileName);
  if (await fileExists(fallback)) return fallback;
  throw new Error(`font ${fileName} not found; install fonts-dejavu-core`);
}

async function sha256File(p: string): Promise<string> {
  const hash = createHash('sha256');
  for await (const chunk of createReadStream(p)) hash.update(chunk as Buffer);
  return hash.digest('hex');
}

async function ffmpegVersion(): Promise<string> {
  const { stdout } = await run('ffmpeg', ['-hide_banner', '-version']);
  return stdout.split('\n')[0].trim();
}

/** Runs ffmpeg, keeping the tail of stderr for the error message. */
function ffmpeg(args: string[]): Promise<void> {
  return new Promise((resolve, reject) => {
    const child = spawn('ffmpeg', args, { stdio: ['ignore', 'ignore', 'pipe'] });
    let stderr = '';
    child.stderr.on('data', (d: Buffer) => {
      stderr = (stderr + d.toString()).slice(-4000);
    });
    child.on('error', reject);
    child.on('close', (code) => (code === 0 ? resolve() : reject(new Error(`ffmpeg exited with ${code}: ${stderr.trim()}`))));
  });
}

interface GeneratedFile {
  run: number;
  video: string;
  truth: string;
  sizeBytes: number;
  seconds: number;
  cached: boolean;
}

async function generateRun(index: number, opts: Options, fonts: Fonts, fontHashes: Fonts, version: string): Promise<GeneratedFile> {
  const config = RUNS[index];
  const truth = buildRunTruth(config, opts.durationSec);
  const base = `run-${config.run}`;
  const videoPath = path.join(opts.out, `${base}.mp4`);
  const truthPath = path.join(opts.out, `${base}.truth.json`);
  const commands = sendcmdScript(truth);
  const encode = cameraEncodeArgs(config.creationTime);
  // The hash covers what decides the bytes: font contents, not where the fonts happen to live.
  const portableGraph = filterGraph(truth, fontHashes, 'commands.txt');
  const inputHash = createHash('sha256')
    .update(JSON.stringify({ GENERATOR_VERSION, truth, portableGraph, commands, encode, version }))
    .digest('hex');

  if (!opts.force && (await fileExists(videoPath)) && (await fileExists(truthPath))) {
    try {
      const previous = JSON.parse(await readFile(truthPath, 'utf8')) as { generator?: { inputHash?: string }; video?: { sha256?: string; sizeBytes?: number } };
      if (previous.generator?.inputHash === inputHash && previous.video?.sha256 === (await sha256File(videoPath))) {
        return { run: config.run, video: videoPath, truth: truthPath, sizeBytes: previous.video.sizeBytes ?? 0, seconds: 0, cached: true };
      }
    } catch {
      // Unreadable truth file: regenerate.
    }
  }

  const work = await mkdtemp(path.join(os.tmpdir(), 'dialsheet-demo-'));
  const started = process.hrtime.bigint();
  try {
    const commandsPath = path.join(work, 'commands.txt');
    await writeFile(commandsPath, commands);
    const partial = path.join(work, `${base}.mp4`);
    await ffmpeg([
      '-hide_banner', '-nostdin', '-loglevel', 'error',
      '-filter_complex', filterGraph(truth, fonts, commandsPath),
      '-map', '[out]',
      ...encode,
      '-f', 'mp4',
      '-y', partial,
    ]);
    const { size } = await stat(partial);
    if (size > MAX_VIDEO_BYTES) throw new Error(`${base}.mp4 is ${(size / 1e6).toFixed(1)} MB, over the 20 MB limit`);
    const sha256 = await sha256File(partial);
    const seconds = Number(process.hrtime.bigint() - started) / 1e9;
    const { updates, ...head } = truth;
    const document = {
      ...head,
      displays: withRegions(head.displays),
      generator: { version: GENERATOR_VERSION, inputHash, ffmpeg: version },
      video: { file: `${base}.mp4`, sizeBytes: size, sha256 },
      updates,
    } satisfies RunTruth & Record<string, unknown>;
    // Copy rather than rename: the temp directory may be on another file system. The truth file is
    // written last, so an interrupted copy fails the hash check next time and is made again.
    await copyFile(partial, videoPath);
    await writeFile(`${truthPath}.partial`, `${JSON.stringify(document, null, 1)}\n`);
    await rename(`${truthPath}.partial`, truthPath);
    return { run: config.run, video: videoPath, truth: truthPath, sizeBytes: size, seconds, cached: false };
  } finally {
    await rm(work, { recursive: true, force: true });
  }
}

async function main(): Promise<void> {
  const opts = parseOptions(process.argv.slice(2));
  await mkdir(opts.out, { recursive: true });
  const [regular, bold, version] = await Promise.all([findFont('Book'), findFont('Bold'), ffmpegVersion()]);
  const fonts: Fonts = { regular, bold };
  const fontHashes: Fonts = { regular: await sha256File(regular), bold: await sha256File(bold) };
  const started = process.hrtime.bigint();
  console.log(`demo videos: ${opts.runs} run(s) × ${opts.durationSec} s → ${opts.out}`);
  for (let i = 0; i < opts.runs; i++) {
    const r = await generateRun(i, opts, fonts, fontHashes, version);
    const what = r.cached ? 'unchanged, kept' : `made in ${r.seconds.toFixed(1)} s`;
    console.log(`run ${r.run}: ${path.basename(r.video)} ${(r.sizeBytes / 1e6).toFixed(2)} MB, ${path.basename(r.truth)} (${what})`);
  }
  console.log(`done in ${(Number(process.hrtime.bigint() - started) / 1e9).toFixed(1)} s`);
}

main().catch((err: unknown) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});
