import type { RowCells } from './entry-rows';

/** What the row's inputs show: the row, its cells, and the texts saved (or queued) for it. */
export interface CellsView {
  row: number;
  cells: RowCells;
  /** Anything in the inputs other than these is typed and not yet saved. */
  baseline: readonly string[];
}

/**
 * The inputs' state, kept outside the entry screen's React state: a key typed, or a step to the
 * next row, re-renders the inputs alone; the rest of the screen (row list, queue line, dialogs)
 * follows when it needs to.
 */
export class CellsStore {
  private view: CellsView;
  private readonly listeners = new Set<() => void>();

  constructor(view: CellsView) {
    this.view = view;
  }

  readonly get = (): CellsView => this.view;

  set(view: CellsView): void {
    this.view = view;
    for (const listener of this.listeners) listener();
  }

  readonly subscribe = (listener: () => void): (() => void) => {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  };
}

export function typedSomething(view: CellsView): boolean {
  const { texts } = view.cells;
  return texts.length !== view.baseline.length || texts.some((text, i) => text !== view.baseline[i]);
}
