// The sheet table's grid, from the route's answer to the table's model. The server sends each pass
// as the database writes it (entries only, in no order, with their cell index), because parsing
// and re-serialising 120 000 entries on the server cost more than the whole query. Here they are
// put cell by cell: one pass over the entries, no sorting, and the limit warnings worked out only
// for the few entries the database found outside a limit, with the same function the readings
// route uses.

import type { ChannelLimits, LimitWarning, SheetGrid, SheetGridPass, SheetGridWire, SheetGridWirePass } from '../types/reading';
import { checkLimits } from './limits';

function sameLength(pass: SheetGridWirePass): boolean {
  const n = pass.cell.length;
  if (pass.rawText.length !== n) return false;
  if ((pass.version === null) !== (pass.frameTime === null)) return false;
  return pass.version === null || (pass.version.length === n && (pass.frameTime as unknown[]).length === n);
}

/**
 * One pass laid out over `cells` cells (null where nothing is entered). Throws a RangeError on an
 * answer that cannot be laid out (arrays of different lengths, a cell index off the grid):
 * showing such a grid would put values in the wrong cells.
 */
export function layOutGridPass(pass: SheetGridWirePass, cells: number, limits: readonly ChannelLimits[]): SheetGridPass {
  if (!sameLength(pass)) throw new RangeError('the grid answer is malformed: its arrays of one pass differ in length');
  const width = limits.length;
  const rawText = new Array<string | null>(cells).fill(null);
  const flag = new Array<SheetGridPass['flag'][number]>(cells).fill(null);
  const version = pass.version ? new Array<number | null>(cells).fill(null) : null;
  const frameTime = pass.frameTime ? new Array<number | null>(cells).fill(null) : null;
  const inGrid = (i: number) => {
    if (!Number.isInteger(i) || i < 0 || i >= cells) throw new RangeError(`the grid answer is malformed: cell ${String(i)} is outside the ${cells} cells of the sheet`);
  };
  for (let k = 0; k < pass.cell.length; k++) {
    const i = pass.cell[k];
    inGrid(i);
    rawText[i] = pass.rawText[k];
    if (version && frameTime && pass.version && pass.frameTime) {
      version[i] = pass.version[k];
      frameTime[i] = pass.frameTime[k];
    }
  }
  for (const [i, f] of pass.flagged ?? []) {
    inGrid(i);
    if (rawText[i] === null) throw new RangeError(`the grid answer is malformed: cell ${i} is flagged but has no entry`);
    flag[i] = f;
  }
  const warnings: Record<number, LimitWarning[]> = {};
  for (const [i, value] of pass.outside ?? []) {
    if (!Number.isInteger(i) || i < 0 || i >= cells || width === 0) continue;
    const found = checkLimits(value, limits[i % width]);
    if (found.length > 0) warnings[i] = found;
  }
  return { rawText, flag, edit: version && frameTime ? { version, frameTime } : null, warnings };
}

/** The table's grid from the route's answer: every visible pass laid out cell by cell. */
export function layOutSheetGrid(wire: SheetGridWire): SheetGrid {
  if (wire.limits.length !== wire.channelIds.length) {
    throw new RangeError(`the grid answer is malformed: ${wire.limits.length} channel limits for ${wire.channelIds.length} channels`);
  }
  const cells = wire.testTimes.length * wire.channelIds.length;
  return {
    sheetId: wire.sheetId,
    testTimes: wire.testTimes,
    channelIds: wire.channelIds,
    pass1: wire.pass1 ? layOutGridPass(wire.pass1, cells, wire.limits) : null,
    pass2: wire.pass2 ? layOutGridPass(wire.pass2, cells, wire.limits) : null,
    resolutions: wire.resolutions,
  };
}
