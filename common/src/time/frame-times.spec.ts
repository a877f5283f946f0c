import { describe, expect, it } from 'vitest';
import {
  FRAME_TIME_TOLERANCE_SEC,
  frameIndexAt,
  frameIntervalStats,
  frameMidTime,
  seekTimeFor,
  stepFrame,
} from './frame-times';

/** Frame times as ffprobe prints them: pts_time rounded to the microsecond. */
function printed(t: number): number {
  return Number(t.toFixed(6));
}

/** n frames at a constant rate, as exact quotients k / fps. */
function cfr(n: number, fps: number, start = 0): number[] {
  return Array.from({ length: n }, (_, k) => start + k / fps);
}

/** 30 fps for 1 s, 15 fps for 1 s, 30 fps for 1 s: the same pattern a phone writes when light drops. */
function vfr(): number[] {
  const times: number[] = [];
  for (let k = 0; k < 30; k++) times.push(printed(k / 30));
  for (let k = 0; k < 15; k++) times.push(printed(1 + k / 15));
  for (let k = 0; k < 30; k++) times.push(printed(2 + k / 30));
  return times;
}

describe('frameIndexAt', () => {
  const times = cfr(90, 30).map(printed);

  it('returns the largest k with pts_k ≤ t and -1 before the first frame', () => {
    expect(frameIndexAt(times, -0.001)).toBe(-1);
    expect(frameIndexAt(times, 0)).toBe(0);
    expect(frameIndexAt(times, 0.02)).toBe(0);
    expect(frameIndexAt(times, 0.04)).toBe(1);
    expect(frameIndexAt(times, 2.99)).toBe(89);
    expect(frameIndexAt(times, 1000)).toBe(89);
  });

  it('puts every exact k/30 boundary on frame k, whether the list holds exact quotients or printed microseconds', () => {
    const exact = cfr(300, 30);
    const micro = exact.map(printed);
    for (let k = 0; k < 300; k++) {
      // k/30 as a double can sit a hair below or above the container's rational time; ffprobe's
      // six-decimal pts_time rounds 2/30 up to 0.066667, above the double 2/30.
      expect(frameIndexAt(exact, k / 30)).toBe(k);
      expect(frameIndexAt(micro, k / 30)).toBe(k);
      expect(frameIndexAt(micro, (k + 1) / 30 - 1e-4)).toBe(k);
    }
    expect(micro[2]).toBeGreaterThan(2 / 30);
  });

  it('uses the tolerance only at the microsecond scale', () => {
    const t = [0, 0.5, 1];
    expect(frameIndexAt(t, 0.5 - FRAME_TIME_TOLERANCE_SEC / 2)).toBe(1);
    expect(frameIndexAt(t, 0.5 - 10 * FRAME_TIME_TOLERANCE_SEC)).toBe(0);
  });

  it('finds frames on variable-rate footage from the timestamps, not from index × rate', () => {
    const times = vfr();
    expect(times).toHaveLength(75);
    // 1.1 s lies in the 15 fps stretch: frame 30 starts at 1.0, frame 31 at 1.0667, frame 32 at 1.1333.
    expect(frameIndexAt(times, 1.1)).toBe(31);
    // Index × nominal rate would say frame 33; the timestamps say 31.
    expect(Math.floor(1.1 * 30)).toBe(33);
    expect(frameIndexAt(times, 2.0)).toBe(45);
    expect(frameIndexAt(times, 2 + 10 / 30)).toBe(55);
  });

  it('rejects empty, unsorted, duplicated and non-numeric input with a RangeError', () => {
    expect(() => frameIndexAt([], 0)).toThrow(RangeError);
    expect(() => frameIndexAt([], 0)).toThrow(/empty/);
    expect(() => frameIndexAt([0, 0.2, 0.1], 0)).toThrow(/strictly ascending: times\[2\] = 0.1 follows times\[1\] = 0.2/);
    expect(() => frameIndexAt([0, 0.1, 0.1], 0)).toThrow(RangeError);
    expect(() => frameIndexAt([0, Number.NaN], 0)).toThrow(/index 1 is not a finite number/);
    expect(() => frameIndexAt([0, 1], Number.POSITIVE_INFINITY)).toThrow(/time must be a finite number/);
  });
});

describe('frameMidTime', () => {
  it('is the middle between this frame and the next', () => {
    const times = cfr(30, 30).map(printed);
    expect(frameMidTime(times, 0)).toBeCloseTo(1 / 60, 6);
    expect(frameMidTime(times, 10)).toBeCloseTo(10.5 / 30, 6);
  });

  it('adds half the median interval for the last frame, even on variable-rate footage', () => {
    const times = vfr();
    const last = times.length - 1;
    expect(frameMidTime(times, last)).toBeCloseTo(times[last] + 1 / 60, 6);
    // In the 15 fps stretch the middle is a full 1/30 s after the frame's start.
    expect(frameMidTime(times, 31)).toBeCloseTo(times[31] + 1 / 30, 6);
  });

  it('needs a fallback duration for a single-frame video and rejects bad indexes', () => {
    expect(frameMidTime([5], 0, 0.04)).toBeCloseTo(5.02, 12);
    expect(() => frameMidTime([5], 0)).toThrow(/fallback frame duration/);
    expect(() => frameMidTime([5], 0, 0)).toThrow(RangeError);
    expect(() => frameMidTime([0, 1], 2)).toThrow(/outside 0..1/);
    expect(() => frameMidTime([0, 1], 0.5)).toThrow(RangeError);
    expect(() => frameMidTime([], 0)).toThrow(/empty/);
  });
});

describe('seekTimeFor', () => {
  it('never returns a frame start: every k/30 boundary seeks to the middle of frame k', () => {
    const times = cfr(300, 30).map(printed);
    for (let k = 0; k < 299; k++) {
      const s = seekTimeFor(times, k / 30);
      expect(s).toBeCloseTo((k + 0.5) / 30, 6);
      expect(s - times[k]).toBeGreaterThan(0.016);
      expect(times[k + 1] - s).toBeGreaterThan(0.016);
      expect(frameIndexAt(times, s)).toBe(k);
    }
  });

  it('maps a time inside a long variable-rate frame to that frame’s middle', () => {
    const times = vfr();
    expect(seekTimeFor(times, 1.1)).toBeCloseTo(1.1, 4);
    expect(seekTimeFor(times, 1.07)).toBeCloseTo(1.1, 4);
  });

  it('shows the first frame for a time before it', () => {
    const times = [0.5, 0.6, 0.7];
    expect(seekTimeFor(times, 0)).toBeCloseTo(0.55, 12);
  });
});

describe('stepFrame', () => {
  const times = vfr();

  it('steps one frame forward and back across a rate change', () => {
    // Frame 29 is the last 30 fps frame before the 15 fps stretch.
    const next = stepFrame(times, times[29] + 0.001, 1);
    expect(next.index).toBe(30);
    expect(next.pts).toBe(1);
    expect(next.seekTime).toBeCloseTo(1 + 1 / 30, 6);
    expect(next.atEdge).toBe(false);
    const back = stepFrame(times, next.seekTime, -1);
    expect(back.index).toBe(29);
    expect(back.seekTime).toBeCloseTo((times[29] + 1) / 2, 6);
  });

  it('walks every frame exactly once when stepping from each seek time', () => {
    let pos = stepFrame(times, -1, 1);
    expect(pos.index).toBe(0);
    const seen = [pos.index];
    while (!pos.atEdge) {
      pos = stepFrame(times, pos.seekTime, 1);
      if (!pos.atEdge) seen.push(pos.index);
    }
    expect(seen).toEqual(Array.from({ length: times.length }, (_, i) => i));
  });

  it('clamps at both ends and accepts multi-frame jumps', () => {
    expect(stepFrame(times, 0, -1)).toMatchObject({ index: 0, atEdge: true });
    expect(stepFrame(times, 10, 1)).toMatchObject({ index: 74, atEdge: true });
    expect(stepFrame(times, 0, 10)).toMatchObject({ index: 10, atEdge: false });
  });

  it('rejects a zero or fractional step', () => {
    expect(() => stepFrame(times, 0, 0)).toThrow(/non-zero whole number/);
    expect(() => stepFrame(times, 0, 0.5)).toThrow(RangeError);
  });
});

describe('frameIntervalStats', () => {
  it('reports constant 30 fps as not variable, despite microsecond rounding', () => {
    const s = frameIntervalStats(cfr(300, 30).map(printed));
    expect(s.count).toBe(300);
    expect(s.medianInterval).toBeCloseTo(1 / 30, 6);
    expect(s.minInterval).toBeCloseTo(1 / 30, 5);
    expect(s.maxInterval).toBeCloseTo(1 / 30, 5);
    expect(s.irregularIntervals).toBe(0);
    expect(s.variable).toBe(false);
  });

  it('flags the 15 fps stretch as variable and counts its intervals', () => {
    const s = frameIntervalStats(vfr());
    expect(s.count).toBe(75);
    expect(s.medianInterval).toBeCloseTo(1 / 30, 6);
    expect(s.maxInterval).toBeCloseTo(1 / 15, 6);
    // 15 intervals of 1/15 s: 14 inside the stretch plus the one leaving it.
    expect(s.irregularIntervals).toBe(15);
    expect(s.variable).toBe(true);
  });

  it('treats the millisecond quantum of WebM timestamps as constant rate, even at 120 fps', () => {
    const webm30 = Array.from({ length: 300 }, (_, k) => Math.round((k * 1000) / 30) / 1000);
    expect(frameIntervalStats(webm30).variable).toBe(false);
    const webm120 = Array.from({ length: 600 }, (_, k) => Math.round((k * 1000) / 120) / 1000);
    const s = frameIntervalStats(webm120);
    expect(s.minInterval).toBeCloseTo(0.008, 9);
    expect(s.maxInterval).toBeCloseTo(0.009, 9);
    expect(s.variable).toBe(false);
  });

  it('flags a single dropped frame, which shifts every later frame', () => {
    const times = cfr(60, 30).map(printed);
    times.splice(20, 1);
    const s = frameIntervalStats(times);
    expect(s.irregularIntervals).toBe(1);
    expect(s.variable).toBe(true);
  });

  it('needs at least two sorted frames', () => {
    expect(() => frameIntervalStats([1])).toThrow(/at least two frames/);
    expect(() => frameIntervalStats([])).toThrow(RangeError);
    expect(() => frameIntervalStats([1, 0])).toThrow(/strictly ascending/);
  });
});
