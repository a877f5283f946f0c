import { useEffect, useRef } from 'react';
import { Table, Tag, Typography } from 'antd';
import type { Channel, MismatchCell } from '@dialsheet/common';
import { cellKey } from '../utils/sheet-grid';
import { formatTime } from '../utils/sheet-format';
import { ReadingText } from './reading-text';

interface MismatchTableProps {
  cells: MismatchCell[];
  channels: Map<string, Channel>;
  selectedKey: string | null;
  nameOf: (userId: string) => string | null;
  onSelect: (cell: MismatchCell) => void;
  onOpen: (cell: MismatchCell) => void;
}

const keyOf = (cell: MismatchCell) => cellKey(cell.rowIndex, cell.channelId);

/** The mismatched cells: both entries as typed, why they are listed, and their resolution. */
export function MismatchTable({ cells, channels, selectedKey, nameOf, onSelect, onOpen }: MismatchTableProps) {
  const wrapper = useRef<HTMLDivElement>(null);

  // Keep the selected cell in view as j / k move through a long list.
  useEffect(() => {
    if (!selectedKey) return;
    const row = wrapper.current?.querySelector<HTMLElement>(`[data-row-key="${CSS.escape(selectedKey)}"]`);
    row?.scrollIntoView?.({ block: 'nearest' });
  }, [selectedKey]);

  return (
    <div ref={wrapper}>
      <Table<MismatchCell>
        className="data-table mismatch-table"
        size="small"
        rowKey={keyOf}
        dataSource={cells}
        pagination={false}
        scroll={{ x: 'max-content', y: 480 }}
        rowClassName={(cell) => `row-clickable${keyOf(cell) === selectedKey ? ' row-selected' : ''}`}
        onRow={(cell) => ({
          onClick: () => onSelect(cell),
          onDoubleClick: () => onOpen(cell),
          'aria-selected': keyOf(cell) === selectedKey,
        })}
        columns={[
          { title: 'Row', key: 'row', width: 64, align: 'right', render: (_, c) => <span className="numeric">{c.rowIndex + 1}</span> },
          { title: 'Test time', key: 'time', width: 100, render: (_, c) => <span className="numeric">{formatTime(c.testTime)}</span> },
          {
            title: 'Channel',
            key: 'channel',
            width: 110,
            render: (_, c) => {
              const channel = channels.get(c.channelId);
              return channel ? (
                <span>
                  <strong className="channel-symbol">{channel.symbol}</strong>{' '}
                  <Typography.Text type="secondary">{channel.rawUnit}</Typography.Text>
                </span>
              ) : (
                <Typography.Text type="secondary">removed channel</Typography.Text>
              );
            },
          },
          { title: 'Pass 1', key: 'pass1', width: 110, render: (_, c) => <ReadingText text={c.pass1.rawText} /> },
          { title: 'Pass 2', key: 'pass2', width: 110, render: (_, c) => <ReadingText text={c.pass2.rawText} /> },
          {
            title: 'Why listed',
            key: 'reasons',
            render: (_, c) => <span className="mismatch-reason-cell">{c.reasons.join(' · ')}</span>,
          },
          {
            title: 'Resolution',
            key: 'resolution',
            render: (_, c) =>
              c.resolution ? (
                <span className="mismatch-resolution-cell">
                  <ReadingText text={c.resolution.rawText} />
                  <Typography.Text type="secondary">
                    {' '}
                    “{c.resolution.reason}” · {nameOf(c.resolution.resolvedBy) ?? 'someone'}
                  </Typography.Text>
                </span>
              ) : (
                <Typography.Text type="secondary">–</Typography.Text>
              ),
          },
          {
            title: 'Status',
            key: 'status',
            width: 90,
            render: (_, c) => (c.resolution ? <Tag color="green">resolved</Tag> : <Tag color="orange">open</Tag>),
          },
        ]}
      />
    </div>
  );
}
