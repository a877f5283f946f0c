import { MAX_SHEET_ROWS } from '@dialsheet/common';
import { describe, expect, it } from 'vitest';
import { runLimitProblem, sheetProblems, sheetRowCount, sheetRows } from './sheet-rules';

const A = '5a0c4c8e-1f7e-4b2a-9d55-0e3f2b1a7c01';
const B = '5a0c4c8e-1f7e-4b2a-9d55-0e3f2b1a7c02';
const sound = { startTime: 0, endTime: 60, interval: 2, channelIds: [A, B] };

describe('sheetProblems', () => {
  it('accepts a sound plan', () => {
    expect(sheetProblems(sound)).toEqual([]);
  });

  it('names the field of each broken rule', () => {
    expect(sheetProblems({ ...sound, startTime: -1 })).toEqual(['startTime must be 0 s or later, got -1']);
    expect(sheetProblems({ ...sound, endTime: 0 })).toEqual(['endTime (0 s) must be after startTime (0 s)']);
    expect(sheetProblems({ ...sound, startTime: 60 })).toEqual(['endTime (60 s) must be after startTime (60 s)']);
    expect(sheetProblems({ ...sound, interval: 0.05 })).toEqual(['interval must be at least 0.1 s, got 0.05']);
    expect(sheetProblems({ ...sound, interval: 0 })).toEqual(['interval must be at least 0.1 s, got 0']);
    expect(sheetProblems({ ...sound, channelIds: [] })).toEqual(['channelIds must list at least one channel']);
    expect(sheetProblems({ ...sound, channelIds: [A, B, A] })).toEqual(['channelIds.2: the channel is already listed']);
  });

  it('refuses more rows than a sheet may have, with the count, through the common row rule', () => {
    const problems = sheetProblems({ ...sound, endTime: 100_000, interval: 0.1 });
    expect(problems).toHaveLength(1);
    expect(problems[0]).toMatch(/^interval: a sheet from 0 s to 100000 s every 0\.1 s would have 1000001 rows \(at most 100000\)/);
  });

  it('allows exactly the maximum number of rows', () => {
    expect(sheetProblems({ ...sound, endTime: (MAX_SHEET_ROWS - 1) * 0.5, interval: 0.5 })).toEqual([]);
    expect(sheetProblems({ ...sound, endTime: MAX_SHEET_ROWS * 0.5, interval: 0.5 })).toHaveLength(1);
  });

  it('reports every problem at once', () => {
    expect(sheetProblems({ startTime: -5, endTime: -10, interval: 0.01, channelIds: [] })).toEqual([
      'startTime must be 0 s or later, got -5',
      'endTime (-10 s) must be after startTime (-5 s)',
      'interval must be at least 0.1 s, got 0.01',
      'channelIds must list at least one channel',
    ]);
  });
});

describe('sheetRows', () => {
  it('gives 31 rows at exact times for 0–60 s every 2 s', () => {
    const rows = sheetRows(0, 60, 2);
    expect(rows).toHaveLength(31);
    expect(rows[0]).toEqual({ index: 0, testTime: 0 });
    expect(rows[30]).toEqual({ index: 30, testTime: 60 });
    expect(rows.map((r) => r.testTime)).toEqual(Array.from({ length: 31 }, (_, i) => 2 * i));
  });

  it('keeps decimal intervals exact and stops on or before the end', () => {
    expect(sheetRows(1, 1.35, 0.1).map((r) => r.testTime)).toEqual([1, 1.1, 1.2, 1.3]);
    expect(sheetRowCount(0, 59.9, 3)).toBe(20);
  });
});

describe('runLimitProblem', () => {
  const sync = { first: { videoTime: 2, testTime: 0 } };

  it('asks for the sync marks first', () => {
    expect(runLimitProblem(null, 120, 10)).toBe("Set the run's time sync before making a sheet: sheet times are test times");
  });

  it('converts the recording length to test time and names the limit', () => {
    // 62 s of video with the start lamp at 2 s ends at test time 60 s.
    expect(runLimitProblem(sync, 62, 60)).toBeNull();
    expect(runLimitProblem(sync, 62, 60.5)).toBe('endTime must be at most 60 s: the recording ends there in test time, got 60.5 s');
  });

  it('uses the drift correction of a second mark', () => {
    const drifting = { first: { videoTime: 0, testTime: 0 }, second: { videoTime: 100, testTime: 101 } };
    expect(runLimitProblem(drifting, 100, 101)).toBeNull();
    expect(runLimitProblem(drifting, 100, 101.01)).toMatch(/^endTime must be at most 101 s/);
  });
});
