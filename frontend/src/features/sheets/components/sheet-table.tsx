import { useCallback, useEffect, useLayoutEffect, useMemo, useRef, useState } from 'react';
import { Alert, Button, Skeleton, Typography } from 'antd';
import type { Channel, Sheet, SheetRow } from '@dialsheet/common';
import { ErrorState } from '@/components/feedback/error-state';
import { usePageShortcuts, type PageShortcut } from '@/components/shortcuts/page-shortcuts';
import { useReloadReading } from '../api/edit-reading';
import { useCellEditing, type CellAt } from '../hooks/use-cell-editing';
import { useSheetGridData } from '../hooks/use-sheet-grid-data';
import { gridMove } from '../utils/grid-keys';
import { mayEditPass, ownPass, type SheetViewer } from '../utils/sheet-access';
import { cellKey, cellPicked, cellState, entryAt, filterRows, type SheetFilter } from '../utils/sheet-grid';
import { formatCount } from '../utils/sheet-format';
import { SheetGridView } from './sheet-grid-view';
import { SheetTableCell } from './sheet-table-cell';
import { SHEET_FILTERS, SheetTableFilter } from './sheet-table-filter';
import './sheets.css';

interface SheetTableProps {
  sheet: Sheet;
  /** The sheet's channels, in entry order. */
  channels: Channel[];
  viewer: SheetViewer;
  decimalComma: boolean;
  /** The viewer may read the mismatch list (it carries the resolutions shown in the cells). */
  withResolutions: boolean;
  /** False while another tab is shown: its keys rest. */
  active: boolean;
}

const GROUP = 'Sheet table';

function tableHeight(): number {
  return typeof window === 'undefined' ? 480 : Math.max(320, window.innerHeight - 340);
}

const clamp = (value: number, min: number, max: number) => Math.min(Math.max(value, min), max);

/**
 * Rows × channels of the whole sheet, virtualised so ten thousand rows open at once. The viewer
 * sees only the passes the blind rule allows (the page never asks for the others), and the owner of
 * a pass still open can change their own entries in place: Enter or a double click on a cell, Enter
 * to save with the version it replaces, Esc to leave it.
 */
export function SheetTable({ sheet, channels, viewer, decimalComma, withResolutions, active }: SheetTableProps) {
  const { grid, ready, error, retry, see1, see2 } = useSheetGridData({ sheet, channels, viewer, decimalComma, withResolutions });
  const own = ownPass(sheet, viewer);
  const editPass = own !== null && mayEditPass(sheet, viewer, own) ? own : null;
  const [filter, setFilter] = useState<SheetFilter>('all');
  const [cursor, setCursor] = useState<CellAt>({ rowIndex: 0, col: 0 });
  const [height] = useState(tableHeight);
  const gridRef = useRef<HTMLDivElement>(null);
  const reloadReading = useReloadReading();
  const shownRows = useMemo(() => filterRows(grid, filter), [filter, grid]);
  const position = shownRows.findIndex((r) => r.index === cursor.rowIndex);

  // A benchmark times the first render of the table with its data; the mark goes down once.
  const marked = useRef(false);
  useLayoutEffect(() => {
    if (!ready || marked.current) return;
    marked.current = true;
    performance.mark('dialsheet:sheet-table-rendered', { detail: { rows: grid.rows.length } });
  }, [ready, grid.rows.length]);

  const focusGrid = useCallback(() => gridRef.current?.focus({ preventScroll: true }), []);
  const moveTo = useCallback(
    (pos: number, col: number) => {
      if (shownRows.length === 0) return;
      setCursor({ rowIndex: shownRows[clamp(pos, 0, shownRows.length - 1)].index, col: clamp(col, 0, channels.length - 1) });
    },
    [channels.length, shownRows],
  );
  const onSaved = useCallback(
    (cell: CellAt) => moveTo(shownRows.findIndex((r) => r.index === cell.rowIndex) + 1, cell.col),
    [moveTo, shownRows],
  );
  const editor = useCellEditing({ sheetId: sheet.id, grid, editPass, decimalComma, onSaved, onDone: focusGrid });
  const { editing, notice, setNotice, start: beginEdit } = editor;
  const startEdit = useCallback(
    (cell: CellAt) => {
      setCursor(cell);
      beginEdit(cell);
    },
    [beginEdit],
  );

  // Shortcuts read the cursor when pressed; listing them anew on every move would re-render the shell.
  const cursorRef = useRef(cursor);
  useEffect(() => {
    cursorRef.current = cursor;
  }, [cursor]);

  // A filter change can leave the cursor on a row no longer shown: put it on the first one shown.
  useEffect(() => {
    if (position < 0 && shownRows.length > 0 && !editing) setCursor((c) => ({ rowIndex: shownRows[0].index, col: c.col }));
  }, [editing, position, shownRows]);

  const onGridKeyDown = (event: React.KeyboardEvent<HTMLDivElement>) => {
    if (editing || event.altKey || event.metaKey || shownRows.length === 0) return;
    const pos = Math.max(position, 0);
    const move = gridMove(event.key, event.ctrlKey, pos, cursor.col, shownRows.length, channels.length);
    if (move === null || (move === 'edit' && editPass === null)) return;
    event.preventDefault();
    if (move === 'edit') startEdit({ rowIndex: shownRows[pos].index, col: cursor.col });
    else moveTo(move.pos, move.col);
  };

  const shortcuts = useMemo<PageShortcut[]>(
    () => [
      {
        keys: ['f'],
        group: GROUP,
        description: 'Next filter: all, flagged, mismatched, with warnings',
        run: () =>
          setFilter((f) => {
            const usable = SHEET_FILTERS.filter((x) => x !== 'mismatched' || (see1 && see2));
            return usable[(usable.indexOf(f) + 1) % usable.length];
          }),
      },
      { keys: ['c'], group: GROUP, description: 'Put the keyboard in the table', run: focusGrid },
      // Handled by the table itself while it has the keyboard; listed so `?` shows them.
      { keys: ['Arrow keys'], group: GROUP, description: 'Move between cells (PageUp / PageDown: 20 rows)', run: () => undefined },
      ...(editPass !== null
        ? [
            {
              keys: ['Enter'],
              group: GROUP,
              description: `Change your pass ${editPass} entry in the selected cell (Enter saves, Esc leaves it)`,
              run: () => startEdit(cursorRef.current),
            },
          ]
        : []),
    ],
    [editPass, focusGrid, see1, see2, startEdit],
  );
  usePageShortcuts(shortcuts, active);

  const renderCell = (row: SheetRow, col: number) => {
    const channel = channels[col];
    const here = editing !== null && editing.rowIndex === row.index && editing.col === col;
    return (
      <SheetTableCell
        id={`sheet-cell-${row.index}-${col}`}
        symbol={channel.symbol}
        rowNumber={row.index + 1}
        state={cellState(grid, row.index, col)}
        pass1={grid.pass1 ? entryAt(grid, 1, row.index, col) : null}
        pass2={grid.pass2 ? entryAt(grid, 2, row.index, col) : null}
        resolution={grid.resolutions.get(cellKey(row.index, channel.id))}
        active={cursor.rowIndex === row.index && cursor.col === col}
        picked={cellPicked(grid, filter, row.index, col)}
        editPass={editPass}
        edit={
          here
            ? { text: editing.text, error: editing.error, saving: editor.saving, onChange: editor.change, onCommit: editor.commit, onCancel: editor.cancel }
            : null
        }
        onActivate={() => {
          setCursor({ rowIndex: row.index, col });
          focusGrid();
        }}
        onStartEdit={() => startEdit({ rowIndex: row.index, col })}
      />
    );
  };

  if (error) return <ErrorState error={error} onRetry={retry} />;
  if (!ready) return <Skeleton active paragraph={{ rows: 8 }} />;

  return (
    <div className="sheet-table-wrap">
      <div className="card-toolbar">
        <SheetTableFilter value={filter} onChange={setFilter} canCompare={see1 && see2} />
        <Typography.Text type="secondary" className="numeric" aria-live="polite">
          {filter === 'all' ? `${formatCount(grid.rows.length)} rows` : `${formatCount(shownRows.length)} of ${formatCount(grid.rows.length)} rows`}
        </Typography.Text>
        <span className="sheet-legend" aria-hidden>
          {(['agree', 'mismatch', 'flagged', 'missing', 'resolved'] as const).map((state) => (
            <span key={state} className={`sheet-legend-item is-${state}`}>
              {state}
            </span>
          ))}
        </span>
      </div>
      {!see1 && !see2 ? (
        <Alert
          type="info"
          showIcon
          className="form-alert"
          title="You are not assigned to this sheet: its entries are shown to its reader and checker, leads and engineers."
        />
      ) : null}
      {editing?.error ? (
        <Alert
          type="error"
          showIcon
          role="alert"
          className="form-alert"
          title={`Row ${editing.rowIndex + 1}, ${channels[editing.col]?.symbol ?? ''}: ${editing.error}`}
          description="Nothing was saved. Correct the value and press Enter, or press Esc to keep the stored one."
        />
      ) : null}
      {notice ? (
        <Alert
          type="error"
          showIcon
          role="alert"
          className="form-alert"
          title={notice.message}
          closable={{ onClose: () => setNotice(null), 'aria-label': 'Dismiss' }}
          action={
            notice.stale ? (
              <Button
                size="small"
                onClick={() => {
                  if (notice.stale) reloadReading(sheet.id, notice.stale.pass, notice.stale.current);
                  setNotice(null);
                  focusGrid();
                }}
              >
                Reload the stored value
              </Button>
            ) : undefined
          }
        />
      ) : null}
      <SheetGridView
        ref={gridRef}
        label={`Sheet ${sheet.name}: rows by channels`}
        rows={shownRows}
        channels={channels}
        height={height}
        cursorPosition={position}
        activeDescendant={position >= 0 ? `sheet-cell-${cursor.rowIndex}-${cursor.col}` : undefined}
        emptyText={filter === 'all' ? 'This sheet has no rows.' : 'No row matches this filter.'}
        renderCell={renderCell}
        onKeyDown={onGridKeyDown}
      />
      <Typography.Text type="secondary" className="card-footnote">
        Arrow keys move between cells
        {editPass !== null ? `; Enter or a double click changes your pass ${editPass} entry, Enter saves, Esc leaves it` : ''}. Press c to
        put the keyboard in the table.
      </Typography.Text>
    </div>
  );
}
