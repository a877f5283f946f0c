import { describe, expect, it } from 'vitest';
import { cleanOriginalName } from './recordings.service';

describe('cleanOriginalName', () => {
  it.each([
    ['clip.mp4', 'clip.mp4'],
    ['C:\\Users\\lab\\Videos\\run 1.MOV', 'run 1.MOV'],
    ['../../etc/passwd', 'passwd'],
    ['bad\u0000name\n.mp4', 'badname.mp4'],
    ['   ', 'video'],
    [undefined, 'video'],
  ])('%j → %j (a label only: never part of a storage key)', (input, output) => {
    expect(cleanOriginalName(input)).toBe(output);
  });

  it('keeps at most 255 characters', () => {
    expect(cleanOriginalName(`${'a'.repeat(400)}.mp4`)).toHaveLength(255);
  });
});
