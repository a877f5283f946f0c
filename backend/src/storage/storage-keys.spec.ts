import { randomUUID } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { assertStorageKey, InvalidStorageKeyError, recordingKey } from './storage-keys';

describe('recordingKey', () => {
  it('derives every key from the recording id alone', () => {
    const id = randomUUID();
    expect(recordingKey(id, 'original')).toBe(`recordings/${id}/original`);
    expect(recordingKey(id, 'proxy')).toBe(`recordings/${id}/proxy.mp4`);
    expect(recordingKey(id.toUpperCase(), 'poster')).toBe(`recordings/${id}/poster.jpg`);
  });

  it.each(['../../etc/passwd', 'clip.mp4', '', 'recordings/x', `${randomUUID()}/../x`])('refuses %j as a recording id', (id) => {
    expect(() => recordingKey(id, 'original')).toThrow(InvalidStorageKeyError);
  });
});

describe('assertStorageKey', () => {
  it.each(['recordings/abc/original', 'a', 'a/b.c/d_e-f'])('accepts %s', (key) => {
    expect(() => assertStorageKey(key)).not.toThrow();
  });

  it.each([
    '',
    '/etc/passwd',
    '../x',
    'a/../b',
    'a/./b',
    'a/..',
    'a//b',
    'a/',
    'A/B',
    'a b',
    'a\\b',
    'a/\u0000',
    'c:/x',
    '.hidden',
    'x'.repeat(513),
  ])('refuses %j', (key) => {
    expect(() => assertStorageKey(key)).toThrow(InvalidStorageKeyError);
  });
});
