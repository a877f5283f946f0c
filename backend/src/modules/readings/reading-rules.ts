// What saving one cell does, decided from the stored entry and the incoming one alone, so the
// retry rules of the entry screen (resend until acknowledged) can be tested without a database.

export interface StoredCell {
  rawText: string;
  frameTime: number | null;
  version: number;
}

export interface IncomingCell {
  rawText: string;
  frameTime?: number | null;
  baseVersion?: number | null;
}

export type SaveDecision =
  | { kind: 'insert' }
  | { kind: 'unchanged' }
  | { kind: 'update'; version: number }
  | { kind: 'conflict' };

export const STALE_READING = 'This value was changed elsewhere since you loaded it; reload it to see the stored value before changing it';

/**
 * - Same text and frame as stored: nothing to write, whatever version the client names, because a
 *   retry of a save that did reach the server must succeed without a second write.
 * - No stored entry: a first entry, which must not claim to replace a version.
 * - Anything else changes the entry and must name the stored version; otherwise someone else's
 *   change would be overwritten unseen.
 */
export function decideSave(stored: StoredCell | null, incoming: IncomingCell): SaveDecision {
  const base = incoming.baseVersion ?? null;
  const frameTime = incoming.frameTime ?? null;
  if (!stored) return base === null ? { kind: 'insert' } : { kind: 'conflict' };
  if (stored.rawText === incoming.rawText && stored.frameTime === frameTime) return { kind: 'unchanged' };
  if (base === stored.version) return { kind: 'update', version: stored.version + 1 };
  return { kind: 'conflict' };
}
