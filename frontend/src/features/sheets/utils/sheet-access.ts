import type { CampaignRole, ReadingPass, Sheet } from '@dialsheet/common';

// Who may see and change what on a sheet, mirrored from the server's rules so the page never asks
// for something it would be refused. The second pass is blind: its checker does not see pass 1,
// nor its reader pass 2, until the checker has finished, whatever other roles they hold.

export interface SheetViewer {
  userId: string;
  /** The viewer's roles in the sheet's campaign. */
  roles: readonly CampaignRole[];
}

const isOverseer = (viewer: SheetViewer): boolean => viewer.roles.includes('lead') || viewer.roles.includes('engineer');

/** The pass this person types on this sheet: the reader pass 1, the checker pass 2; null for anyone else. */
export function ownPass(sheet: Sheet, viewer: SheetViewer): ReadingPass | null {
  if (sheet.readerId === viewer.userId) return 1;
  if (sheet.checkerId === viewer.userId) return 2;
  return null;
}

export function isPassFinished(sheet: Sheet, pass: ReadingPass): boolean {
  return (pass === 1 ? sheet.pass1FinishedAt : sheet.pass2FinishedAt) !== null;
}

/** Whether the server will send this pass's readings to the viewer. */
export function mayReadPass(sheet: Sheet, viewer: SheetViewer, pass: ReadingPass): boolean {
  const own = ownPass(sheet, viewer);
  if (own !== null) return own === pass || sheet.pass2FinishedAt !== null;
  return isOverseer(viewer);
}

/** The passes the viewer may see, in order. */
export function visiblePasses(sheet: Sheet, viewer: SheetViewer): ReadingPass[] {
  return ([1, 2] as const).filter((pass) => mayReadPass(sheet, viewer, pass));
}

/**
 * The mismatch list compares both passes, so it follows the same blindness: the sheet's reader and
 * checker see it once pass 2 is finished, leads and engineers at any time.
 */
export function mayReadMismatches(sheet: Sheet, viewer: SheetViewer): boolean {
  if (ownPass(sheet, viewer) !== null) return sheet.pass2FinishedAt !== null;
  return isOverseer(viewer);
}

/** Resolutions are recorded by the sheet's checker once pass 2 is finished, or by a lead. */
export function mayResolve(sheet: Sheet, viewer: SheetViewer): boolean {
  if (sheet.lock) return false;
  if (!mayReadMismatches(sheet, viewer)) return false;
  return (sheet.checkerId === viewer.userId && sheet.pass2FinishedAt !== null) || viewer.roles.includes('lead');
}

/** Only the owner of a pass changes its entries, and only until they mark it finished. */
export function mayEditPass(sheet: Sheet, viewer: SheetViewer, pass: ReadingPass): boolean {
  return sheet.lock === null && ownPass(sheet, viewer) === pass && !isPassFinished(sheet, pass);
}

/** Lead and engineer plan and assign sheets. */
export function mayPlanSheets(roles: readonly CampaignRole[]): boolean {
  return roles.includes('lead') || roles.includes('engineer');
}
