// `npm run bench -- range`: how fast a seek's range request gets its first byte over loopback.
// A 30 s 720p H.264 video is uploaded into a throw-away Dialsheet (WORKER=on, so on the way the
// proxy transcode's real-time factor on this machine is printed too). Then 64 KiB ranges at
// random offsets of the original are fetched through a signed media link, one after another on
// a keep-alive connection, alternating with the same ranges of the same file from a plain static
// file server (the baseline). Figures: time to first byte p50/p95/p99 of both; target p95 ≤ 20 ms
// and ≤ 1.5 × the static server's p95. Every answer is checked (206, Content-Range, the bytes).
import { createHash } from 'node:crypto';
import fs from 'node:fs';
import http from 'node:http';
import path from 'node:path';
import type { MediaUrls, Recording, Run } from '@dialsheet/common';
import { repoRoot } from '../scripts/lib/config';
import { canConnect, waitFor } from '../scripts/lib/processes';
import { freePort, runBenchmark, secondsSince, sleep, startProcess, startStack, type Stack } from './lib/harness';
import { percentile, round } from './lib/measure';
import { makeTestVideo } from './lib/videos';

const REQUESTS = 500;
const WARM_UP_REQUESTS = 30;
const RANGE_BYTES = 64 * 1024;
const P95_TARGET_MS = 20;
const RATIO_TARGET = 1.5;
const VIDEO = { seconds: 30, width: 1280, height: 720, fps: 30, gop: 300 };
const PROCESSING_TIMEOUT_MS = 5 * 60_000;

/** Small seeded generator, so every run asks for the same offsets. */
function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

interface RangeAnswer {
  /** Request sent → first byte of the body, ms. */
  ttfbMs: number;
  /** Request sent → last byte, ms. */
  totalMs: number;
}

/** GETs bytes [start, end] and fails unless the answer is exactly those bytes of `file`. */
function getRange(agent: http.Agent, url: URL, start: number, end: number, file: Buffer, who: string): Promise<RangeAnswer> {
  return new Promise((resolve, reject) => {
    const sent = process.hrtime.bigint();
    let firstByte: bigint | undefined;
    const request = http.get(url, { agent, headers: { range: `bytes=${start}-${end}` } }, (response) => {
      const chunks: Buffer[] = [];
      response.on('data', (chunk: Buffer) => {
        firstByte ??= process.hrtime.bigint();
        chunks.push(chunk);
      });
      response.on('error', reject);
      response.on('end', () => {
        const done = process.hrtime.bigint();
        const body = Buffer.concat(chunks);
        const expectedRange = `bytes ${start}-${end}/${file.length}`;
        if (response.statusCode !== 206) {
          reject(new Error(`${who}: bytes ${start}-${end} answered HTTP ${response.statusCode}: ${body.toString('utf8', 0, 200)}`));
        } else if (response.headers['content-range'] !== expectedRange) {
          reject(new Error(`${who}: Content-Range "${response.headers['content-range']}", expected "${expectedRange}"`));
        } else if (!body.equals(file.subarray(start, end + 1))) {
          reject(new Error(`${who}: the ${body.length} bytes answered for ${start}-${end} are not the file's bytes there`));
        } else {
          resolve({ ttfbMs: Number(firstByte! - sent) / 1e6, totalMs: Number(done - sent) / 1e6 });
        }
      });
    });
    request.setTimeout(10_000, () => request.destroy(new Error(`${who}: no answer to bytes ${start}-${end} within 10 s`)));
    request.on('error', reject);
  });
}

/** Polls the recording until it is ready, printing each change of status with its time. */
async function waitUntilReady(stack: Stack, runId: string): Promise<{ recording: Recording; transcodeSeconds: number; totalSeconds: number }> {
  const started = process.hrtime.bigint();
  let status = '';
  let transcodingSince: number | undefined;
  for (;;) {
    const recording = await stack.api.json<Recording>('GET', `/api/runs/${runId}/recording`);
    const now = secondsSince(started);
    if (recording.status !== status) {
      status = recording.status;
      console.log(`  ${now.toFixed(1)} s after upload: ${status}`);
      if (status === 'transcoding') transcodingSince = now;
    }
    if (status === 'failed') throw new Error(`processing failed: ${recording.failureReason}`);
    if (status === 'ready') {
      // Had the transcoding step been shorter than one poll, the whole processing time stands in.
      const transcodeSeconds = now - (transcodingSince ?? 0);
      return { recording, transcodeSeconds, totalSeconds: now };
    }
    if (now * 1000 > PROCESSING_TIMEOUT_MS) throw new Error(`the recording is still "${status}" after ${Math.round(now)} s`);
    await sleep(100);
  }
}

function summary(label: string, values: number[]): string {
  const f = (p: number) => percentile(values, p).toFixed(2);
  return `${label}: p50 ${f(50)} ms, p95 ${f(95)} ms, p99 ${f(99)} ms, max ${Math.max(...values).toFixed(2)} ms (n=${values.length})`;
}

runBenchmark('range', 10 * 60_000, async (scratch) => {
  const root = scratch.tempDir('range');
  const work = path.join(root, 'work');
  const served = path.join(root, 'static');
  fs.mkdirSync(work);
  fs.mkdirSync(served);

  const stack = await startStack(scratch, root, { worker: true });

  let started = process.hrtime.bigint();
  const source = await makeTestVideo(work, 'source.mp4', VIDEO);
  const bytes = fs.readFileSync(source);
  const sha256 = createHash('sha256').update(bytes).digest('hex');
  console.log(
    `test video: ${VIDEO.seconds} s ${VIDEO.width}×${VIDEO.height} ${VIDEO.fps} fps H.264, keyframe every ${VIDEO.gop / VIDEO.fps} s, ` +
      `${(bytes.length / 1e6).toFixed(1)} MB, made in ${secondsSince(started).toFixed(1)} s`,
  );

  const run = await stack.api.json<Run>('POST', `/api/campaigns/${stack.campaignId}/runs`, { name: 'Bench range requests' });
  const upload = await stack.api.upload(`/api/runs/${run.id}/recording`, source);
  if (upload.status !== 201) throw new Error(`upload answered HTTP ${upload.status}: ${upload.body.slice(0, 300)}`);
  const uploaded = JSON.parse(upload.body) as Recording;
  if (uploaded.sha256 !== sha256) throw new Error(`the server's SHA-256 ${uploaded.sha256} differs from the file's ${sha256}`);
  console.log(`uploaded in ${upload.seconds.toFixed(2)} s; processing (WORKER=on):`);

  const { recording, transcodeSeconds, totalSeconds } = await waitUntilReady(stack, run.id);
  const duration = recording.probe?.durationSec ?? VIDEO.seconds;
  const proxy = recording.proxy ? `, proxy ${recording.proxy.width}×${recording.proxy.height} ${(recording.proxy.sizeBytes / 1e6).toFixed(1)} MB` : '';
  console.log(
    `proxy transcode: ${transcodeSeconds.toFixed(1)} s for ${duration.toFixed(1)} s of video ` +
      `(real-time factor ${(duration / transcodeSeconds).toFixed(2)}: seconds of video per second of work; ` +
      `upload to ready ${totalSeconds.toFixed(1)} s in all${proxy})`,
  );

  const urls = await stack.api.json<MediaUrls>('POST', `/api/recordings/${recording.id}/media-urls`);
  const ours = new URL(urls.originalUrl, stack.baseUrl);

  // The same bytes for the static server, on the same file system.
  fs.copyFileSync(source, path.join(served, 'source.mp4'));
  const staticPort = await freePort();
  const staticServer = startProcess(
    scratch,
    'static',
    process.execPath,
    ['--import', 'tsx', path.join(__dirname, 'lib', 'static-file-server.ts'), served, String(staticPort)],
    { cwd: repoRoot, output: { file: path.join(root, 'static.log') } },
  );
  await waitFor('the static file server', () => canConnect(staticPort), 30_000, () => (staticServer.running ? undefined : 'it exited'));
  const baseline = new URL(`http://127.0.0.1:${staticPort}/source.mp4`);

  const oursAgent = new http.Agent({ keepAlive: true, maxSockets: 1 });
  const staticAgent = new http.Agent({ keepAlive: true, maxSockets: 1 });
  scratch.add('close the client connections', () => {
    oursAgent.destroy();
    staticAgent.destroy();
  });
  const random = mulberry32(20_250_314);
  const oursTtfb: number[] = [];
  const staticTtfb: number[] = [];
  const oursTotal: number[] = [];
  const staticTotal: number[] = [];
  started = process.hrtime.bigint();
  for (let i = -WARM_UP_REQUESTS; i < REQUESTS; i++) {
    const start = Math.floor(random() * (bytes.length - RANGE_BYTES));
    const end = start + RANGE_BYTES - 1;
    // Alternate which server goes first, so neither always follows the other's work.
    const order = i % 2 === 0 ? (['ours', 'static'] as const) : (['static', 'ours'] as const);
    for (const who of order) {
      const answer =
        who === 'ours'
          ? await getRange(oursAgent, ours, start, end, bytes, 'Dialsheet')
          : await getRange(staticAgent, baseline, start, end, bytes, 'static server');
      if (i < 0) continue;
      (who === 'ours' ? oursTtfb : staticTtfb).push(answer.ttfbMs);
      (who === 'ours' ? oursTotal : staticTotal).push(answer.totalMs);
    }
  }
  console.log(
    `${REQUESTS} range requests of ${RANGE_BYTES / 1024} KiB at random offsets per server (after ${WARM_UP_REQUESTS} warm-up each), ` +
      `keep-alive, all answers 206 with the right Content-Range and bytes, ${secondsSince(started).toFixed(1)} s`,
  );
  console.log(summary('Dialsheet /api/media (signed link), first byte', oursTtfb));
  console.log(summary('static file server (baseline), first byte  ', staticTtfb));
  console.log(summary('Dialsheet, whole 64 KiB', oursTotal));
  console.log(summary('static file server, whole 64 KiB', staticTotal));

  const p95 = percentile(oursTtfb, 95);
  const staticP95 = percentile(staticTtfb, 95);
  const ratio = p95 / staticP95;
  console.log(`p95 first byte ${p95.toFixed(2)} ms (target ≤ ${P95_TARGET_MS}); ratio to the static server ${ratio.toFixed(2)} (target ≤ ${RATIO_TARGET})`);
  return { name: 'range', value: round(p95, 2), unit: 'ms', stat: 'p95', target: `<= ${P95_TARGET_MS}`, ratio: round(ratio, 3) };
});
