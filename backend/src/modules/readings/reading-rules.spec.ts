import { describe, expect, it } from 'vitest';
import { decideSave } from './reading-rules';

const stored = { rawText: '12.50', frameTime: 4.02, version: 3 };

describe('decideSave', () => {
  it('inserts a first entry that names no version', () => {
    expect(decideSave(null, { rawText: '12.5' })).toEqual({ kind: 'insert' });
    expect(decideSave(null, { rawText: '12.5', frameTime: 1, baseVersion: null })).toEqual({ kind: 'insert' });
  });

  it('refuses a first entry that claims to replace a version nobody stored', () => {
    expect(decideSave(null, { rawText: '12.5', baseVersion: 1 })).toEqual({ kind: 'conflict' });
  });

  it('treats a resend of the same text and frame as already saved, whatever version it names', () => {
    for (const baseVersion of [undefined, null, 1, 3, 9]) {
      expect(decideSave(stored, { rawText: '12.50', frameTime: 4.02, baseVersion })).toEqual({ kind: 'unchanged' });
    }
  });

  it('compares the typed text exactly: "12.5" is a change from "12.50"', () => {
    expect(decideSave(stored, { rawText: '12.5', frameTime: 4.02, baseVersion: 3 })).toEqual({ kind: 'update', version: 4 });
    expect(decideSave(stored, { rawText: '12.5', frameTime: 4.02 })).toEqual({ kind: 'conflict' });
  });

  it('counts a different frame as a change, and an absent frame as none', () => {
    expect(decideSave(stored, { rawText: '12.50', frameTime: 4.06, baseVersion: 3 })).toEqual({ kind: 'update', version: 4 });
    expect(decideSave(stored, { rawText: '12.50', baseVersion: 3 })).toEqual({ kind: 'update', version: 4 });
    expect(decideSave({ ...stored, frameTime: null }, { rawText: '12.50' })).toEqual({ kind: 'unchanged' });
  });

  it('refuses a change based on a stale or missing version', () => {
    expect(decideSave(stored, { rawText: '13', frameTime: 4.02, baseVersion: 2 })).toEqual({ kind: 'conflict' });
    expect(decideSave(stored, { rawText: '13', frameTime: 4.02, baseVersion: null })).toEqual({ kind: 'conflict' });
    expect(decideSave(stored, { rawText: '13', frameTime: 4.02, baseVersion: 4 })).toEqual({ kind: 'conflict' });
  });
});
