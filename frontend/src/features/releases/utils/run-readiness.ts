import type { DashboardRun } from '@dialsheet/common';

/** Why a run cannot go into a release now, in words; null when it can. */
export function notReadyReason(run: DashboardRun): string | null {
  if (run.lockedBy) return `In release ${run.lockedBy.number}; open a correction to release a new version`;
  if (run.sheets.length === 0) return 'No sheet planned';
  const reasons: string[] = [];
  for (const sheet of run.sheets) {
    if (!sheet.pass1Finished) reasons.push(`${sheet.name}: pass 1 not finished`);
    else if (!sheet.pass2Finished) reasons.push(`${sheet.name}: pass 2 not finished`);
    if (sheet.openMismatches > 0) {
      reasons.push(`${sheet.name}: ${sheet.openMismatches} open mismatch${sheet.openMismatches === 1 ? '' : 'es'}`);
    }
  }
  if (reasons.length > 0) return reasons.join('; ');
  // The server's verdict counts even when the figures above look complete.
  return run.readyToRelease ? null : 'Not ready yet';
}

/** Cells entered of all cells as a percentage with one decimal, rounded down (never shows 100 early). */
export function passPercent(entered: number, cells: number): number {
  return cells > 0 ? Math.floor((entered / cells) * 1000) / 10 : 0;
}
