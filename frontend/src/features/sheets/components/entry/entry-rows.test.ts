import { describe, expect, it } from 'vitest';
import type { Reading, SheetRow } from '@dialsheet/common';
import type { QueueRowView } from '../../stores/save-queue';
import { buildStoredReadings, cellsForRow, incompleteRows, resumeRow, rowBody, rowFrameIndices, rowState, sameAsStored } from './entry-rows';

const A = 'c-a';
const B = 'c-b';

function reading(rowIndex: number, channelId: string, rawText: string, version = 1, frameTime: number | null = 1): Reading {
  return {
    sheetId: 's',
    rowIndex,
    channelId,
    pass: 1,
    rawText,
    value: null,
    flag: null,
    frameTime,
    enteredBy: 'u',
    version,
    updatedAt: '2026-03-02T09:15:00.000Z',
    warnings: [],
  };
}

const queued = (rowIndex: number, status: QueueRowView['status'], texts: Record<string, string>): QueueRowView => ({
  rowIndex,
  status,
  readings: Object.entries(texts).map(([channelId, rawText]) => ({ channelId, rawText, frameTime: 2.5, baseVersion: null })),
  error: null,
  conflict: null,
});

describe('entry rows', () => {
  it('finds each row’s frame from its test time through the sync marks and the stored frame times', () => {
    // 15 fps for 1 s then 30 fps: index × nominal rate would be wrong after the first second.
    const times = [...Array.from({ length: 15 }, (_, k) => k / 15), ...Array.from({ length: 30 }, (_, k) => 1 + k / 30)];
    const rows: SheetRow[] = [-0.5, 0, 0.5, 1, 1.5].map((testTime, index) => ({ index, testTime }));
    // Test time 0 is video time 0.5 s; the clock drifts by nothing.
    const frames = rowFrameIndices(rows, { first: { videoTime: 0.5, testTime: 0 } }, times);
    // −0.5 → video 0 (frame 0); 0 → 0.5 s (frame 7 at 7/15 = 0.467); 0.5 → 1.0 (frame 15);
    // 1 → 1.5 (frame 30); 1.5 → 2.0, past the last frame (1.967): held at the last.
    expect([...frames]).toEqual([0, 7, 15, 30, 44]);
  });

  it('resumes at the first row missing an entry, counting rows waiting to be sent', () => {
    const stored = buildStoredReadings([reading(0, A, '1'), reading(0, B, '2'), reading(1, A, '3')]);
    const waiting = new Map([[1, queued(1, 'pending', { [A]: 'x', [B]: '4' })]]);
    expect(resumeRow(4, [A, B], stored, new Map())).toBe(1);
    expect(resumeRow(4, [A, B], stored, waiting)).toBe(2);
    expect(incompleteRows(4, [A, B], stored, waiting)).toEqual([2, 3]);
    // A row the server refused is not an entry yet.
    expect(resumeRow(4, [A, B], stored, new Map([[1, queued(1, 'failed', { [B]: '4' })]]))).toBe(1);
    expect(resumeRow(1, [A, B], stored, new Map())).toBe(0);
  });

  it('names each row’s state, the queue’s first', () => {
    const stored = buildStoredReadings([reading(0, A, '1'), reading(0, B, '2'), reading(1, A, '3')]);
    expect(rowState([A, B], stored.get(0), undefined, false)).toBe('saved');
    expect(rowState([A, B], stored.get(1), undefined, false)).toBe('partial');
    expect(rowState([A, B], undefined, undefined, false)).toBe('empty');
    expect(rowState([A, B], undefined, undefined, true)).toBe('draft');
    expect(rowState([A, B], stored.get(0), queued(0, 'conflict', { [A]: '9' }), true)).toBe('conflict');
  });

  it('shows waiting text over stored text, and saves every cell with the version it replaces', () => {
    const stored = buildStoredReadings([reading(3, A, '20.0', 4, 1.2), reading(3, B, '0.5', 2, 1.2)]);
    const cells = cellsForRow([A, B], stored.get(3), queued(3, 'pending', { [B]: '0.55' }));
    expect(cells).toEqual({ texts: ['20.0', '0.55'], frames: [1.2, 2.5] });

    const body = rowBody([A, B], { texts: ['20.0', '0.56'], frames: [1.2, null] }, stored.get(3), 3.1);
    expect(body).toEqual([
      { channelId: A, rawText: '20.0', frameTime: 1.2, baseVersion: 4 },
      { channelId: B, rawText: '0.56', frameTime: 3.1, baseVersion: 2 },
    ]);
    expect(sameAsStored(body, stored.get(3))).toBe(false);
    expect(sameAsStored(rowBody([A, B], { texts: ['20.0', '0.5'], frames: [1.2, 1.2] }, stored.get(3), 9), stored.get(3))).toBe(true);
    expect(rowBody([A], { texts: [''], frames: [null] }, undefined, null)).toEqual([{ channelId: A, rawText: '', frameTime: null, baseVersion: null }]);
  });
});
