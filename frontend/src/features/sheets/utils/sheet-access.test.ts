import { describe, expect, it } from 'vitest';
import type { CampaignRole } from '@dialsheet/common';
import { CHECKER_ID, LEAD_ID, READER_ID, makeSheet } from '@/testing/sheet-fixtures';
import { mayEditPass, mayReadMismatches, mayResolve, visiblePasses } from './sheet-access';

const viewer = (userId: string, roles: CampaignRole[]) => ({ userId, roles });
const open = makeSheet();
const pass2Done = makeSheet({ pass1FinishedAt: '2026-03-03T10:00:00.000Z', pass2FinishedAt: '2026-03-03T11:00:00.000Z' });

describe('who sees which pass', () => {
  it('keeps the checker blind to pass 1 until pass 2 is finished, whatever other roles they hold', () => {
    expect(visiblePasses(open, viewer(CHECKER_ID, ['checker', 'lead']))).toEqual([2]);
    expect(mayReadMismatches(open, viewer(CHECKER_ID, ['checker', 'lead']))).toBe(false);
    expect(visiblePasses(pass2Done, viewer(CHECKER_ID, ['checker']))).toEqual([1, 2]);
  });

  it('shows the reader pass 2 only once the checker has finished it', () => {
    expect(visiblePasses(open, viewer(READER_ID, ['reader', 'engineer']))).toEqual([1]);
    expect(visiblePasses(pass2Done, viewer(READER_ID, ['reader']))).toEqual([1, 2]);
  });

  it('shows leads and engineers both passes, and anyone else neither', () => {
    expect(visiblePasses(open, viewer(LEAD_ID, ['engineer']))).toEqual([1, 2]);
    expect(visiblePasses(open, viewer(LEAD_ID, ['reader', 'checker']))).toEqual([]);
    expect(mayReadMismatches(open, viewer(LEAD_ID, ['lead']))).toBe(true);
  });
});

describe('who changes what', () => {
  it('lets only the owner of an unfinished pass change it, and nobody on a locked sheet', () => {
    expect(mayEditPass(open, viewer(READER_ID, ['reader']), 1)).toBe(true);
    expect(mayEditPass(open, viewer(READER_ID, ['reader', 'lead']), 2)).toBe(false);
    expect(mayEditPass(pass2Done, viewer(READER_ID, ['reader']), 1)).toBe(false);
    expect(mayEditPass(makeSheet({ lock: { releaseId: 'r', releaseNumber: 1 } }), viewer(READER_ID, ['reader']), 1)).toBe(false);
  });

  it('lets the checker resolve once pass 2 is finished, and a lead; not an engineer', () => {
    expect(mayResolve(open, viewer(CHECKER_ID, ['checker']))).toBe(false);
    expect(mayResolve(pass2Done, viewer(CHECKER_ID, ['checker']))).toBe(true);
    expect(mayResolve(open, viewer(LEAD_ID, ['lead']))).toBe(true);
    expect(mayResolve(pass2Done, viewer(LEAD_ID, ['engineer']))).toBe(false);
  });
});
