// Turns ffprobe output (probeArgs JSON, packetTimesArgs CSV) into the VideoProbe wire type.
// Pure: the caller runs ffprobe and hands the text in.
import { frameIntervalStats, type VideoProbe } from '@dialsheet/common';

/** ffprobe output that cannot describe a playable video; the message is shown to the uploader. */
export class MediaProbeError extends Error {
  override name = 'MediaProbeError';
}

export interface PacketTimes {
  /** Presentation times of the displayed frames, ascending, no duplicates (seconds). */
  times: number[];
  /** Presentation times of keyframe packets, ascending (seconds). */
  keyframeTimes: number[];
  /** Packets without a timestamp (N/A), cut by an edit list (D flag), or repeating a timestamp. */
  ignoredPackets: number;
}

type Json = Record<string, unknown>;

const isObject = (v: unknown): v is Json => typeof v === 'object' && v !== null && !Array.isArray(v);

/** ffprobe prints numbers as strings ("2.000000"), as numbers, or leaves them out / "N/A". */
function toNumber(v: unknown): number | null {
  if (typeof v === 'number') return Number.isFinite(v) ? v : null;
  if (typeof v !== 'string') return null;
  const s = v.trim();
  if (s === '' || s === 'N/A') return null;
  const n = Number(s);
  return Number.isFinite(n) ? n : null;
}

/** "30000/1001" → 29.97…, "30/1" → 30; "0/0", "N/A" and non-positive rates → null. */
export function parseRate(text: unknown): number | null {
  if (typeof text === 'number') return Number.isFinite(text) && text > 0 ? text : null;
  if (typeof text !== 'string') return null;
  const m = /^\s*(\d+(?:\.\d+)?)\s*(?:\/\s*(\d+(?:\.\d+)?))?\s*$/.exec(text);
  if (!m) return null;
  const num = Number(m[1]);
  const den = m[2] === undefined ? 1 : Number(m[2]);
  if (!(num > 0) || !(den > 0)) return null;
  return num / den;
}

/** Any angle in degrees → the nearest of 0, 90, 180, 270. */
export function normaliseRotation(degrees: number): 0 | 90 | 180 | 270 {
  if (!Number.isFinite(degrees)) return 0;
  const quarter = ((Math.round(degrees / 90) % 4) + 4) % 4;
  return ([0, 90, 180, 270] as const)[quarter];
}

/**
 * Clockwise turn that shows the stored frame upright. ffprobe reports the display matrix
 * counter-clockwise (a phone's portrait clip shows rotation -90); ffmpeg itself negates it to pick
 * the autorotate transpose. Older files and tools carry the clockwise "rotate" tag instead.
 */
function rotationOf(stream: Json): 0 | 90 | 180 | 270 {
  const sideData = Array.isArray(stream.side_data_list) ? stream.side_data_list : [];
  for (const entry of sideData) {
    if (!isObject(entry)) continue;
    const r = toNumber(entry.rotation);
    if (r !== null) return normaliseRotation(-r);
  }
  const tags = isObject(stream.tags) ? stream.tags : {};
  const tag = toNumber(tags.rotate);
  return tag === null ? 0 : normaliseRotation(tag);
}

/**
 * Camera creation time as ISO 8601, or null. Zero dates (the MP4 epoch 1904-01-01 and the Unix
 * epoch) are what devices without a clock write, so they count as absent.
 */
function creationTimeOf(...candidates: unknown[]): string | null {
  for (const c of candidates) {
    if (typeof c !== 'string' || c.trim() === '') continue;
    const ms = Date.parse(c);
    if (!Number.isFinite(ms)) continue;
    const iso = new Date(ms).toISOString();
    if (iso.startsWith('1904-01-01T00:00:00') || iso.startsWith('1970-01-01T00:00:00')) continue;
    return iso;
  }
  return null;
}

const PTS_PATTERN = /^-?\d+(?:\.\d+)?$/;

/**
 * Parses `packetTimesArgs` CSV ("pts_time,flags" per line). Packets arrive in decode order, so the
 * times are sorted by presentation time here. Packets without a timestamp or flagged D (discarded
 * by an edit list, never shown) are skipped, as are repeated timestamps.
 */
export function parsePacketTimes(csv: string): PacketTimes {
  if (typeof csv !== 'string') throw new MediaProbeError('packet list must be text');
  const times: number[] = [];
  const keyframeTimes: number[] = [];
  let ignored = 0;
  const lines = csv.split(/\r?\n/);
  for (let i = 0; i < lines.length; i++) {
    const line = lines[i].trim();
    if (line === '') continue;
    const [pts, flags = ''] = line.split(',');
    if (pts === 'N/A') {
      ignored++;
      continue;
    }
    if (!PTS_PATTERN.test(pts) || !/^[A-Z_]*$/.test(flags)) {
      throw new MediaProbeError(`packet list line ${i + 1} is not "pts_time,flags": "${line.slice(0, 60)}"`);
    }
    if (flags.includes('D')) {
      ignored++;
      continue;
    }
    const t = Number(pts);
    times.push(t);
    if (flags.includes('K')) keyframeTimes.push(t);
  }
  const byTime = (a: number, b: number): number => a - b;
  times.sort(byTime);
  keyframeTimes.sort(byTime);
  const unique = dedupe(times);
  ignored += times.length - unique.length;
  return { times: unique, keyframeTimes: dedupe(keyframeTimes), ignoredPackets: ignored };
}

function dedupe(sorted: number[]): number[] {
  return sorted.filter((t, i) => i === 0 || t !== sorted[i - 1]);
}

function parseJson(json: unknown): Json {
  if (isObject(json)) return json;
  if (typeof json === 'string') {
    let parsed: unknown;
    try {
      parsed = JSON.parse(json);
    } catch {
      throw new MediaProbeError('ffprobe output is not valid JSON');
    }
    if (isObject(parsed)) return parsed;
  }
  throw new MediaProbeError('ffprobe output is not a JSON object');
}

function median(sortedTimes: number[]): number | null {
  if (sortedTimes.length < 2) return null;
  return frameIntervalStats(sortedTimes).medianInterval;
}

/**
 * VideoProbe from probeArgs JSON (text or parsed) and the parsed packet list of the same file.
 * Frame count, keyframes and variable-rate detection come from the packets: container fields
 * such as nb_frames are missing in WebM and r_frame_rate is not an average.
 */
export function parseProbe(json: unknown, packets: PacketTimes): VideoProbe {
  const root = parseJson(json);
  const streams = Array.isArray(root.streams) ? root.streams.filter(isObject) : [];
  const format = isObject(root.format) ? root.format : {};
  const isCoverPicture = (s: Json): boolean => isObject(s.disposition) && toNumber(s.disposition.attached_pic) === 1;
  const stream = streams.find((s) => s.codec_type === 'video' && !isCoverPicture(s));
  if (!stream) {
    const kinds = streams.map((s) => (s.codec_type === 'video' ? 'cover picture' : String(s.codec_type ?? 'unknown')));
    throw new MediaProbeError(
      kinds.length > 0 ? `no video stream: the file holds only ${[...new Set(kinds)].join(', ')}` : 'no video stream: the file holds no media streams',
    );
  }

  const width = toNumber(stream.width);
  const height = toNumber(stream.height);
  if (width === null || height === null || !Number.isInteger(width) || !Number.isInteger(height) || width <= 0 || height <= 0) {
    throw new MediaProbeError('the video stream has no frame size');
  }
  const { times, keyframeTimes } = packets;
  if (times.length === 0) throw new MediaProbeError('the video stream has no frames');

  const medianInterval = median(times);
  const first = times[0];
  const last = times[times.length - 1];
  // WebM leaves stream duration out (N/A): fall back on the container, then on the frames.
  const packetSpan = medianInterval === null ? null : last - first + medianInterval;
  const durationSec = [toNumber(stream.duration), toNumber(format.duration), packetSpan].find(
    (d): d is number => d !== null && d > 0,
  );
  if (durationSec === undefined) throw new MediaProbeError('the video has no duration');

  const averageFps =
    parseRate(stream.avg_frame_rate) ?? (times.length >= 2 ? (times.length - 1) / (last - first) : times.length / durationSec);
  const nominalFps = parseRate(stream.r_frame_rate) ?? averageFps;

  const rotation = rotationOf(stream);
  const quarterTurn = rotation === 90 || rotation === 270;
  const frameDuration = medianInterval ?? 1 / averageFps;

  return {
    durationSec,
    width,
    height,
    displayWidth: quarterTurn ? height : width,
    displayHeight: quarterTurn ? width : height,
    rotation,
    codec: typeof stream.codec_name === 'string' ? stream.codec_name : 'unknown',
    pixelFormat: typeof stream.pix_fmt === 'string' ? stream.pix_fmt : 'unknown',
    nominalFps,
    averageFps,
    variableFrameRate: times.length >= 2 ? frameIntervalStats(times).variable : false,
    frameCount: times.length,
    keyframeCount: keyframeTimes.length,
    maxKeyframeInterval: maxKeyframeInterval(keyframeTimes, last + frameDuration, durationSec),
    creationTime: creationTimeOf(
      isObject(format.tags) ? format.tags.creation_time : undefined,
      isObject(stream.tags) ? stream.tags.creation_time : undefined,
    ),
    container: typeof format.format_name === 'string' ? format.format_name : 'unknown',
  };
}

/**
 * Longest run of video decoded from one keyframe: from each keyframe to the next, the last one to
 * the end of the last frame. Without any keyframe flag the whole duration counts.
 */
function maxKeyframeInterval(keyframeTimes: number[], end: number, durationSec: number): number {
  if (keyframeTimes.length === 0) return durationSec;
  let longest = 0;
  for (let i = 0; i < keyframeTimes.length; i++) {
    const next = i + 1 < keyframeTimes.length ? keyframeTimes[i + 1] : end;
    longest = Math.max(longest, next - keyframeTimes[i]);
  }
  // Printed timestamps carry microsecond rounding; 0.999999 s is a 1 s interval.
  return Math.round(longest * 1e6) / 1e6;
}
