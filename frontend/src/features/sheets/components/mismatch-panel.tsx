import { useEffect, useMemo, useRef, useState } from 'react';
import { Alert, Segmented, Skeleton, Space, Typography } from 'antd';
import type { Channel, MismatchCell, Sheet } from '@dialsheet/common';
import { ErrorState } from '@/components/feedback/error-state';
import { EmptyState } from '@/components/feedback/empty-state';
import { usePageShortcuts, type PageShortcut } from '@/components/shortcuts/page-shortcuts';
import { useMismatches } from '../api/get-mismatches';
import { cellKey } from '../utils/sheet-grid';
import type { RenderFrame } from './frame-target';
import { MismatchTable } from './mismatch-table';
import { ResolutionDrawer } from './resolution-drawer';
import './sheets.css';

type MismatchFilter = 'open' | 'all';

interface MismatchPanelProps {
  sheet: Sheet;
  /** The sheet's channels, in entry order. */
  channels: Channel[];
  decimalComma: boolean;
  canResolve: boolean;
  nameOf: (userId: string) => string | null;
  renderFrame?: RenderFrame;
  /** False while another tab is shown: its keys rest. */
  active: boolean;
}

const GROUP = 'Mismatches';

/** The cells where the passes differ, worked through one by one against the frame. */
export function MismatchPanel({ sheet, channels, decimalComma, canResolve, nameOf, renderFrame, active }: MismatchPanelProps) {
  const mismatches = useMismatches({ sheetId: sheet.id });
  const [filter, setFilter] = useState<MismatchFilter>('open');
  const [selectedKey, setSelectedKey] = useState<string | null>(null);
  const [openKey, setOpenKey] = useState<string | null>(null);
  const byId = useMemo(() => new Map(channels.map((c) => [c.id, c])), [channels]);

  const cells = useMemo(() => {
    const order = new Map(channels.map((c, i) => [c.id, i]));
    const all = (mismatches.data?.cells ?? [])
      .slice()
      .sort((a, b) => a.rowIndex - b.rowIndex || (order.get(a.channelId) ?? 0) - (order.get(b.channelId) ?? 0));
    return filter === 'open' ? all.filter((c) => c.resolution === null) : all;
  }, [channels, filter, mismatches.data]);

  // An open cell stays in the drawer after it is resolved, even when the filter then hides it.
  const allCells = mismatches.data?.cells;
  const openCell = openKey ? allCells?.find((c) => cellKey(c.rowIndex, c.channelId) === openKey) : undefined;
  const selectedIndex = selectedKey ? cells.findIndex((c) => cellKey(c.rowIndex, c.channelId) === selectedKey) : -1;

  // The keys read the list and the selection when pressed, so moving does not list them anew.
  const listRef = useRef({ cells, selectedIndex });
  useEffect(() => {
    listRef.current = { cells, selectedIndex };
  }, [cells, selectedIndex]);
  const shortcuts = useMemo<PageShortcut[]>(() => {
    const move = (by: 1 | -1) => {
      const { cells: list, selectedIndex: at } = listRef.current;
      if (list.length === 0) return;
      const from = at < 0 ? (by === 1 ? -1 : list.length) : at;
      const next = list[Math.min(Math.max(from + by, 0), list.length - 1)];
      const key = cellKey(next.rowIndex, next.channelId);
      setSelectedKey(key);
      // With the drawer open, moving through the list moves the drawer too.
      setOpenKey((open) => (open ? key : open));
    };
    const open = () => {
      const { cells: list, selectedIndex: at } = listRef.current;
      const cell = at >= 0 ? list[at] : list[0];
      if (!cell) return;
      const key = cellKey(cell.rowIndex, cell.channelId);
      setSelectedKey(key);
      setOpenKey(key);
    };
    return [
      { keys: ['j'], group: GROUP, description: 'Next mismatch', run: () => move(1) },
      { keys: ['k'], group: GROUP, description: 'Previous mismatch', run: () => move(-1) },
      { keys: ['ArrowDown'], group: GROUP, description: 'Next mismatch', run: () => move(1) },
      { keys: ['ArrowUp'], group: GROUP, description: 'Previous mismatch', run: () => move(-1) },
      { keys: ['Enter'], group: GROUP, description: 'Open the selected mismatch against its frame', run: open },
    ];
  }, []);
  usePageShortcuts(shortcuts, active);

  if (mismatches.isPending) return <Skeleton active paragraph={{ rows: 6 }} />;
  if (mismatches.isError) return <ErrorState error={mismatches.error} onRetry={() => void mismatches.refetch()} />;
  const data = mismatches.data;
  const select = (cell: MismatchCell) => setSelectedKey(cellKey(cell.rowIndex, cell.channelId));
  const openOne = (cell: MismatchCell) => {
    select(cell);
    setOpenKey(cellKey(cell.rowIndex, cell.channelId));
  };
  const openChannel = openCell ? byId.get(openCell.channelId) : undefined;
  const openIndex = openCell ? cells.findIndex((c) => c === openCell) : -1;

  return (
    <Space orientation="vertical" size={12} className="full-width mismatch-panel">
      <div className="card-toolbar">
        <Segmented<MismatchFilter>
          value={filter}
          onChange={setFilter}
          options={[
            { value: 'open', label: `Open (${data.open})` },
            { value: 'all', label: `All (${data.open + data.resolved})` },
          ]}
          aria-label="Which mismatches to list"
        />
        <Typography.Text type="secondary" className="numeric">
          {data.resolved} resolved, {data.open} open
        </Typography.Text>
      </div>
      {!data.complete ? (
        <Alert
          type="info"
          showIcon
          title="Both passes are not finished yet: the list covers the cells typed in both so far and may grow."
        />
      ) : null}
      {cells.length === 0 ? (
        <EmptyState
          title={filter === 'open' && data.resolved > 0 ? 'Every mismatch is resolved' : 'No mismatches'}
          description={
            filter === 'open' && data.resolved > 0
              ? 'Show all to look at the resolutions again.'
              : 'The two passes agree on every cell both have typed.'
          }
        />
      ) : (
        <MismatchTable
          cells={cells}
          channels={byId}
          selectedKey={selectedKey}
          nameOf={nameOf}
          onSelect={select}
          onOpen={openOne}
        />
      )}
      {cells.length > 0 ? (
        <Typography.Text type="secondary" className="card-footnote">
          j / k or ↑ / ↓ move through the list, Enter opens the cell against its frame, Esc closes it.
        </Typography.Text>
      ) : null}
      {openCell && openChannel ? (
        <ResolutionDrawer
          sheetId={sheet.id}
          cell={openCell}
          channel={openChannel}
          position={{ index: Math.max(openIndex, 0), count: cells.length }}
          decimalComma={decimalComma}
          canResolve={canResolve}
          nameOf={nameOf}
          renderFrame={renderFrame}
          onClose={() => setOpenKey(null)}
        />
      ) : null}
    </Space>
  );
}
