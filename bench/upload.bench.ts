// `npm run bench -- upload`: a 1 GiB upload over loopback into a throw-away Dialsheet.
// Figures: throughput (MB/s, 10^6 bytes) against a plain disk copy of the same file on the same
// file system in the same run (target ≥ 0.5 × the copy), and the growth of the server process's
// resident memory during the upload (target ≤ 64 MiB: the body must stream to disk, not pile up).
// Neither the copy nor the server waits for the disk (no fsync), so both figures are mostly page
// cache; how long each then takes to reach the disk is printed beside them for the reader.
//
// The file starts with the bytes of a real (tiny) MP4, so the server's type check on the first
// bytes accepts it, and goes on with random bytes: it is NOT a playable video. The app runs with
// WORKER=off, so nothing tries to process it; this measures transport, hashing and storage only.
import { createHash, randomFillSync } from 'node:crypto';
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { Transform } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import type { Recording, Run } from '@dialsheet/common';
import { runBenchmark, secondsSince, startStack, type Stack } from './lib/harness';
import { memoryOf, median, resetPeak, round, RssSampler } from './lib/measure';
import { makeTestVideo } from './lib/videos';

const FILE_BYTES = 1024 ** 3;
const ROUNDS = 3;
const MB = 1e6;
const MEMORY_TARGET_MIB = 64;
const RATIO_TARGET = 0.5;
/** Source, one copy and one stored upload at a time, plus room to spare. */
const DISK_NEEDED_BYTES = 3.5 * FILE_BYTES;

/** Flushes dirty pages, so one measurement does not pay for the previous one's writes. */
function flushDisks(): void {
  execFileSync('sync');
}

/** Writes `head` then random bytes up to `size`, hashing on the way; returns the hex SHA-256. */
function writeBigFile(file: string, head: Buffer, size: number): string {
  const hash = createHash('sha256');
  const block = Buffer.allocUnsafe(4 * 1024 * 1024);
  const fd = fs.openSync(file, 'wx', 0o600);
  try {
    fs.writeSync(fd, head);
    hash.update(head);
    let written = head.length;
    while (written < size) {
      const part = block.subarray(0, Math.min(block.length, size - written));
      randomFillSync(part);
      fs.writeSync(fd, part);
      hash.update(part);
      written += part.length;
    }
    fs.fsyncSync(fd);
  } finally {
    fs.closeSync(fd);
  }
  return hash.digest('hex');
}

/** Writes a file's dirty pages to the disk (any descriptor of the file will do). */
function fsyncFile(file: string): void {
  const fd = fs.openSync(file, 'r');
  try {
    fs.fsyncSync(fd);
  } finally {
    fs.closeSync(fd);
  }
}

/** Where the local storage driver keeps a recording's original (STORAGE_DIR/objects/<key>). */
function storedOriginal(stack: Stack, recording: Recording): string {
  const file = path.join(stack.storageDir, 'objects', 'recordings', recording.id, 'original');
  if (!fs.existsSync(file)) throw new Error(`the uploaded file is not where the local storage driver keeps it (${path.relative(stack.storageDir, file)})`);
  return file;
}

async function createRun(stack: Stack, name: string): Promise<Run> {
  return stack.api.json<Run>('POST', `/api/campaigns/${stack.campaignId}/runs`, { name, runDate: new Date().toISOString().slice(0, 10) });
}

/** Uploads and insists on the answer the contract promises, so a broken upload yields no figure. */
async function uploadChecked(stack: Stack, runId: string, file: string, sha256: string, size: number) {
  const outcome = await stack.api.upload(`/api/runs/${runId}/recording`, file);
  if (outcome.status !== 201) throw new Error(`upload of ${path.basename(file)} answered HTTP ${outcome.status}: ${outcome.body.slice(0, 300)}`);
  const recording = JSON.parse(outcome.body) as Recording;
  if (recording.sha256 !== sha256) throw new Error(`the server's SHA-256 ${recording.sha256} differs from the file's ${sha256}`);
  if (recording.sizeBytes !== size) throw new Error(`the server stored ${recording.sizeBytes} bytes of ${size}`);
  return { outcome, recording };
}

runBenchmark('upload', 8 * 60_000, async (scratch) => {
  const root = scratch.tempDir('upload');
  const free = fs.statfsSync(root);
  if (free.bavail * free.bsize < DISK_NEEDED_BYTES) {
    throw new Error(`${(DISK_NEEDED_BYTES / 1024 ** 3).toFixed(1)} GiB free needed in ${path.dirname(root)}, ${((free.bavail * free.bsize) / 1024 ** 3).toFixed(1)} GiB there`);
  }
  const work = path.join(root, 'work');
  fs.mkdirSync(work);

  const stack = await startStack(scratch, root, { worker: false });
  const pid = stack.app.child.pid!;

  // A real MP4 first: it proves the route works end to end before 1 GiB is written, its bytes
  // become the head of the big file, and the upload code path is warm for the measured rounds.
  const tiny = await makeTestVideo(work, 'tiny.mp4', { seconds: 1, width: 320, height: 240, fps: 30, gop: 30 });
  const tinyBytes = fs.readFileSync(tiny);
  const warmUpRun = await createRun(stack, 'Bench warm-up');
  await uploadChecked(stack, warmUpRun.id, tiny, createHash('sha256').update(tinyBytes).digest('hex'), tinyBytes.length);
  console.log(`warm-up: a ${tinyBytes.length}-byte MP4 uploaded and accepted`);

  const big = path.join(work, 'bench-1gib.mp4');
  let started = process.hrtime.bigint();
  const sha256 = writeBigFile(big, tinyBytes, FILE_BYTES);
  console.log(`test file: ${FILE_BYTES} bytes (MP4 head of ${tinyBytes.length} bytes + random bytes) written in ${secondsSince(started).toFixed(1)} s, SHA-256 ${sha256.slice(0, 16)}…`);

  const run = await createRun(stack, 'Bench 1 GiB upload');
  const copyTarget = path.join(stack.storageDir, 'disk-copy-baseline');
  const copies: number[] = [];
  const uploads: number[] = [];
  const durableCopies: number[] = [];
  const durableUploads: number[] = [];
  let rssBefore: number | undefined;
  let peak = 0;
  const peakReset = resetPeak(pid);
  if (!peakReset) console.log('note: cannot reset the server’s VmHWM here; the peak comes from 50 ms samples only');

  // The first copy of a run is regularly slower than the next ones; the upload had its warm-up.
  await fs.promises.copyFile(big, copyTarget);
  fs.rmSync(copyTarget);

  for (let i = 1; i <= ROUNDS; i++) {
    // Baseline: the same bytes copied by the kernel onto the file system the app stores on.
    flushDisks();
    started = process.hrtime.bigint();
    await fs.promises.copyFile(big, copyTarget);
    const copySeconds = secondsSince(started);
    started = process.hrtime.bigint();
    fsyncFile(copyTarget);
    const copySyncSeconds = secondsSince(started);
    copies.push(FILE_BYTES / MB / copySeconds);
    durableCopies.push(FILE_BYTES / MB / (copySeconds + copySyncSeconds));
    fs.rmSync(copyTarget);

    flushDisks();
    const before = memoryOf(pid).rssMiB;
    rssBefore ??= before;
    if (peakReset) resetPeak(pid);
    const sampler = new RssSampler(pid, 50);
    sampler.start();
    const { outcome, recording } = await uploadChecked(stack, run.id, big, sha256, FILE_BYTES);
    const sampled = sampler.stop();
    const roundPeak = Math.max(sampled, peakReset ? memoryOf(pid).hwmMiB : 0);
    peak = Math.max(peak, roundPeak);
    started = process.hrtime.bigint();
    fsyncFile(storedOriginal(stack, recording));
    const uploadSyncSeconds = secondsSince(started);
    uploads.push(FILE_BYTES / MB / outcome.seconds);
    durableUploads.push(FILE_BYTES / MB / (outcome.seconds + uploadSyncSeconds));

    console.log(
      `round ${i}/${ROUNDS}: disk copy ${copySeconds.toFixed(2)} s = ${copies.at(-1)!.toFixed(0)} MB/s ` +
        `(+ fsync ${copySyncSeconds.toFixed(2)} s); ` +
        `upload ${outcome.seconds.toFixed(2)} s = ${uploads.at(-1)!.toFixed(0)} MB/s (HTTP ${outcome.status}, SHA-256 matches) ` +
        `(+ fsync ${uploadSyncSeconds.toFixed(2)} s); ` +
        `server RSS ${before.toFixed(0)} → peak ${roundPeak.toFixed(0)} MiB (${sampler.samples} samples)`,
    );
    // Frees the stored gigabyte, and lets the next round upload the same bytes (not a duplicate).
    await stack.api.json('DELETE', `/api/runs/${run.id}/recording`);
  }

  // For the reader, not the ratio: the server's own work (read, SHA-256, write through Node
  // streams) without the network, i.e. how much of the gap to the kernel's copy is loopback HTTP.
  flushDisks();
  started = process.hrtime.bigint();
  const hash = createHash('sha256');
  await pipeline(
    fs.createReadStream(big),
    new Transform({
      transform(chunk: Buffer, _encoding, done) {
        hash.update(chunk);
        done(null, chunk);
      },
    }),
    fs.createWriteStream(copyTarget),
  );
  const streamCopy = FILE_BYTES / MB / secondsSince(started);
  if (hash.digest('hex') !== sha256) throw new Error('the stream copy hashed to another SHA-256');
  flushDisks();
  fs.rmSync(copyTarget);
  fs.rmSync(big);

  const upload = median(uploads);
  const copy = median(copies);
  const ratio = upload / copy;
  const growth = Math.max(0, peak - rssBefore!);
  console.log(`upload throughput: median ${upload.toFixed(0)} MB/s over ${ROUNDS} rounds (${uploads.map((v) => v.toFixed(0)).join(', ')})`);
  console.log(`disk copy (baseline): median ${copy.toFixed(0)} MB/s (${copies.map((v) => v.toFixed(0)).join(', ')})`);
  console.log(`reference: the same copy through Node streams with SHA-256 on the way (no network): ${streamCopy.toFixed(0)} MB/s`);
  console.log(`ratio upload / disk copy: ${ratio.toFixed(2)} (target ≥ ${RATIO_TARGET})`);
  const durableRatio = median(durableUploads) / median(durableCopies);
  console.log(
    `until the bytes are on disk (fsync included in both): upload ${median(durableUploads).toFixed(0)} MB/s, ` +
      `disk copy ${median(durableCopies).toFixed(0)} MB/s, ratio ${durableRatio.toFixed(2)} (for the reader; the result line uses the figures above)`,
  );
  console.log(`server memory growth: peak ${peak.toFixed(1)} MiB − ${rssBefore!.toFixed(1)} MiB before = ${growth.toFixed(1)} MiB (target ≤ ${MEMORY_TARGET_MIB})`);
  return {
    name: 'upload',
    value: round(upload, 1),
    unit: 'MB/s',
    stat: 'throughput',
    target: `>= ${RATIO_TARGET} × disk copy`,
    ratio: round(ratio, 3),
    memory_mb: round(growth, 1),
  };
});
