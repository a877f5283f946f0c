import { describe, expect, it } from 'vitest';
import type { SheetGridWire, SheetGridWirePass } from '../types/reading';
import { layOutGridPass, layOutSheetGrid } from './grid';
import { checkLimits } from './limits';

// Two rows × three channels (six cells). T has a plausible range, P an operating range, V none.
const limits = [{ plausibleMin: 5, plausibleMax: 90 }, { operatingMin: 0, operatingMax: 400 }, {}];

/** Entries of cells 4, 0 and 2, in the database's order (none in particular). */
const entered: SheetGridWirePass = {
  cell: [4, 0, 2],
  rawText: ['450', '21.5', '#unreadable'],
  flagged: [[2, 'unreadable']],
  version: null,
  frameTime: null,
  outside: [[4, 450]],
};

function wire(pass1: SheetGridWirePass | null, pass2: SheetGridWirePass | null = null): SheetGridWire {
  return { sheetId: 's', testTimes: [0, 2], channelIds: ['T', 'P', 'V'], limits, pass1, pass2, resolutions: null };
}

describe('layOutSheetGrid', () => {
  it('puts each entry in its cell, whatever order the entries come in, and leaves the rest empty', () => {
    const grid = layOutSheetGrid(wire(entered));
    expect(grid.pass1?.rawText).toEqual(['21.5', null, '#unreadable', null, '450', null]);
    expect(grid.pass1?.flag).toEqual([null, null, 'unreadable', null, null, null]);
    expect(grid.pass1?.edit).toBeNull();
    expect(grid.pass2).toBeNull();
    // The same entries in another order give the same grid.
    const reversed: SheetGridWirePass = { ...entered, cell: [2, 0, 4], rawText: ['#unreadable', '21.5', '450'] };
    expect(layOutSheetGrid(wire(reversed)).pass1).toEqual(grid.pass1);
  });

  it('keeps versions and frames only for a pass the viewer may change', () => {
    const own = layOutGridPass({ ...entered, version: [3, 1, 2], frameTime: [4.25, 0.017, null] }, 6, limits);
    expect(own.edit?.version).toEqual([1, null, 2, null, 3, null]);
    expect(own.edit?.frameTime).toEqual([0.017, null, null, null, 4.25, null]);
  });

  it('gives the warnings of the entries outside a limit with the readings route’s own messages, by cell', () => {
    const grid = layOutSheetGrid(wire(entered));
    // Cell 4 is row 1 of channel P (4 % 3 = 1): above its operating maximum of 400.
    expect(grid.pass1?.warnings).toEqual({ 4: checkLimits(450, limits[1]) });
    expect(grid.pass1?.warnings[4]?.[0].code).toBe('outside-operating');
    // A value the database picked that is within its channel's limits after all carries none.
    expect(layOutGridPass({ ...entered, outside: [[0, 21.5]] }, 6, limits).warnings).toEqual({});
  });

  it('lays out a pass with no entries as empty cells', () => {
    const none: SheetGridWirePass = { cell: [], rawText: [], flagged: null, version: [], frameTime: [], outside: null };
    const pass = layOutGridPass(none, 6, limits);
    expect(pass.rawText).toEqual([null, null, null, null, null, null]);
    expect(pass.edit?.version).toEqual([null, null, null, null, null, null]);
  });

  it('refuses an answer it cannot lay out rather than put values in the wrong cells', () => {
    expect(() => layOutGridPass({ ...entered, cell: [4, 0, 6] }, 6, limits)).toThrow(/cell 6 is outside the 6 cells/);
    expect(() => layOutGridPass({ ...entered, cell: [4, 0, 1.5] }, 6, limits)).toThrow(RangeError);
    expect(() => layOutGridPass({ ...entered, rawText: ['450'] }, 6, limits)).toThrow(/differ in length/);
    expect(() => layOutGridPass({ ...entered, version: [1, 1, 1] }, 6, limits)).toThrow(/differ in length/);
    expect(() => layOutGridPass({ ...entered, flagged: [[1, 'blank']] }, 6, limits)).toThrow(/cell 1 is flagged but has no entry/);
    expect(() => layOutGridPass({ ...entered, flagged: [[7, 'blank']] }, 6, limits)).toThrow(/cell 7 is outside/);
    expect(() => layOutSheetGrid({ ...wire(entered), limits: [{}] })).toThrow(/1 channel limits for 3 channels/);
  });
});
