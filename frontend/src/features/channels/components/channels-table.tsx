import { Button, Popconfirm, Space, Table, Tooltip, Typography } from 'antd';
import { ArrowDownOutlined, ArrowUpOutlined, DeleteOutlined, EditOutlined } from '@ant-design/icons';
import type { Channel } from '@dialsheet/common';
import { formatAccuracy, formatBounds, formatValue } from '../utils/channel-format';
import { useDeleteChannel } from '../api/delete-channel';

const dash = <Typography.Text type="secondary">–</Typography.Text>;

/** A value with its unit beside it, in tabular figures. */
function WithUnit({ text, unit }: { text: string | null; unit: string }) {
  if (text === null) return dash;
  return (
    <span className="numeric channel-value">
      {text}
      <span className="channel-unit"> {unit}</span>
    </span>
  );
}

interface ChannelsTableProps {
  channels: Channel[];
  canEdit: boolean;
  /** True while a new order is being saved; the move buttons wait for it. */
  reordering?: boolean;
  onMove?: (channel: Channel, direction: -1 | 1) => void;
  onEdit?: (channel: Channel) => void;
}

function DeleteChannelButton({ channel }: { channel: Channel }) {
  const remove = useDeleteChannel();
  return (
    <Popconfirm
      title={`Delete channel ${channel.symbol}?`}
      description="Its display region in every run goes too. The audit trail keeps a record of the deletion."
      okText="Delete channel"
      okButtonProps={{ danger: true, loading: remove.isPending }}
      onConfirm={() => remove.mutateAsync({ channelId: channel.id, campaignId: channel.campaignId }).catch(() => undefined)}
    >
      <Button size="small" type="text" danger icon={<DeleteOutlined />} aria-label={`Delete ${channel.symbol}`} />
    </Popconfirm>
  );
}

/** The campaign's channels in their order: what each display shows and how far it can be trusted. */
export function ChannelsTable({ channels, canEdit, reordering = false, onMove, onEdit }: ChannelsTableProps) {
  const last = channels.length - 1;
  return (
    <Table<Channel>
      className="data-table channels-table"
      size="small"
      rowKey="id"
      dataSource={channels}
      pagination={false}
      scroll={{ x: 'max-content' }}
      columns={[
        ...(canEdit
          ? [
              {
                title: <span className="visually-hidden">Order</span>,
                key: 'order',
                width: 64,
                render: (_: unknown, channel: Channel, index: number) => (
                  <Space size={0}>
                    <Button
                      size="small"
                      type="text"
                      icon={<ArrowUpOutlined />}
                      aria-label={`Move ${channel.symbol} up`}
                      disabled={index === 0 || reordering}
                      onClick={() => onMove?.(channel, -1)}
                    />
                    <Button
                      size="small"
                      type="text"
                      icon={<ArrowDownOutlined />}
                      aria-label={`Move ${channel.symbol} down`}
                      disabled={index === last || reordering}
                      onClick={() => onMove?.(channel, 1)}
                    />
                  </Space>
                ),
              },
            ]
          : []),
        { title: 'Symbol', dataIndex: 'symbol', width: 80, render: (symbol: string) => <strong className="channel-symbol">{symbol}</strong> },
        { title: 'Name', dataIndex: 'name' },
        { title: 'Quantity', dataIndex: 'quantity' },
        { title: 'Unit', dataIndex: 'rawUnit', width: 64, render: (unit: string) => <span className="channel-unit-cell">{unit}</span> },
        {
          title: 'Resolution',
          key: 'resolution',
          align: 'right',
          render: (_, c) => <WithUnit text={formatValue(c.resolution)} unit={c.rawUnit} />,
        },
        { title: 'Range', key: 'range', align: 'right', render: (_, c) => <WithUnit text={formatBounds(c.rangeMin, c.rangeMax)} unit={c.rawUnit} /> },
        {
          title: 'Full scale',
          key: 'fullScale',
          align: 'right',
          render: (_, c) => <WithUnit text={c.fullScale === null ? null : formatValue(c.fullScale)} unit={c.rawUnit} />,
        },
        {
          title: 'Operating limits',
          key: 'operating',
          align: 'right',
          render: (_, c) => <WithUnit text={formatBounds(c.operatingMin, c.operatingMax)} unit={c.rawUnit} />,
        },
        {
          title: 'Accuracy',
          key: 'accuracy',
          render: (_, c) => {
            const parts = formatAccuracy(c.accuracy);
            return parts.length === 0 ? (
              dash
            ) : (
              <span className="numeric channel-accuracy">
                {parts.map((part) => (
                  <span key={part} className="channel-accuracy-part">
                    {part}
                  </span>
                ))}
              </span>
            );
          },
        },
        {
          title: (
            <Tooltip title="Readings outside this range are flagged for a second look, not refused">
              <span>Plausible</span>
            </Tooltip>
          ),
          key: 'plausible',
          align: 'right',
          render: (_, c) => <WithUnit text={formatBounds(c.plausibleMin, c.plausibleMax)} unit={c.rawUnit} />,
        },
        ...(canEdit
          ? [
              {
                title: <span className="visually-hidden">Actions</span>,
                key: 'actions',
                width: 72,
                render: (_: unknown, channel: Channel) => (
                  <Space size={0}>
                    <Button size="small" type="text" icon={<EditOutlined />} aria-label={`Edit ${channel.symbol}`} onClick={() => onEdit?.(channel)} />
                    <DeleteChannelButton channel={channel} />
                  </Space>
                ),
              },
            ]
          : []),
      ]}
    />
  );
}
