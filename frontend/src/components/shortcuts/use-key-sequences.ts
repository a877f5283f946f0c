import { useEffect, useRef } from 'react';

export interface KeyBinding {
  /** Keys pressed one after another, e.g. ['g', 'c'], or a single key such as ['?']. */
  keys: readonly string[];
  /**
   * true: only with Shift held; false: only without. Left out, Shift does not matter (so `?`,
   * which needs Shift on many layouts, matches either way). Applies to single keys.
   */
  shift?: boolean;
  run: () => void;
}

function shiftMatches(binding: KeyBinding, event: KeyboardEvent): boolean {
  return binding.shift === undefined || binding.shift === event.shiftKey;
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

const ACTIVATING_KEYS = new Set([' ', 'Enter']);
const ARROW_KEYS = new Set(['ArrowLeft', 'ArrowRight', 'ArrowUp', 'ArrowDown']);
const ARROW_ROLES = new Set(['slider', 'radio', 'tab', 'menuitem', 'option', 'listbox', 'spinbutton', 'tree', 'treeitem', 'grid']);

/**
 * True when the focused control uses this key itself: Space and Enter press a focused button or
 * link, arrows move a focused slider, radio group, tab list or menu. Shortcuts leave those alone.
 */
export function controlOwnsKey(target: EventTarget | null, key: string): boolean {
  if (!(target instanceof HTMLElement)) return false;
  if (ACTIVATING_KEYS.has(key)) {
    if (target.tagName === 'BUTTON' || target.tagName === 'A' || target.tagName === 'SUMMARY') return true;
    if (target.tagName === 'INPUT') return true;
    const role = target.getAttribute('role');
    return role === 'button' || role === 'link' || role === 'checkbox' || role === 'switch' || role === 'menuitem';
  }
  if (ARROW_KEYS.has(key)) {
    if (target.tagName === 'INPUT' && (target as HTMLInputElement).type === 'radio') return true;
    const role = target.getAttribute('role');
    return role !== null && ARROW_ROLES.has(role);
  }
  return false;
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
      if (controlOwnsKey(event.target, key)) return;
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

      const single = all.find((b) => b.keys.length === 1 && b.keys[0] === key && shiftMatches(b, event));
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
