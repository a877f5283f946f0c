import { memo } from 'react';
import { Progress, Typography } from 'antd';
import type { SheetRow } from '@dialsheet/common';
import { formatTime } from '../../utils/sheet-format';
import { ROW_STATE_LABELS, type RowState } from './entry-rows';

interface RowListProps {
  rows: readonly SheetRow[];
  current: number;
  /** State of every row, by index. */
  states: readonly RowState[];
  onSelect: (rowIndex: number) => void;
}

/** Rows listed either side of the current one. */
const AROUND = 5;
/** The strip shows at most this many cells; longer sheets share a cell between neighbouring rows. */
const STRIP_CELLS = 120;

// Worst first: a cell standing for several rows shows the state that needs attention most.
const SEVERITY: RowState[] = ['conflict', 'failed', 'draft', 'sending', 'pending', 'partial', 'empty', 'saved'];

function worst(states: readonly RowState[], from: number, to: number): RowState {
  let best = SEVERITY.length - 1;
  for (let i = from; i < to; i++) best = Math.min(best, SEVERITY.indexOf(states[i]));
  return SEVERITY[best];
}

/**
 * Where the person is in the sheet: a strip over all rows (each cell coloured by its state), the
 * count of rows saved, and the rows around the current one with their state. Clicking a row goes
 * there; the keyboard does the same with PageUp, PageDown and Ctrl+G.
 */
export const RowList = memo(function RowList({ rows, current, states, onSelect }: RowListProps) {
  const total = rows.length;
  const saved = states.filter((s) => s === 'saved').length;
  const waiting = states.filter((s) => s === 'pending' || s === 'sending').length;
  const cells = Math.min(total, STRIP_CELLS);
  const perCell = total / Math.max(cells, 1);
  const start = Math.max(0, Math.min(current - AROUND, total - (2 * AROUND + 1)));
  const visible = rows.slice(start, start + 2 * AROUND + 1);

  return (
    <section className="entry-rows" aria-label="Rows">
      <div className="entry-rows-progress">
        <Typography.Text strong className="numeric" data-testid="entry-progress">
          {saved} of {total} rows saved
        </Typography.Text>
        {waiting > 0 ? (
          <Typography.Text type="secondary" className="numeric">
            {' '}
            · {waiting} waiting
          </Typography.Text>
        ) : null}
        <Progress percent={total > 0 ? (saved / total) * 100 : 0} showInfo={false} size="small" strokeColor="var(--ds-accent)" />
      </div>
      <div className="entry-strip" aria-hidden="true">
        {Array.from({ length: cells }, (_, cell) => {
          const from = Math.floor(cell * perCell);
          const to = Math.max(from + 1, Math.floor((cell + 1) * perCell));
          const here = current >= from && current < to;
          return (
            <span
              key={cell}
              className={`entry-strip-cell state-${worst(states, from, to)}${here ? ' is-current' : ''}`}
              onClick={() => onSelect(from)}
            />
          );
        })}
      </div>
      <ol className="entry-row-list" start={start + 1}>
        {visible.map((row) => {
          const state = states[row.index];
          const isCurrent = row.index === current;
          return (
            <li key={row.index} className={`entry-row-item${isCurrent ? ' is-current' : ''}`} aria-current={isCurrent ? 'step' : undefined} data-testid={`entry-row-${row.index}`} data-state={state}>
              <button type="button" tabIndex={-1} className="entry-row-button" onClick={() => onSelect(row.index)}>
                <span className="entry-row-number numeric">{row.index + 1}</span>
                <span className="entry-row-time numeric">{formatTime(row.testTime)}</span>
                <span className={`entry-row-state state-${state}`}>
                  <span className="entry-state-dot" />
                  {ROW_STATE_LABELS[state]}
                </span>
              </button>
            </li>
          );
        })}
      </ol>
    </section>
  );
});
