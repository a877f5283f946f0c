import { useCallback, useState } from 'react';
import { parseReading, type Reading, type ReadingPass } from '@dialsheet/common';
import { errorMessage, isApiError } from '@/lib/api-client';
import { staleConflict, useEditReading } from '../api/edit-reading';
import { entryAt, type TableGrid } from '../utils/sheet-grid';

export interface CellAt {
  rowIndex: number;
  col: number;
}

export interface CellEditing extends CellAt {
  text: string;
  error: string | null;
}

/** A refusal to show above the table; a stale one carries the stored reading to reload. */
export type EditNotice = { message: string; stale?: { pass: ReadingPass; current: Reading | null } } | null;

/**
 * The owner's in-place change of one cell of their pass: the stored text to start from, a strict
 * parse before anything is sent, the save with the version it replaces, and what to show when the
 * server refuses (a stale version comes back with the stored reading).
 */
export function useCellEditing({
  sheetId,
  grid,
  editPass,
  decimalComma,
  onSaved,
  onDone,
}: {
  sheetId: string;
  grid: TableGrid;
  /** The pass the viewer may change; null: none. */
  editPass: ReadingPass | null;
  decimalComma: boolean;
  /** The cell was saved (the table moves on to the next row). */
  onSaved: (cell: CellAt) => void;
  /** Editing ended, saved or not (the table takes the keyboard back). */
  onDone: () => void;
}) {
  const [editing, setEditing] = useState<CellEditing | null>(null);
  const [notice, setNotice] = useState<EditNotice>(null);
  const edit = useEditReading();

  const start = useCallback(
    (cell: CellAt) => {
      if (editPass === null) return;
      const existing = entryAt(grid, editPass, cell.rowIndex, cell.col);
      setNotice(null);
      setEditing({ ...cell, text: existing?.rawText ?? '', error: null });
    },
    [editPass, grid],
  );

  const change = useCallback((text: string) => setEditing((now) => (now ? { ...now, text, error: null } : now)), []);

  const cancel = useCallback(() => {
    setEditing(null);
    onDone();
  }, [onDone]);

  const commit = useCallback(() => {
    if (!editing || editPass === null || edit.isPending) return;
    const existing = entryAt(grid, editPass, editing.rowIndex, editing.col) ?? null;
    if (existing && existing.rawText === editing.text) {
      cancel();
      return;
    }
    const parsed = parseReading(editing.text, { decimalComma });
    if (parsed.kind === 'error') {
      setEditing({ ...editing, error: parsed.message });
      return;
    }
    const cell = { rowIndex: editing.rowIndex, col: editing.col };
    edit.mutate(
      { sheetId, rowIndex: cell.rowIndex, pass: editPass, channelId: grid.channelIds[cell.col], rawText: editing.text, existing },
      {
        onSuccess: () => {
          setEditing(null);
          onSaved(cell);
          onDone();
        },
        onError: (error) => {
          const stale = staleConflict(error);
          if (isApiError(error, 400) && !stale) {
            // A value the server reads differently stays in the cell to be corrected.
            setEditing((now) => (now ? { ...now, error: errorMessage(error) } : now));
            return;
          }
          setEditing(null);
          setNotice(stale ? { message: errorMessage(error), stale: { pass: editPass, current: stale.current } } : { message: errorMessage(error) });
          onDone();
        },
      },
    );
  }, [cancel, decimalComma, edit, editPass, editing, grid, onDone, onSaved, sheetId]);

  return { editing, notice, setNotice, saving: edit.isPending, start, change, commit, cancel };
}
