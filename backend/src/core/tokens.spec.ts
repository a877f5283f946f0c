import { describe, expect, it } from 'vitest';
import { hashToken, newToken } from './tokens';

describe('tokens', () => {
  it('makes distinct URL-safe tokens of 256 bits', () => {
    const a = newToken();
    const b = newToken();
    expect(a).not.toBe(b);
    expect(a).toMatch(/^[A-Za-z0-9_-]{43}$/);
  });

  it('hashes with SHA-256 (known vector)', () => {
    expect(hashToken('abc')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
  });
});
