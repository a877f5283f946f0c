// Frame lookup on a video's own presentation timestamps (seconds, ascending), as listed from the
// container at upload. Frame times are never derived from frame index × nominal fps: phones record
// variable frame rate, and even constant-rate files carry timebase rounding.

/**
 * Two times closer than this are the same instant. ffprobe prints pts_time rounded to the
 * microsecond and browsers report `currentTime` truncated to the microsecond, so a sheet row time
 * and a frame start that are equal in exact arithmetic can differ by up to about 1 µs once both
 * have been through decimal text. 2 µs absorbs that and is still under 0.1 % of the shortest frame
 * interval of any camera we expect (240 fps → 4167 µs).
 */
export const FRAME_TIME_TOLERANCE_SEC = 2e-6;

/** Timestamp jitter every container produces on constant-rate footage: MKV/WebM store whole
 * milliseconds (33/34 ms at 30 fps), QuickTime's 1/600 timescale gives 20/21 ticks at 29.97 fps. */
const TIMESTAMP_QUANTUM_TOLERANCE_SEC = 0.0011;

/** Share of the median interval an interval may deviate by before the footage counts as variable. */
const VARIABLE_RATE_RELATIVE_TOLERANCE = 0.1;

export interface FrameIntervalStats {
  /** Number of frames (one more than the number of intervals). */
  count: number;
  medianInterval: number;
  minInterval: number;
  maxInterval: number;
  /** Intervals that deviate from the median by more than the tolerance (see `variable`). */
  irregularIntervals: number;
  /**
   * True when at least one interval differs from the median by more than
   * max(10 % of the median, 1.1 ms). One deviating interval is enough: a single dropped or
   * doubled frame already shifts every later frame away from index × nominal rate, which is what
   * this flag warns about. The 1.1 ms floor keeps the timestamp quantum of millisecond
   * timebases (MKV/WebM) from marking high-rate constant footage as variable.
   */
  variable: boolean;
}

export interface FramePosition {
  /** Index of the frame in presentation order. */
  index: number;
  /** Presentation time of the frame's start (seconds). */
  pts: number;
  /** Where to seek to show this frame: the middle of the frame, never its exact start. */
  seekTime: number;
  /** True when a step was cut short by the first or last frame. */
  atEdge: boolean;
}

function assertFiniteTime(t: number, name: string): void {
  if (typeof t !== 'number' || !Number.isFinite(t)) {
    throw new RangeError(`${name} must be a finite number of seconds, got ${String(t)}`);
  }
}

/** Throws RangeError unless `times` is a non-empty, strictly ascending list of finite numbers. */
export function assertFrameTimes(times: readonly number[]): void {
  if (!Array.isArray(times) && !ArrayBuffer.isView(times)) {
    throw new RangeError('frame times must be an array of seconds');
  }
  if (times.length === 0) {
    throw new RangeError('frame times are empty: the video has no frames to show');
  }
  for (let i = 0; i < times.length; i++) {
    const t = times[i];
    if (typeof t !== 'number' || !Number.isFinite(t)) {
      throw new RangeError(`frame time at index ${i} is not a finite number (${String(t)})`);
    }
    if (i > 0 && !(t > times[i - 1])) {
      throw new RangeError(
        `frame times must be strictly ascending: times[${i}] = ${t} follows times[${i - 1}] = ${times[i - 1]}`,
      );
    }
  }
}

function median(sorted: Float64Array): number {
  const n = sorted.length;
  const mid = n >> 1;
  return n % 2 === 1 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2;
}

/** Largest k with times[k] ≤ t (within FRAME_TIME_TOLERANCE_SEC); -1 when t is before the first frame. */
export function frameIndexAt(times: readonly number[], t: number): number {
  assertFrameTimes(times);
  assertFiniteTime(t, 'time');
  const target = t + FRAME_TIME_TOLERANCE_SEC;
  let lo = 0;
  let hi = times.length - 1;
  if (times[0] > target) return -1;
  // Invariant: times[lo] ≤ target; answer lies in [lo, hi].
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (times[mid] <= target) lo = mid;
    else hi = mid - 1;
  }
  return lo;
}

/**
 * Middle of frame k: (pts_k + pts_k+1) / 2. The last frame has no successor, so it lasts half the
 * median interval past its start; a single-frame video needs `fallbackDuration` (one frame's
 * duration, e.g. 1 / nominal fps) instead.
 */
export function frameMidTime(times: readonly number[], k: number, fallbackDuration?: number): number {
  assertFrameTimes(times);
  if (!Number.isInteger(k) || k < 0 || k >= times.length) {
    throw new RangeError(`frame index ${k} is outside 0..${times.length - 1}`);
  }
  if (k < times.length - 1) return (times[k] + times[k + 1]) / 2;
  if (times.length >= 2) return times[k] + frameIntervalStats(times).medianInterval / 2;
  if (fallbackDuration === undefined || !Number.isFinite(fallbackDuration) || fallbackDuration <= 0) {
    throw new RangeError(
      'a single-frame video needs a positive fallback frame duration to find the middle of its frame',
    );
  }
  return times[k] + fallbackDuration / 2;
}

/**
 * Where to seek so the frame showing at `t` is displayed. Seeking to a frame's exact start shows
 * the previous frame about half the time in Chromium (the double lands a hair below the container's
 * rational time), so this always returns the middle of the frame. Before the first frame the player
 * shows frame 0, so that is the frame returned.
 */
export function seekTimeFor(times: readonly number[], t: number, fallbackDuration?: number): number {
  const k = frameIndexAt(times, t);
  return frameMidTime(times, Math.max(k, 0), fallbackDuration);
}

/**
 * The frame `steps` frames after (positive) or before (negative) the frame showing at `t`,
 * clamped to the first and last frame.
 */
export function stepFrame(
  times: readonly number[],
  t: number,
  steps: number,
  fallbackDuration?: number,
): FramePosition {
  if (!Number.isInteger(steps) || steps === 0) {
    throw new RangeError(`step must be a non-zero whole number of frames (e.g. 1 or -1), got ${String(steps)}`);
  }
  const current = frameIndexAt(times, t);
  // Before the first frame, one step forward lands on frame 0.
  const wanted = current === -1 && steps > 0 ? steps - 1 : current + steps;
  const index = Math.min(Math.max(wanted, 0), times.length - 1);
  return {
    index,
    pts: times[index],
    seekTime: frameMidTime(times, index, fallbackDuration),
    atEdge: index !== wanted,
  };
}

/** Interval statistics of a frame-time list; needs at least two frames. */
export function frameIntervalStats(times: readonly number[]): FrameIntervalStats {
  assertFrameTimes(times);
  if (times.length < 2) {
    throw new RangeError('frame interval statistics need at least two frames');
  }
  const intervals = new Float64Array(times.length - 1);
  for (let i = 1; i < times.length; i++) intervals[i - 1] = times[i] - times[i - 1];
  const sorted = intervals.slice().sort();
  const med = median(sorted);
  const tolerance = Math.max(VARIABLE_RATE_RELATIVE_TOLERANCE * med, TIMESTAMP_QUANTUM_TOLERANCE_SEC);
  let irregular = 0;
  for (let i = 0; i < intervals.length; i++) {
    if (Math.abs(intervals[i] - med) > tolerance) irregular++;
  }
  return {
    count: times.length,
    medianInterval: med,
    minInterval: sorted[0],
    maxInterval: sorted[sorted.length - 1],
    irregularIntervals: irregular,
    variable: irregular > 0,
  };
}
