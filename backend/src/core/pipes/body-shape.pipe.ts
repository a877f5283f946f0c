import { type ArgumentMetadata, BadRequestException, type PipeTransform } from '@nestjs/common';

/**
 * The deepest nesting of arrays and objects a request body may have. Our deepest body (an analysis
 * input with its streams and their stated uncertainties) is under ten levels deep.
 */
export const MAX_BODY_DEPTH = 64;

/** U+0000, or a UTF-16 surrogate without its partner (text no UTF-8 column can hold as sent). */
// eslint-disable-next-line no-control-regex -- finding U+0000 is the point
const UNSTORABLE = /\u0000|[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;

/** What is wrong with the body's shape, or null. Walks without recursion, so it cannot overflow. */
export function bodyShapeProblem(value: unknown): string | null {
  const stack: Array<[unknown, number, string]> = [[value, 0, '']];
  while (stack.length) {
    const [node, depth, path] = stack.pop() as [unknown, number, string];
    if (typeof node === 'string') {
      if (UNSTORABLE.test(node)) return textProblem(path);
      continue;
    }
    if (node === null || typeof node !== 'object') continue;
    const level = depth + 1;
    if (level > MAX_BODY_DEPTH) return `The request body is nested too deeply (more than ${MAX_BODY_DEPTH} levels of arrays and objects)`;
    for (const [key, child] of Object.entries(node)) {
      const at = path ? `${path}.${key}` : key;
      if (UNSTORABLE.test(key)) return textProblem(at);
      stack.push([child, level, at]);
    }
  }
  return null;
}

function textProblem(path: string): string {
  return `${path || 'The body'}: text may not contain the NUL character (U+0000) or a broken UTF-16 surrogate; remove it and send the text again`;
}

/**
 * Refuses, with a 400 before validation, bodies that would otherwise end in a 500: nesting
 * thousands deep (JSON.parse accepts it, but the recursive transform and validation after it
 * overflow the call stack), and text PostgreSQL cannot store (it has no NUL in text or jsonb, and
 * a lone surrogate would be silently replaced, so what was saved would differ from what was sent).
 */
export class BodyShapePipe implements PipeTransform {
  transform(value: unknown, metadata: ArgumentMetadata): unknown {
    if (metadata.type !== 'body') return value;
    const problem = bodyShapeProblem(value);
    if (problem) throw new BadRequestException(problem);
    return value;
  }
}
