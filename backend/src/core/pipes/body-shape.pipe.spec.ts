import { BadRequestException } from '@nestjs/common';
import { describe, expect, it } from 'vitest';
import { BodyShapePipe, bodyShapeProblem, MAX_BODY_DEPTH } from './body-shape.pipe';

const nest = (depth: number): unknown => JSON.parse('['.repeat(depth) + ']'.repeat(depth));
const body = { type: 'body' as const };

describe('BodyShapePipe', () => {
  it('passes ordinary bodies through unchanged, control characters other than NUL included', () => {
    const value = { name: 'Run 1 \t\n\u001b[31m <img src=x onerror=alert(1)> \u202e 🙂', steps: [{ points: [{ raw: 1, eng: 2 }] }] };
    expect(new BodyShapePipe().transform(value, body)).toBe(value);
    expect(bodyShapeProblem(nest(MAX_BODY_DEPTH))).toBeNull();
  });

  it('refuses nesting past the limit without overflowing itself, even 100 000 levels deep', () => {
    expect(bodyShapeProblem(nest(MAX_BODY_DEPTH + 1))).toMatch(/nested too deeply/);
    expect(() => new BodyShapePipe().transform(nest(100_000), body)).toThrow(BadRequestException);
  });

  it('names the field holding a NUL or a lone surrogate, in values and in keys', () => {
    expect(bodyShapeProblem({ readings: [{ rawText: '1\u00002' }] })).toMatch(/^readings\.0\.rawText: .*U\+0000/);
    expect(bodyShapeProblem({ note: 'a\uD800b' })).toMatch(/^note: /);
    expect(bodyShapeProblem({ note: '\uDC00' })).toMatch(/^note: /);
    expect(bodyShapeProblem({ constants: { 'c\u0000p': 1 } })?.startsWith('constants.c\u0000p: ')).toBe(true);
    expect(bodyShapeProblem('\u0000')).toMatch(/^The body: /);
    // A surrogate pair is one valid character (an emoji), not a broken one.
    expect(bodyShapeProblem({ note: '\uD83D\uDE42' })).toBeNull();
  });

  it('leaves path and query parameters to their own pipes', () => {
    expect(new BodyShapePipe().transform('\u0000', { type: 'query' })).toBe('\u0000');
  });
});
