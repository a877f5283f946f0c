// Demo scenario (pure, no I/O): a bench test of an air-to-air heat-recovery core filmed on a
// panel of six displays. Everything a frame shows follows from this file, so tests know the true
// reading behind every frame of the generated videos.
//
// The rig: a heater warms one air stream (T1 warm in → core → T2 warm out); a conditioned cool
// stream passes the other side (T3 cool in → core → T4 cool out). A four-channel thermometer shows
// T1–T4, one thermal mass-flow meter (0–5 V = 0–200 SLPM) is read on a panel voltmeter and moved
// between the streams from run to run, and a dial gauge shows the warm stream's static pressure.
// A sync lamp lights at test time 0.

/**
 * Part of every file's input hash: raise it when the truth file's format changes, so files made by
 * an older generator are made again. 2: each display carries its digit window (`region`).
 */
export const GENERATOR_VERSION = 2;
export const SCENARIO_NAME = 'heat-recovery-core-bench';
export const WIDTH = 1280;
export const HEIGHT = 720;
export const FPS = 30;
export const DEFAULT_DURATION_SEC = 180;
/** Video time at which the sync lamp lights: the frame at 2.0 s is test time 0. */
export const START_MARKER_VIDEO_TIME = 2;
/** The lamp stays lit for 0.5 s: frames 60–74 at 30 fps. */
export const START_MARKER_DURATION_SEC = 0.5;

export type DisplayKey = 'T1' | 'T2' | 'T3' | 'T4' | 'V' | 'P';
export type Stream = 'warm' | 'cool';

export interface DisplaySpec {
  key: DisplayKey;
  label: string;
  unit: string;
  /** Smallest step the display shows (0.5 for the gauge: readers read to half a division). */
  resolution: number;
  /** How often the instrument refreshes its display. */
  updateHz: number;
  /** First refresh after video time 0 (µs); chosen so no refresh coincides with a frame. */
  phaseMicros: number;
  /** Noise standard deviation in display units, and its correlation from one refresh to the next. */
  noiseSd: number;
  noiseCorrelation: number;
}

export const DISPLAYS: readonly DisplaySpec[] = [
  { key: 'T1', label: 'T1 warm in', unit: '°C', resolution: 0.1, updateHz: 2, phaseMicros: 137_000, noiseSd: 0.04, noiseCorrelation: 0.6 },
  { key: 'T2', label: 'T2 warm out', unit: '°C', resolution: 0.1, updateHz: 2, phaseMicros: 137_000, noiseSd: 0.04, noiseCorrelation: 0.6 },
  { key: 'T3', label: 'T3 cool in', unit: '°C', resolution: 0.1, updateHz: 2, phaseMicros: 137_000, noiseSd: 0.04, noiseCorrelation: 0.6 },
  { key: 'T4', label: 'T4 cool out', unit: '°C', resolution: 0.1, updateHz: 2, phaseMicros: 137_000, noiseSd: 0.04, noiseCorrelation: 0.6 },
  { key: 'V', label: 'V flow meter', unit: 'V', resolution: 0.001, updateHz: 4, phaseMicros: 71_000, noiseSd: 0.003, noiseCorrelation: 0.5 },
  { key: 'P', label: 'P gauge', unit: 'kPa', resolution: 0.5, updateHz: 5, phaseMicros: 29_000, noiseSd: 0.08, noiseCorrelation: 0.6 },
];

export interface RunConfig {
  run: number;
  /** Which stream the movable flow meter sits in. */
  meterStream: Stream;
  seed: number;
  /** Camera-style creation time written into the file. */
  creationTime: string;
}

/** Run 1: meter on the warm stream; run 2: on the cool stream; run 3 repeats run 1. */
export const RUNS: readonly RunConfig[] = [
  { run: 1, meterStream: 'warm', seed: 0x5eed_0001, creationTime: '2025-03-14T09:30:00Z' },
  { run: 2, meterStream: 'cool', seed: 0x5eed_0002, creationTime: '2025-03-14T10:15:00Z' },
  { run: 3, meterStream: 'warm', seed: 0x5eed_0003, creationTime: '2025-03-14T11:00:00Z' },
];

/** Steady-state design point; the energy balance closes exactly on these numbers. */
export const PLANT = {
  ambientC: 21.0,
  warmInSteadyC: 40.0,
  coolInC: 18.0,
  /** Slow rise of the cool supply over the run (°C), as a conditioned supply drifts. */
  coolInDriftC: 0.2,
  /** Heat-exchanger effectiveness on the smaller capacity stream (the cool one). */
  effectiveness: 0.72,
  warmFlowSlpm: 128,
  coolFlowSlpm: 112,
  meterFullScaleSlpm: 200,
  meterFullScaleV: 5,
  /** The warm stream's mass flow falls slightly as the heater warms the air ahead of the fan. */
  warmFlowDropSlpm: 0.8,
  pressureStartKpa: 5.8,
  pressureSteadyKpa: 7.0,
} as const;

export interface TimeConstants {
  /** Heater warm-up (s). */
  heater: number;
  /** Thermal lag of the core's mass behind its inlet difference (s). */
  core: number;
}

/**
 * Time constants scale with the run so every run, whatever its length, shows the warm-up over
 * roughly its first half and a steady plateau (within the display resolution) in its second half:
 * 18 s and 12 s for the default 180 s run, 2 and 1⅓ minutes for a 20-minute run.
 */
export function timeConstants(durationSec: number): TimeConstants {
  return { heater: durationSec / 10, core: durationSec / 15 };
}

/** Step response of a first-order lag: 0 before the step, → 1 with time constant tau. */
export function approach(t: number, tau: number): number {
  return t <= 0 ? 0 : 1 - Math.exp(-t / tau);
}

/** Response of a first-order lag (tau b) to an input that itself approaches 1 with tau a. */
export function laggedApproach(t: number, a: number, b: number): number {
  if (t <= 0) return 0;
  if (Math.abs(a - b) < 1e-9) return 1 - (1 + t / a) * Math.exp(-t / a);
  return 1 - (a * Math.exp(-t / a) - b * Math.exp(-t / b)) / (a - b);
}

/** Noise-free value of a display at test time t (s) for a run of the given length. */
export function trend(key: DisplayKey, testTime: number, durationSec: number, meterStream: Stream): number {
  const tc = timeConstants(durationSec);
  const heat = approach(testTime, tc.heater);
  const core = laggedApproach(testTime, tc.heater, tc.core);
  const p = PLANT;
  const t1 = p.ambientC + (p.warmInSteadyC - p.ambientC) * heat;
  const t3 = p.coolInC + p.coolInDriftC * approach(testTime, 2 * durationSec);
  // The core sees the lagged inlet difference; the cool stream has the smaller capacity.
  const dT = p.ambientC - p.coolInC + (p.warmInSteadyC - p.ambientC) * core;
  const warmSlpm = p.warmFlowSlpm - p.warmFlowDropSlpm * heat;
  // Heat given up by the warm stream equals heat taken by the cool one (no loss to the room).
  const capacityRatio = p.coolFlowSlpm / warmSlpm;
  switch (key) {
    case 'T1':
      return t1;
    case 'T2':
      return t1 - p.effectiveness * capacityRatio * dT;
    case 'T3':
      return t3;
    case 'T4':
      return t3 + p.effectiveness * dT;
    case 'V': {
      const slpm = meterStream === 'warm' ? warmSlpm : p.coolFlowSlpm;
      return (slpm / p.meterFullScaleSlpm) * p.meterFullScaleV;
    }
    case 'P':
      return p.pressureStartKpa + (p.pressureSteadyKpa - p.pressureStartKpa) * heat;
  }
}

/** mulberry32: small, fast, seedable 32-bit PRNG (public domain); uniform in [0, 1). */
export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Standard normal deviates from a uniform source (Box–Muller). */
export function gaussian(uniform: () => number): () => number {
  let spare: number | null = null;
  return () => {
    if (spare !== null) {
      const s = spare;
      spare = null;
      return s;
    }
    const u = 1 - uniform(); // (0, 1]: log stays finite
    const v = uniform();
    const r = Math.sqrt(-2 * Math.log(u));
    spare = r * Math.sin(2 * Math.PI * v);
    return r * Math.cos(2 * Math.PI * v);
  };
}

function decimalsOf(resolution: number): number {
  const text = String(resolution);
  const dot = text.indexOf('.');
  return dot < 0 ? 0 : text.length - dot - 1;
}

/**
 * What a display with the given resolution shows for a value: rounded to the nearest step (half
 * up), with as many decimals as the resolution has. Scaling to whole units of the last decimal
 * first avoids binary artefacts such as 0.1 steps landing on 26.049999….
 */
export function formatReading(value: number, resolution: number): string {
  if (!Number.isFinite(value)) throw new RangeError(`cannot display ${value}`);
  if (!(resolution > 0)) throw new RangeError(`resolution must be > 0, got ${resolution}`);
  const decimals = decimalsOf(resolution);
  const scale = 10 ** decimals;
  const step = Math.round(resolution * scale);
  const units = Math.round(Number((value * scale).toFixed(6)) / step) * step;
  const text = (units / scale).toFixed(decimals);
  return /^-0(\.0*)?$/.test(text) ? text.slice(1) : text;
}

/** Time of frame k in µs, as ffmpeg rescales a 1/fps timestamp to microseconds (round to nearest). */
export function frameMicros(k: number, fps: number = FPS): number {
  return Math.round((k * 1e6) / fps);
}

/** First frame whose time is at or after `micros`: the frame on which a refresh first appears. */
export function firstFrameAtOrAfter(micros: number, fps: number = FPS): number {
  let k = Math.max(0, Math.ceil((micros * fps) / 1e6) - 1);
  while (frameMicros(k, fps) < micros) k++;
  return k;
}

/** Video-time refresh instants of a display in µs: the reading already shown at 0, then every period. */
export function updateSchedule(display: DisplaySpec, durationSec: number): number[] {
  const periodMicros = Math.round(1e6 / display.updateHz);
  const endMicros = Math.round(durationSec * 1e6);
  const times = [0];
  for (let t = display.phaseMicros; t < endMicros; t += periodMicros) times.push(t);
  return times;
}

export interface TruthUpdate {
  display: DisplayKey;
  /** Seconds; the display changes on the first frame at or after this time. */
  videoTime: number;
  testTime: number;
  /** Simulated reading (trend + noise), to the microunit. */
  value: number;
  /** Exactly what the display shows from this refresh on. */
  text: string;
  /** Index of the first frame showing this refresh. */
  frame: number;
}

export interface RunTruth {
  run: number;
  scenario: string;
  fps: number;
  width: number;
  height: number;
  durationSec: number;
  frameCount: number;
  startMarkerVideoTime: number;
  startMarkerFrames: [number, number];
  meterStream: Stream;
  seed: number;
  creationTime: string;
  plant: typeof PLANT;
  timeConstants: TimeConstants;
  displays: { key: DisplayKey; label: string; unit: string; resolution: number; updateHz: number }[];
  /** Every refresh of every display, by video time then display order. */
  updates: TruthUpdate[];
}

const round6 = (x: number): number => Math.round(x * 1e6) / 1e6 + 0;

export function buildRunTruth(config: RunConfig, durationSec: number = DEFAULT_DURATION_SEC): RunTruth {
  if (!(durationSec >= 5) || !Number.isFinite(durationSec)) {
    throw new RangeError(`duration must be at least 5 s, got ${durationSec}`);
  }
  const frameCount = Math.round(durationSec * FPS);
  const updates: TruthUpdate[] = [];
  DISPLAYS.forEach((display, index) => {
    // One stream of random numbers per display, so adding a display never changes the others.
    const normal = gaussian(mulberry32((config.seed ^ Math.imul(index + 1, 0x9e3779b1)) >>> 0));
    const innovationSd = display.noiseSd * Math.sqrt(1 - display.noiseCorrelation ** 2);
    let noise = display.noiseSd * normal();
    for (const micros of updateSchedule(display, durationSec)) {
      const videoTime = micros / 1e6;
      const testTime = round6(videoTime - START_MARKER_VIDEO_TIME);
      const value = round6(trend(display.key, testTime, durationSec, config.meterStream) + noise);
      updates.push({
        display: display.key,
        videoTime,
        testTime,
        value,
        text: formatReading(value, display.resolution),
        frame: firstFrameAtOrAfter(micros),
      });
      noise = display.noiseCorrelation * noise + innovationSd * normal();
    }
  });
  const order = new Map(DISPLAYS.map((d, i) => [d.key, i]));
  updates.sort((a, b) => a.videoTime - b.videoTime || order.get(a.display)! - order.get(b.display)!);
  const markerFirst = firstFrameAtOrAfter(START_MARKER_VIDEO_TIME * 1e6);
  const markerLast = firstFrameAtOrAfter((START_MARKER_VIDEO_TIME + START_MARKER_DURATION_SEC) * 1e6) - 1;
  return {
    run: config.run,
    scenario: SCENARIO_NAME,
    fps: FPS,
    width: WIDTH,
    height: HEIGHT,
    durationSec,
    frameCount,
    startMarkerVideoTime: START_MARKER_VIDEO_TIME,
    startMarkerFrames: [markerFirst, markerLast],
    meterStream: config.meterStream,
    seed: config.seed,
    creationTime: config.creationTime,
    plant: PLANT,
    timeConstants: timeConstants(durationSec),
    displays: DISPLAYS.map(({ key, label, unit, resolution, updateHz }) => ({ key, label, unit, resolution, updateHz })),
    updates,
  };
}

/** The refresh a display shows on frame k (the last one whose first frame is ≤ k). */
export function updateShownOnFrame(updates: readonly TruthUpdate[], display: DisplayKey, k: number): TruthUpdate {
  let shown: TruthUpdate | undefined;
  for (const u of updates) {
    if (u.display !== display) continue;
    if (u.frame > k) break;
    shown = u;
  }
  if (!shown) throw new RangeError(`display ${display} has no reading on frame ${k}`);
  return shown;
}

/** Frame showing at a video time: the last frame starting at or before it. */
export function frameAtVideoTime(videoTime: number, fps: number = FPS): number {
  const micros = Math.round(videoTime * 1e6);
  let k = Math.max(0, Math.floor((micros * fps) / 1e6) + 1);
  while (k > 0 && frameMicros(k, fps) > micros) k--;
  return k;
}

/** What every display shows at a video time. */
export function readingsAt(truth: Pick<RunTruth, 'updates'>, videoTime: number): Record<DisplayKey, string> {
  const k = frameAtVideoTime(videoTime);
  const out = {} as Record<DisplayKey, string>;
  for (const d of DISPLAYS) out[d.key] = updateShownOnFrame(truth.updates, d.key, k).text;
  return out;
}
