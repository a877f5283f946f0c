import { createContext, useCallback, useContext, useEffect, useId, useMemo, useState, type ReactNode } from 'react';
import type { ShortcutEntry } from './shortcut-sheet';
import { useKeySequences, type KeyBinding } from './use-key-sequences';

export interface PageShortcut extends ShortcutEntry {
  run: () => void;
}

interface PageShortcutRegistry {
  /** Lists (or, with null, removes) the shortcuts one page component offers. */
  set: (id: string, entries: readonly ShortcutEntry[] | null) => void;
  /** True while something (the shortcut sheet) takes the keyboard; page shortcuts then rest. */
  suspended: boolean;
}

const PageShortcutsContext = createContext<PageShortcutRegistry | null>(null);

/**
 * Held by the app shell: collects what the current page offers, so the shortcut sheet lists every
 * key that works right now, not only the global ones.
 */
export function PageShortcutsProvider({
  suspended,
  onChange,
  children,
}: {
  suspended: boolean;
  onChange: (entries: ShortcutEntry[]) => void;
  children: ReactNode;
}) {
  const [byOwner, setByOwner] = useState<ReadonlyMap<string, readonly ShortcutEntry[]>>(() => new Map());
  const set = useCallback((id: string, entries: readonly ShortcutEntry[] | null) => {
    setByOwner((previous) => {
      const next = new Map(previous);
      if (entries) next.set(id, entries);
      else next.delete(id);
      return next;
    });
  }, []);
  useEffect(() => {
    onChange([...byOwner.values()].flat());
  }, [byOwner, onChange]);
  const value = useMemo(() => ({ set, suspended }), [set, suspended]);
  return <PageShortcutsContext.Provider value={value}>{children}</PageShortcutsContext.Provider>;
}

/**
 * Binds keys for as long as the calling component is shown and lists them in the shortcut sheet.
 * Pass a memoised list: a new array each render re-registers every time.
 */
export function usePageShortcuts(shortcuts: readonly PageShortcut[], enabled = true): void {
  const registry = useContext(PageShortcutsContext);
  const id = useId();
  const bindings = useMemo<KeyBinding[]>(
    () => shortcuts.map(({ keys, shift, run }) => ({ keys, shift: shift ?? false, run })),
    [shortcuts],
  );
  useKeySequences(bindings, enabled && !registry?.suspended);

  const set = registry?.set;
  useEffect(() => {
    if (!set || !enabled) return undefined;
    set(
      id,
      shortcuts.map(({ keys, shift, description, group }) => ({ keys, shift, description, group })),
    );
    return () => set(id, null);
  }, [set, id, shortcuts, enabled]);
}
