// Test time from video time. A sync mark pairs a frame's video time with the test-clock time it
// shows (a start lamp, a stopwatch, a clap). One mark fixes the offset; a second, later mark also
// corrects a camera clock that runs a little fast or slow over a long run.

export interface SyncMark {
  /** Seconds on the video's own timeline (frame presentation time). */
  videoTime: number;
  /** Seconds on the test clock at that frame. */
  testTime: number;
}

export interface SyncMarks {
  first: SyncMark;
  second?: SyncMark;
}

export interface SyncDescription {
  /** Video time minus test time at the first mark (seconds): test = video − offset there. */
  offset: number;
  /** Test seconds per video second (1 with a single mark). */
  scale: number;
  /**
   * How much faster the camera clock runs than the test clock, in parts per million:
   * (Δvideo / Δtest − 1) · 10⁶. Positive: the video gains time. 0 with a single mark.
   */
  driftPpm: number;
  marks: 1 | 2;
  /** One line for people, e.g. "offset 2.000 s, drift +35 ppm (video clock fast)". */
  summary: string;
}

/**
 * Test seconds per video second allowed between two marks. Camera and lab clocks disagree by tens of
 * ppm; anything beyond ±10 % means a mark was placed on the wrong frame or typed wrongly.
 */
export const MIN_SYNC_SCALE = 0.9;
export const MAX_SYNC_SCALE = 1.1;

/** Sheets longer than this are a typing mistake (e.g. a 0.01 s interval over an hour). */
export const MAX_SHEET_ROWS = 100_000;

function assertFinite(value: number, name: string): void {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new RangeError(`${name} must be a finite number of seconds, got ${String(value)}`);
  }
}

function assertMark(mark: SyncMark | undefined, name: string): asserts mark is SyncMark {
  if (!mark || typeof mark !== 'object') throw new RangeError(`${name} sync mark is missing`);
  assertFinite(mark.videoTime, `${name} sync mark videoTime`);
  assertFinite(mark.testTime, `${name} sync mark testTime`);
}

/** Test seconds per video second; validates the marks. */
function syncScale(marks: SyncMarks): number {
  assertMark(marks?.first, 'first');
  if (marks.second === undefined) return 1;
  assertMark(marks.second, 'second');
  const dv = marks.second.videoTime - marks.first.videoTime;
  const dt = marks.second.testTime - marks.first.testTime;
  if (!(dv > 0)) {
    throw new RangeError(
      `the second sync mark must be later in the video than the first (video ${marks.second.videoTime} s is not after ${marks.first.videoTime} s)`,
    );
  }
  const scale = dt / dv;
  if (!(scale >= MIN_SYNC_SCALE && scale <= MAX_SYNC_SCALE)) {
    throw new RangeError(
      `the two sync marks give ${scale.toPrecision(4)} test seconds per video second (allowed ${MIN_SYNC_SCALE}–${MAX_SYNC_SCALE}); check that both marks sit on the right frames and times`,
    );
  }
  return scale;
}

/** Throws RangeError with a clear message unless the marks are usable. */
export function validateSyncMarks(marks: SyncMarks): void {
  syncScale(marks);
}

/** Test time shown at a given video time. */
export function toTestTime(marks: SyncMarks, videoTime: number): number {
  const scale = syncScale(marks);
  assertFinite(videoTime, 'video time');
  return marks.first.testTime + (videoTime - marks.first.videoTime) * scale;
}

/** Video time at which the test clock shows `testTime`. */
export function toVideoTime(marks: SyncMarks, testTime: number): number {
  const scale = syncScale(marks);
  assertFinite(testTime, 'test time');
  return marks.first.videoTime + (testTime - marks.first.testTime) / scale;
}

export function describeSync(marks: SyncMarks): SyncDescription {
  const scale = syncScale(marks);
  const offset = marks.first.videoTime - marks.first.testTime;
  const driftPpm = marks.second ? (1 / scale - 1) * 1e6 : 0;
  const parts = [`offset ${offset.toFixed(3)} s`];
  if (marks.second) {
    const ppm = Math.round(driftPpm);
    const sign = ppm > 0 ? '+' : '';
    const clock = ppm > 0 ? ' (video clock fast)' : ppm < 0 ? ' (video clock slow)' : '';
    parts.push(`drift ${sign}${ppm} ppm${clock}`);
  } else {
    parts.push('no drift correction (one mark)');
  }
  return { offset, scale, driftPpm, marks: marks.second ? 2 : 1, summary: parts.join(', ') };
}

/**
 * Test times of a sheet's rows: start, start + interval, … up to end inclusive. Each row is
 * computed as start + i·interval (one multiplication, no running sum) and rounded to the
 * microsecond, so row 3 of a 0.1 s sheet is exactly 0.3, not 0.30000000000000004.
 */
export function sheetRowTimes(start: number, end: number, interval: number): number[] {
  assertFinite(start, 'sheet start');
  assertFinite(end, 'sheet end');
  assertFinite(interval, 'sheet interval');
  if (!(interval > 0)) throw new RangeError(`sheet interval must be greater than 0 s, got ${interval}`);
  // Rows are kept to the microsecond; a shorter interval would give duplicate rows.
  if (interval < 1e-6) throw new RangeError(`sheet interval must be at least 1 µs, got ${interval} s`);
  if (end < start) throw new RangeError(`sheet end (${end} s) is before its start (${start} s)`);
  const toMicro = (t: number): number => Math.round(t * 1e6);
  const rowMicro = (i: number): number => toMicro(start + i * interval);
  const endMicro = toMicro(end);
  let count = Math.floor((end - start) / interval) + 1;
  const tooMany = (n: number): RangeError =>
    new RangeError(
      `a sheet from ${start} s to ${end} s every ${interval} s would have ${n} rows (at most ${MAX_SHEET_ROWS}); use a longer interval`,
    );
  if (count > MAX_SHEET_ROWS + 1) throw tooMany(count);
  // The division can land one below or above a whole number; settle it on the rounded times.
  while (count > 1 && rowMicro(count - 1) > endMicro) count--;
  while (rowMicro(count) <= endMicro) count++;
  if (count > MAX_SHEET_ROWS) throw tooMany(count);
  const rows = new Array<number>(count);
  // + 0 turns a rounded -0 into 0.
  for (let i = 0; i < count; i++) rows[i] = rowMicro(i) / 1e6 + 0;
  return rows;
}
