import { sheetRowTimes, toTestTime, type SheetRow, type SyncMarks } from '@dialsheet/common';

/** Shorter intervals ask for more than a person can type or a video frame can show. */
export const MIN_SHEET_INTERVAL = 0.1;

export interface SheetPlan {
  startTime: number;
  endTime: number;
  interval: number;
  channelIds: string[];
}

/**
 * Every rule a sheet plan breaks, as messages naming the fields; [] when it is sound. Judged on
 * the merged result of a change, so a PATCH of the end alone is checked against the stored start.
 */
export function sheetProblems(p: SheetPlan): string[] {
  const problems: string[] = [];
  if (!(p.startTime >= 0)) problems.push(`startTime must be 0 s or later, got ${p.startTime}`);
  if (!(p.endTime > p.startTime)) problems.push(`endTime (${p.endTime} s) must be after startTime (${p.startTime} s)`);
  if (!(p.interval >= MIN_SHEET_INTERVAL)) problems.push(`interval must be at least ${MIN_SHEET_INTERVAL} s, got ${p.interval}`);
  if (problems.length === 0) {
    try {
      sheetRowTimes(p.startTime, p.endTime, p.interval);
    } catch (error) {
      if (!(error instanceof RangeError)) throw error;
      problems.push(`interval: ${error.message}`);
    }
  }
  if (p.channelIds.length === 0) problems.push('channelIds must list at least one channel');
  const seen = new Set<string>();
  p.channelIds.forEach((id, i) => {
    if (seen.has(id)) problems.push(`channelIds.${i}: the channel is already listed`);
    seen.add(id);
  });
  return problems;
}

/** The sheet's rows, computed the same way every time from its plan. */
export function sheetRows(startTime: number, endTime: number, interval: number): SheetRow[] {
  return sheetRowTimes(startTime, endTime, interval).map((testTime, index) => ({ index, testTime }));
}

export function sheetRowCount(startTime: number, endTime: number, interval: number): number {
  return sheetRowTimes(startTime, endTime, interval).length;
}

/**
 * Why the run cannot carry this sheet, or null when it can. Sheet times are test times, so the
 * run needs its sync marks; the end must fall within the recording once converted to test time.
 */
export function runLimitProblem(sync: SyncMarks | null, durationSec: number, endTime: number): string | null {
  if (!sync) return "Set the run's time sync before making a sheet: sheet times are test times";
  const last = toTestTime(sync, durationSec);
  // Microsecond slack, as row times themselves are kept to the microsecond.
  if (endTime > last + 1e-6) {
    return `endTime must be at most ${Math.floor(last * 1000) / 1000} s: the recording ends there in test time, got ${endTime} s`;
  }
  return null;
}
