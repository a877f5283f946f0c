import { useEffect, useRef, type KeyboardEventHandler, type ReactNode } from 'react';
import { useVirtualizer, type Rect } from '@tanstack/react-virtual';
import type { Channel, SheetRow } from '@dialsheet/common';
import { formatTime } from '../utils/sheet-format';

interface SheetGridViewProps {
  label: string;
  rows: SheetRow[];
  channels: Channel[];
  /** Height of the scrolling area, px. */
  height: number;
  /** Position (in `rows`) of the row holding the keyboard cursor, kept in view; -1 for none. */
  cursorPosition: number;
  activeDescendant?: string;
  emptyText: string;
  renderCell: (row: SheetRow, col: number) => ReactNode;
  onKeyDown: KeyboardEventHandler<HTMLDivElement>;
  ref?: React.Ref<HTMLDivElement>;
}

export const ROW_HEIGHT = 32;
const HEADER_HEIGHT = 34;
const ROW_WIDTH = 64;
const TIME_WIDTH = 116;
const CELL_WIDTH = 148;
const OVERSCAN = 8;

/**
 * The sheet table's rows × channels as a plain CSS grid, with only the rows in view in the page
 * (ten thousand rows of six channels are 60 000 cells; about thirty rows are drawn at a time).
 * Every row has the same height, so the scroll position alone says which rows are in view.
 * Row number and test time stay put on the left, channel names on top.
 */
export function SheetGridView({ label, rows, channels, height, cursorPosition, activeDescendant, emptyText, renderCell, onKeyDown, ref }: SheetGridViewProps) {
  const scrollRef = useRef<HTMLDivElement>(null);
  const viewport: Rect = { width: 0, height };
  const virtualizer = useVirtualizer({
    count: rows.length,
    getScrollElement: () => scrollRef.current,
    estimateSize: () => ROW_HEIGHT,
    overscan: OVERSCAN,
    paddingStart: HEADER_HEIGHT,
    scrollPaddingStart: HEADER_HEIGHT,
    // The scrolling area's height is set here, not measured: the first render already draws the
    // right rows (no second pass after a measurement), and it works the same without layout.
    initialRect: viewport,
    observeElementRect: (_instance, notify) => notify(viewport),
  });

  useEffect(() => {
    if (cursorPosition < 0 || cursorPosition >= rows.length) return;
    // Every row has the same height, so whether the cursor's row is in full view is known from the
    // scroll offset the virtualizer keeps; scrolling only when it is not saves the forced layout
    // of a scroll that moves nothing (as when the table opens on its first row).
    const top = virtualizer.scrollOffset ?? 0;
    const start = HEADER_HEIGHT + cursorPosition * ROW_HEIGHT;
    if (start >= top + HEADER_HEIGHT && start + ROW_HEIGHT <= top + height) return;
    virtualizer.scrollToIndex(cursorPosition, { align: 'auto' });
  }, [cursorPosition, height, rows.length, virtualizer]);

  const columns = `${ROW_WIDTH}px ${TIME_WIDTH}px repeat(${channels.length}, minmax(${CELL_WIDTH}px, 1fr))`;
  const minWidth = ROW_WIDTH + TIME_WIDTH + CELL_WIDTH * channels.length;

  return (
    <div
      ref={ref}
      role="grid"
      tabIndex={0}
      aria-label={label}
      aria-rowcount={rows.length + 1}
      aria-colcount={channels.length + 2}
      aria-activedescendant={activeDescendant}
      className="sheet-grid"
      onKeyDown={onKeyDown}
    >
      <div ref={scrollRef} className="sheet-grid-scroll" style={{ height }}>
        <div className="sheet-grid-content" style={{ height: virtualizer.getTotalSize(), minWidth }}>
          <div role="row" aria-rowindex={1} className="sheet-grid-row sheet-grid-head" style={{ gridTemplateColumns: columns, height: HEADER_HEIGHT }}>
            <div role="columnheader" className="sheet-grid-sticky is-number">
              Row
            </div>
            <div role="columnheader" className="sheet-grid-sticky is-time">
              Test time
            </div>
            {channels.map((channel) => (
              <div role="columnheader" key={channel.id} className="sheet-grid-header-cell">
                <strong className="channel-symbol">{channel.symbol}</strong> <span className="channel-unit">{channel.rawUnit}</span>
              </div>
            ))}
          </div>
          {rows.length === 0 ? <div className="sheet-grid-empty">{emptyText}</div> : null}
          {virtualizer.getVirtualItems().map((item) => {
            const row = rows[item.index];
            return (
              <div
                role="row"
                key={row.index}
                aria-rowindex={item.index + 2}
                className="sheet-grid-row"
                style={{ gridTemplateColumns: columns, height: ROW_HEIGHT, transform: `translateY(${item.start}px)` }}
              >
                <div role="rowheader" className="sheet-grid-sticky is-number numeric">
                  {row.index + 1}
                </div>
                <div className="sheet-grid-sticky is-time numeric">{formatTime(row.testTime)}</div>
                {channels.map((channel, col) => (
                  <div key={channel.id} className="sheet-grid-cell">
                    {renderCell(row, col)}
                  </div>
                ))}
              </div>
            );
          })}
        </div>
      </div>
    </div>
  );
}
