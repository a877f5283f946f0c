import type { Reading, ReadingPass, Resolution } from '@dialsheet/common';
import { parseReading } from '@dialsheet/common';
import { describe, expect, it } from 'vitest';
import { computeMismatches, sameEntry } from './mismatches';

const READER = 'u-reader';
const CHECKER = 'u-checker';

function reading(pass: ReadingPass, rowIndex: number, channelId: string, rawText: string): Reading {
  const parsed = parseReading(rawText);
  return {
    sheetId: 's1',
    rowIndex,
    channelId,
    pass,
    rawText,
    value: parsed.kind === 'number' ? parsed.value : null,
    flag: parsed.kind === 'flag' ? parsed.flag : null,
    frameTime: null,
    enteredBy: pass === 1 ? READER : CHECKER,
    version: 1,
    updatedAt: '2026-12-02T08:00:00.000Z',
    warnings: [],
  };
}

function resolution(rowIndex: number, channelId: string, rawText: string): Resolution {
  const parsed = parseReading(rawText);
  return {
    sheetId: 's1',
    rowIndex,
    channelId,
    rawText,
    value: parsed.kind === 'number' ? parsed.value : null,
    flag: parsed.kind === 'flag' ? parsed.flag : null,
    reason: 'Checked against the frame',
    resolvedBy: CHECKER,
    resolvedAt: '2026-12-02T09:00:00.000Z',
    version: 1,
  };
}

const base = {
  sheetId: 's1',
  channelIds: ['T1', 'V1'],
  rowTimes: [0, 5, 10],
  names: new Map([
    [READER, 'Rosa Reader'],
    [CHECKER, 'Chen Checker'],
  ]),
  complete: true,
  parse: { decimalComma: false },
};

describe('computeMismatches', () => {
  it('lists differing and flagged cells, not cells that agree after normalising or lack a pass', () => {
    const result = computeMismatches({
      ...base,
      pass1: [reading(1, 0, 'T1', '12.50'), reading(1, 0, 'V1', '1.234'), reading(1, 1, 'T1', '#unreadable'), reading(1, 1, 'V1', '2.0'), reading(1, 2, 'T1', '13')],
      pass2: [reading(2, 0, 'T1', '12.5'), reading(2, 0, 'V1', '1.243'), reading(2, 1, 'T1', '#unreadable'), reading(2, 1, 'V1', '2')],
      resolutions: [],
    });
    expect(result.cells.map((c) => [c.rowIndex, c.channelId])).toEqual([
      [0, 'V1'],
      [1, 'T1'],
    ]);
    expect(result.cells[0].testTime).toBe(0);
    expect(result.cells[1].testTime).toBe(5);
    expect(result.cells[0].reasons[0]).toContain('"1.234" (pass 1) and "1.243" (pass 2)');
    expect(result.cells[1].reasons).toEqual(['Pass 1 is flagged unreadable', 'Pass 2 is flagged unreadable']);
    expect(result.open).toBe(2);
    expect(result.resolved).toBe(0);
    // Row 2 T1 has no pass 2 and row 2 V1 has neither: neither is compared.
    expect(result.byChannel).toEqual([
      { channelId: 'T1', compared: 2, mismatches: 1, rate: 0.5 },
      { channelId: 'V1', compared: 2, mismatches: 1, rate: 0.5 },
    ]);
  });

  it('counts, per person, the resolutions that disagree with their entry', () => {
    const result = computeMismatches({
      ...base,
      pass1: [reading(1, 0, 'T1', '21.4'), reading(1, 0, 'V1', '3.10')],
      pass2: [reading(2, 0, 'T1', '21.7'), reading(2, 0, 'V1', '3.01')],
      resolutions: [resolution(0, 'T1', '21.4'), resolution(0, 'V1', '3.10')],
    });
    expect(result.resolved).toBe(2);
    expect(result.open).toBe(0);
    expect(result.byPerson).toEqual([
      { userId: READER, name: 'Rosa Reader', pass: 1, compared: 2, mismatches: 2, rate: 1, wrong: 0 },
      { userId: CHECKER, name: 'Chen Checker', pass: 2, compared: 2, mismatches: 2, rate: 1, wrong: 2 },
    ]);
  });

  it('ignores entries outside the sheet’s current rows and channels', () => {
    const result = computeMismatches({
      ...base,
      pass1: [reading(1, 7, 'T1', '1'), reading(1, 0, 'OLD', '1')],
      pass2: [reading(2, 7, 'T1', '2'), reading(2, 0, 'OLD', '2')],
      resolutions: [],
    });
    expect(result.cells).toEqual([]);
    expect(result.byChannel.every((c) => c.compared === 0 && c.rate === null)).toBe(true);
  });
});

describe('sameEntry', () => {
  it('treats equal flags as the same and a flag never as a number', () => {
    expect(sameEntry({ value: null, flag: 'unreadable' }, { value: null, flag: 'unreadable' })).toBe(true);
    expect(sameEntry({ value: null, flag: 'blank' }, { value: 0, flag: null })).toBe(false);
    expect(sameEntry({ value: 12.5, flag: null }, { value: 12.5, flag: null })).toBe(true);
  });
});
