import { readdirSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { migrations } from '.';

describe('migrations list', () => {
  const files = readdirSync(__dirname).filter((f) => /^\d{13}-[A-Za-z]+\.ts$/.test(f));

  it('registers every migration file in this folder, oldest first', () => {
    const expected = files
      .sort()
      .map((f) => f.replace(/\.ts$/, ''))
      .map((f) => { const [ms, name] = f.split('-'); return `${name}${ms}`; });
    expect(migrations.map((m) => m.name)).toEqual(expected);
    expect(files.length).toBeGreaterThan(0);
  });
});
