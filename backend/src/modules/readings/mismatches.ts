// The mismatch list of a sheet and its rates, computed from the stored entries alone so the rules
// can be tested without a database. A cell is listed when both passes hold an entry and they do
// not agree after normalising ("12.50" and "12.5" agree), or when either entry is flagged: a
// flag is always looked at against the frame.

import {
  compareRows,
  mismatchRate,
  type CellStatus,
  type ChannelMismatchRate,
  type MismatchCell,
  type PersonMismatchRate,
  type Reading,
  type ReadingFlag,
  type ReadingParseOptions,
  type Resolution,
  type SheetMismatches,
} from '@dialsheet/common';

export interface MismatchInput {
  sheetId: string;
  /** The sheet's channels in entry order. */
  channelIds: readonly string[];
  /** Test time of each row, by row index. */
  rowTimes: readonly number[];
  pass1: readonly Reading[];
  pass2: readonly Reading[];
  resolutions: readonly Resolution[];
  /** Display names by user id. */
  names: ReadonlyMap<string, string>;
  /** Both passes are finished. */
  complete: boolean;
  parse: ReadingParseOptions;
}

const key = (rowIndex: number, channelId: string) => `${rowIndex}:${channelId}`;

/** Two stored entries say the same thing: the same exact decimal, or the same flag. */
export function sameEntry(a: { value: number | null; flag: ReadingFlag | null; canonical?: string | null }, b: typeof a): boolean {
  if (a.flag !== null || b.flag !== null) return a.flag === b.flag;
  if (a.canonical != null && b.canonical != null) return a.canonical === b.canonical;
  return a.value === b.value;
}

export function computeMismatches(input: MismatchInput): SheetMismatches {
  const { channelIds, rowTimes } = input;
  const inSheet = new Set(channelIds);
  const byCell1 = new Map<string, Reading>();
  const byCell2 = new Map<string, Reading>();
  for (const r of input.pass1) if (inSheet.has(r.channelId) && r.rowIndex < rowTimes.length) byCell1.set(key(r.rowIndex, r.channelId), r);
  for (const r of input.pass2) if (inSheet.has(r.channelId) && r.rowIndex < rowTimes.length) byCell2.set(key(r.rowIndex, r.channelId), r);
  const resolutions = new Map(input.resolutions.map((r) => [key(r.rowIndex, r.channelId), r]));

  const cells: MismatchCell[] = [];
  const statusByChannel = new Map<string, CellStatus[]>(channelIds.map((id) => [id, []]));
  /** Per person and pass: the status of each cell they entered, and how many resolutions disagree with them. */
  const people = new Map<string, { userId: string; pass: 1 | 2; statuses: CellStatus[]; wrong: number }>();
  const person = (userId: string, pass: 1 | 2) => {
    const k = `${pass}:${userId}`;
    let p = people.get(k);
    if (!p) {
      p = { userId, pass, statuses: [], wrong: 0 };
      people.set(k, p);
    }
    return p;
  };

  for (let rowIndex = 0; rowIndex < rowTimes.length; rowIndex++) {
    const text1: Record<string, string> = {};
    const text2: Record<string, string> = {};
    for (const id of channelIds) {
      const r1 = byCell1.get(key(rowIndex, id));
      const r2 = byCell2.get(key(rowIndex, id));
      if (r1) text1[id] = r1.rawText;
      if (r2) text2[id] = r2.rawText;
    }
    const compared = compareRows(text1, text2, { ...input.parse, channelIds });
    for (const id of channelIds) {
      const comparison = compared[id];
      statusByChannel.get(id)?.push(comparison.status);
      const r1 = byCell1.get(key(rowIndex, id));
      const r2 = byCell2.get(key(rowIndex, id));
      if (!r1 || !r2) continue;
      const resolution = resolutions.get(key(rowIndex, id)) ?? null;
      const p1 = person(r1.enteredBy, 1);
      const p2 = person(r2.enteredBy, 2);
      p1.statuses.push(comparison.status);
      p2.statuses.push(comparison.status);
      if (comparison.status !== 'mismatch') continue;
      if (resolution) {
        if (!sameEntry(resolution, r1)) p1.wrong++;
        if (!sameEntry(resolution, r2)) p2.wrong++;
      }
      cells.push({ rowIndex, testTime: rowTimes[rowIndex], channelId: id, pass1: r1, pass2: r2, reasons: comparison.reasons, resolution });
    }
  }

  const byChannel: ChannelMismatchRate[] = channelIds.map((channelId) => ({
    channelId,
    ...mismatchRate((statusByChannel.get(channelId) ?? []).map((status) => ({ status }))),
  }));
  const byPerson: PersonMismatchRate[] = [...people.values()]
    .sort((a, b) => a.pass - b.pass || a.userId.localeCompare(b.userId))
    .map((p) => ({
      userId: p.userId,
      name: input.names.get(p.userId) ?? 'Former member',
      pass: p.pass,
      wrong: p.wrong,
      ...mismatchRate(p.statuses.map((status) => ({ status }))),
    }));
  const resolved = cells.filter((c) => c.resolution !== null).length;
  return { sheetId: input.sheetId, complete: input.complete, cells, open: cells.length - resolved, resolved, byChannel, byPerson };
}
