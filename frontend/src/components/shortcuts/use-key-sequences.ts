import { useEffect, useRef } from 'react';

export interface KeyBinding {
  /** Keys pressed one after another, e.g. ['g', 'c'], or a single key such as ['?']. */
  keys: readonly string[];
  run: () => void;
}

/** How long the first key of a sequence waits for the second. */
const SEQUENCE_TIMEOUT_MS = 1200;

/** True when the key press belongs to a text field, so shortcuts must stay out of the way. */
export function isTypingTarget(target: EventTarget | null): boolean {
  if (!(target instanceof HTMLElement)) return false;
  if (target.isContentEditable) return true;
  const tag = target.tagName;
  if (tag === 'TEXTAREA' || tag === 'SELECT') return true;
  if (tag === 'INPUT') {
    const type = (target as HTMLInputElement).type;
    return !['checkbox', 'radio', 'button', 'submit', 'reset', 'range', 'color', 'file'].includes(type);
  }
  return target.getAttribute('role') === 'combobox' || target.getAttribute('role') === 'textbox';
}

/** Listens on the window for single keys and two-key sequences, ignoring keys typed into fields. */
export function useKeySequences(bindings: readonly KeyBinding[], enabled = true): void {
  const bindingsRef = useRef(bindings);
  useEffect(() => {
    bindingsRef.current = bindings;
  }, [bindings]);

  useEffect(() => {
    if (!enabled) return undefined;
    let pending: string | null = null;
    let pendingTimer: ReturnType<typeof setTimeout> | undefined;

    const reset = () => {
      pending = null;
      if (pendingTimer) clearTimeout(pendingTimer);
    };

    const onKeyDown = (event: KeyboardEvent) => {
      if (event.defaultPrevented || event.ctrlKey || event.metaKey || event.altKey) return;
      if (isTypingTarget(event.target)) return;
      const key = event.key;
      const all = bindingsRef.current;

      if (pending !== null) {
        const first = pending;
        reset();
        const match = all.find((b) => b.keys.length === 2 && b.keys[0] === first && b.keys[1] === key);
        if (match) {
          event.preventDefault();
          match.run();
          return;
        }
      }

      const single = all.find((b) => b.keys.length === 1 && b.keys[0] === key);
      if (single) {
        event.preventDefault();
        single.run();
        return;
      }
      if (all.some((b) => b.keys.length === 2 && b.keys[0] === key)) {
        pending = key;
        pendingTimer = setTimeout(reset, SEQUENCE_TIMEOUT_MS);
      }
    };

    window.addEventListener('keydown', onKeyDown);
    return () => {
      window.removeEventListener('keydown', onKeyDown);
      reset();
    };
  }, [enabled]);
}
