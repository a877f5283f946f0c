import { useEffect, useRef, type RefObject } from 'react';
import { isTypingTarget } from '@/components/shortcuts/use-key-sequences';

export interface EntryKeyHandlers {
  /** Moves the video by whole frames (negative: back). */
  stepFrames: (frames: number) => void;
  openGoTo: () => void;
}

/**
 * The entry screen's keys that carry a modifier and so work from inside its inputs as well as from
 * anywhere else on the screen: Alt+←/→ and Ctrl+,/Ctrl+. step one frame, Ctrl+G goes to a row.
 * Both pairs step frames because Alt+arrows is "history back/forward" in some browsers when a page
 * does not take it, and some keyboards make Alt+arrows awkward. Keys typed into any other field
 * (a dialog's) are left alone.
 */
export function useEntryKeys(rootRef: RefObject<HTMLElement | null>, handlers: EntryKeyHandlers, enabled = true): void {
  const handlersRef = useRef(handlers);
  useEffect(() => {
    handlersRef.current = handlers;
  }, [handlers]);

  useEffect(() => {
    if (!enabled) return undefined;
    const onKeyDown = (event: KeyboardEvent) => {
      if (event.defaultPrevented) return;
      const target = event.target instanceof Node ? event.target : null;
      const inside = !!target && !!rootRef.current?.contains(target);
      const onPage = target === document.body || target === document.documentElement || target === null;
      if (!inside && (!onPage || isTypingTarget(event.target))) return;
      const ctrl = event.ctrlKey || event.metaKey;
      let frames = 0;
      if (event.altKey && !ctrl && !event.shiftKey && (event.key === 'ArrowLeft' || event.key === 'ArrowRight')) {
        frames = event.key === 'ArrowLeft' ? -1 : 1;
      } else if (ctrl && !event.altKey && !event.shiftKey && (event.key === ',' || event.key === '.')) {
        frames = event.key === ',' ? -1 : 1;
      }
      if (frames !== 0) {
        event.preventDefault();
        handlersRef.current.stepFrames(frames);
        return;
      }
      if (ctrl && !event.altKey && !event.shiftKey && (event.key === 'g' || event.key === 'G')) {
        event.preventDefault();
        handlersRef.current.openGoTo();
      }
    };
    window.addEventListener('keydown', onKeyDown);
    return () => window.removeEventListener('keydown', onKeyDown);
  }, [enabled, rootRef]);
}
