import { describe, expect, it } from 'vitest';
import { MAX_SHEET_ROWS, describeSync, sheetRowTimes, toTestTime, toVideoTime, validateSyncMarks } from './sync';

describe('one sync mark', () => {
  // The start lamp lights in the frame at video 2.0 s; that is test time 0.
  const marks = { first: { videoTime: 2, testTime: 0 } };

  it('subtracts the offset in both directions', () => {
    expect(toTestTime(marks, 2)).toBe(0);
    expect(toTestTime(marks, 62.5)).toBe(60.5);
    expect(toTestTime(marks, 1)).toBe(-1);
    expect(toVideoTime(marks, 60.5)).toBe(62.5);
  });

  it('describes the offset and no drift', () => {
    const d = describeSync(marks);
    expect(d).toMatchObject({ offset: 2, scale: 1, driftPpm: 0, marks: 1 });
    expect(d.summary).toBe('offset 2.000 s, no drift correction (one mark)');
  });

  it('handles a mark whose test time is not zero', () => {
    const m = { first: { videoTime: 10, testTime: 300 } };
    expect(toTestTime(m, 15)).toBe(305);
    expect(toVideoTime(m, 300)).toBe(10);
    expect(describeSync(m).offset).toBe(-290);
  });
});

describe('two sync marks (clock drift)', () => {
  // A camera clock running 50 ppm fast: after 3600 test seconds the video has advanced 3600.18 s.
  const marks = {
    first: { videoTime: 2, testTime: 0 },
    second: { videoTime: 2 + 3600 * (1 + 50e-6), testTime: 3600 },
  };

  it('applies the linear correction test = t1 + (video − v1)·(t2 − t1)/(v2 − v1)', () => {
    expect(toTestTime(marks, 2)).toBeCloseTo(0, 12);
    expect(toTestTime(marks, marks.second.videoTime)).toBeCloseTo(3600, 9);
    const v = 2 + 1800 * (1 + 50e-6);
    expect(toTestTime(marks, v)).toBeCloseTo(1800, 9);
    // Without the correction the halfway point would be 0.09 s off.
    expect(v - 2 - 1800).toBeCloseTo(0.09, 9);
  });

  it('round-trips between test and video time', () => {
    for (const t of [-5, 0, 0.1, 123.456, 3599.9, 7200]) {
      expect(toTestTime(marks, toVideoTime(marks, t))).toBeCloseTo(t, 9);
    }
  });

  it('reports the drift in ppm with its sign', () => {
    const d = describeSync(marks);
    expect(d.marks).toBe(2);
    expect(d.offset).toBe(2);
    expect(d.driftPpm).toBeCloseTo(50, 6);
    expect(d.summary).toBe('offset 2.000 s, drift +50 ppm (video clock fast)');
    const slow = describeSync({
      first: { videoTime: 0, testTime: 0 },
      second: { videoTime: 1000 * (1 - 20e-6), testTime: 1000 },
    });
    expect(slow.driftPpm).toBeCloseTo(-20, 6);
    expect(slow.summary).toContain('drift -20 ppm (video clock slow)');
  });

  it('refuses a second mark that is not later in the video', () => {
    const bad = { first: { videoTime: 10, testTime: 8 }, second: { videoTime: 10, testTime: 20 } };
    expect(() => toTestTime(bad, 12)).toThrow(/second sync mark must be later/);
    const earlier = { first: { videoTime: 10, testTime: 8 }, second: { videoTime: 5, testTime: 3 } };
    expect(() => validateSyncMarks(earlier)).toThrow(RangeError);
  });

  it('refuses marks implying more than 10 % rate difference', () => {
    const typo = { first: { videoTime: 2, testTime: 0 }, second: { videoTime: 602, testTime: 6000 } };
    expect(() => toVideoTime(typo, 1)).toThrow(/10.00 test seconds per video second \(allowed 0.9–1.1\)/);
    const backwards = { first: { videoTime: 2, testTime: 0 }, second: { videoTime: 12, testTime: -10 } };
    expect(() => describeSync(backwards)).toThrow(RangeError);
    const edge = { first: { videoTime: 0, testTime: 0 }, second: { videoTime: 100, testTime: 110 } };
    expect(describeSync(edge).scale).toBeCloseTo(1.1, 12);
  });

  it('refuses missing or non-finite numbers with the field named', () => {
    expect(() => toTestTime({ first: { videoTime: Number.NaN, testTime: 0 } }, 1)).toThrow(
      /first sync mark videoTime must be a finite number/,
    );
    expect(() => toTestTime({ first: { videoTime: 0, testTime: 0 } }, Number.POSITIVE_INFINITY)).toThrow(
      /video time must be a finite number/,
    );
    expect(() => validateSyncMarks({} as never)).toThrow(/first sync mark is missing/);
  });
});

describe('sheetRowTimes', () => {
  it('lists rows without float drift', () => {
    const rows = sheetRowTimes(0, 1, 0.1);
    expect(rows).toEqual([0, 0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9, 1]);
    // A running sum would give 0.30000000000000004 and miss the end row.
    let sum = 0;
    for (let i = 0; i < 3; i++) sum += 0.1;
    expect(sum).not.toBe(0.3);
  });

  it('keeps long sheets exact to the microsecond', () => {
    const rows = sheetRowTimes(0, 3600, 0.2);
    expect(rows).toHaveLength(18001);
    expect(rows[17999]).toBe(3599.8);
    expect(rows[18000]).toBe(3600);
    const thirds = sheetRowTimes(10, 20, 1 / 3);
    expect(thirds).toHaveLength(31);
    expect(thirds[1]).toBe(10.333333);
    expect(thirds[30]).toBe(20);
  });

  it('includes the end only when a row lands on it and handles negative starts', () => {
    expect(sheetRowTimes(0, 10, 3)).toEqual([0, 3, 6, 9]);
    expect(sheetRowTimes(5, 5, 1)).toEqual([5]);
    expect(sheetRowTimes(-1, 1, 0.5)).toEqual([-1, -0.5, 0, 0.5, 1]);
    expect(Object.is(sheetRowTimes(-0.5, 0, 0.5)[1], 0)).toBe(true);
  });

  it('refuses a non-positive interval, an end before the start and too many rows', () => {
    expect(() => sheetRowTimes(0, 10, 0)).toThrow(/interval must be greater than 0/);
    expect(() => sheetRowTimes(0, 10, -1)).toThrow(RangeError);
    expect(() => sheetRowTimes(0, 10, 1e-7)).toThrow(/at least 1 µs/);
    expect(() => sheetRowTimes(10, 0, 1)).toThrow(/end \(0 s\) is before its start \(10 s\)/);
    expect(() => sheetRowTimes(0, 100_000, 1)).toThrow(/100001 rows \(at most 100000\)/);
    expect(sheetRowTimes(0, MAX_SHEET_ROWS - 1, 1)).toHaveLength(MAX_SHEET_ROWS);
    expect(() => sheetRowTimes(0, Number.NaN, 1)).toThrow(/sheet end must be a finite number/);
  });
});
