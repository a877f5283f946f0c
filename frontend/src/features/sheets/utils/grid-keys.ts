/** Rows one PageUp / PageDown moves. */
export const PAGE_ROWS = 20;

export type GridMove = { pos: number; col: number } | 'edit' | null;

/**
 * Where a key takes the sheet table's cursor: arrows by one cell, PageUp / PageDown by a page,
 * Home / End to the first / last channel (with Ctrl, the first / last row), Enter or F2 to change
 * the cell. Positions are clamped by the caller. null: the key is not the table's.
 */
export function gridMove(key: string, ctrl: boolean, pos: number, col: number, rowCount: number, colCount: number): GridMove {
  switch (key) {
    case 'ArrowDown':
      return { pos: ctrl ? rowCount - 1 : pos + 1, col };
    case 'ArrowUp':
      return { pos: ctrl ? 0 : pos - 1, col };
    case 'ArrowRight':
      return { pos, col: col + 1 };
    case 'ArrowLeft':
      return { pos, col: col - 1 };
    case 'PageDown':
      return { pos: pos + PAGE_ROWS, col };
    case 'PageUp':
      return { pos: pos - PAGE_ROWS, col };
    case 'Home':
      return { pos: ctrl ? 0 : pos, col: 0 };
    case 'End':
      return { pos: ctrl ? rowCount - 1 : pos, col: colCount - 1 };
    case 'Enter':
    case 'F2':
      return 'edit';
    default:
      return null;
  }
}
