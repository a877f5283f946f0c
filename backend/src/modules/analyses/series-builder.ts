// The value of each sheet cell of one channel, as an analysis uses it, from the stored entries
// alone (testable without a database). Both passes agree → that value; a resolution → its value;
// only one pass typed → that value, marked unchecked; passes that differ with no resolution yet,
// or a flag (blank, unreadable, ambiguous) → no number, with the reason.
import type { ReadingFlag } from '@dialsheet/common';
import { sameEntry } from '../readings/mismatches';
import { sheetRows } from '../sheets/sheet-rules';

export interface SeriesSheet {
  id: string;
  name: string;
  startTime: number;
  endTime: number;
  interval: number;
}

export interface SeriesEntry {
  sheetId: string;
  rowIndex: number;
  pass: number;
  value: number | null;
  flag: ReadingFlag | null;
  canonical: string | null;
}

export interface SeriesResolution {
  sheetId: string;
  rowIndex: number;
  value: number | null;
  flag: ReadingFlag | null;
}

export interface ResolvedCells {
  t: number[];
  raw: number[];
  unchecked: boolean[];
  skipped: Array<{ t: number; reason: string }>;
}

const FLAG_WORDS: Record<ReadingFlag, string> = { blank: 'blank', unreadable: 'unreadable', ambiguous: 'ambiguous' };

/** Ordered by test time (then sheet order); cells nobody has typed yet are left out. */
export function resolveCells(sheets: readonly SeriesSheet[], entries: readonly SeriesEntry[], resolutions: readonly SeriesResolution[]): ResolvedCells {
  const key = (sheetId: string, rowIndex: number) => `${sheetId}:${rowIndex}`;
  const pass1 = new Map<string, SeriesEntry>();
  const pass2 = new Map<string, SeriesEntry>();
  for (const e of entries) (e.pass === 1 ? pass1 : pass2).set(key(e.sheetId, e.rowIndex), e);
  const resolved = new Map(resolutions.map((r) => [key(r.sheetId, r.rowIndex), r]));
  const cells: Array<{ t: number; order: number; raw?: number; unchecked?: boolean; reason?: string }> = [];
  let order = 0;
  for (const sheet of sheets) {
    const rows = sheetRows(sheet.startTime, sheet.endTime, sheet.interval);
    for (const row of rows) {
      const k = key(sheet.id, row.index);
      const r1 = pass1.get(k);
      const r2 = pass2.get(k);
      const resolution = resolved.get(k);
      const t = row.testTime;
      order += 1;
      if (resolution) {
        if (resolution.flag !== null || resolution.value === null) {
          cells.push({ t, order, reason: `resolved as ${FLAG_WORDS[resolution.flag ?? 'blank']} (sheet “${sheet.name}”, row ${row.index + 1})` });
        } else {
          cells.push({ t, order, raw: resolution.value, unchecked: false });
        }
        continue;
      }
      if (!r1 && !r2) continue;
      if (r1 && r2) {
        if (!sameEntry(r1, r2)) {
          cells.push({ t, order, reason: `the two passes differ and the mismatch is not resolved yet (sheet “${sheet.name}”, row ${row.index + 1})` });
        } else if (r1.flag !== null || r1.value === null) {
          cells.push({ t, order, reason: `flagged ${FLAG_WORDS[r1.flag ?? 'blank']} in both passes (sheet “${sheet.name}”, row ${row.index + 1})` });
        } else {
          cells.push({ t, order, raw: r1.value, unchecked: false });
        }
        continue;
      }
      const only = (r1 ?? r2) as SeriesEntry;
      if (only.flag !== null || only.value === null) {
        cells.push({ t, order, reason: `flagged ${FLAG_WORDS[only.flag ?? 'blank']} in pass ${only.pass}, the other pass not typed yet (sheet “${sheet.name}”, row ${row.index + 1})` });
      } else {
        cells.push({ t, order, raw: only.value, unchecked: true });
      }
    }
  }
  cells.sort((a, b) => a.t - b.t || a.order - b.order);
  const out: ResolvedCells = { t: [], raw: [], unchecked: [], skipped: [] };
  for (const c of cells) {
    if (c.reason !== undefined) {
      out.skipped.push({ t: c.t, reason: c.reason });
    } else {
      out.t.push(c.t);
      out.raw.push(c.raw as number);
      out.unchecked.push(c.unchecked === true);
    }
  }
  return out;
}

/** Test times as map keys: row times are kept to the microsecond. */
export const timeKey = (t: number) => t.toFixed(6);
