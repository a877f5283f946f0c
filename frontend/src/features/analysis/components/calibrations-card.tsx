import { useState } from 'react';
import { Button, Card, Skeleton, Table, Tag, Typography } from 'antd';
import { EditOutlined } from '@ant-design/icons';
import type { Channel, ChannelCalibration } from '@dialsheet/common';
import { EmptyState } from '@/components/feedback/empty-state';
import { ErrorState } from '@/components/feedback/error-state';
import { useCalibrations } from '../api/get-calibrations';
import { describeChain } from '../utils/chain-draft';
import { CalibrationEditor } from './calibration-editor';
import './analysis.css';

interface CalibrationsCardProps {
  campaignId: string;
  channels: Channel[];
  canEdit: boolean;
}

/** Every channel with its raw → engineering chain; the engineer edits one in a dialog. */
export function CalibrationsCard({ campaignId, channels, canEdit }: CalibrationsCardProps) {
  const calibrations = useCalibrations({ campaignId });
  const [editing, setEditing] = useState<Channel | null>(null);
  const byChannel = new Map<string, ChannelCalibration>((calibrations.data ?? []).map((c) => [c.channelId, c]));

  return (
    <Card size="small" className="section-card" title="Calibrations">
      {calibrations.isPending ? (
        <Skeleton active paragraph={{ rows: 3 }} />
      ) : calibrations.isError ? (
        <ErrorState error={calibrations.error} onRetry={() => void calibrations.refetch()} />
      ) : channels.length === 0 ? (
        <EmptyState title="No channels yet" description="Add the campaign’s channels first; each can then carry a calibration chain." />
      ) : (
        <Table<Channel>
          size="small"
          className="data-table"
          rowKey="id"
          pagination={false}
          dataSource={channels}
          columns={[
            { title: 'Channel', key: 'channel', render: (_, c) => <><Typography.Text strong>{c.symbol}</Typography.Text> {c.name}</> },
            { title: 'Display unit', dataIndex: 'rawUnit' },
            {
              title: 'Chain',
              key: 'chain',
              render: (_, c) => {
                const cal = byChannel.get(c.id);
                return cal ? describeChain(cal.chain.steps) : <Typography.Text type="secondary">none (used as displayed)</Typography.Text>;
              },
            },
            {
              title: 'Engineering unit',
              key: 'unit',
              render: (_, c) => byChannel.get(c.id)?.engineeringUnit ?? c.rawUnit,
            },
            { title: 'Version', key: 'version', render: (_, c) => (byChannel.has(c.id) ? <Tag>v{byChannel.get(c.id)!.version}</Tag> : null) },
            ...(canEdit
              ? [
                  {
                    title: '',
                    key: 'edit',
                    render: (_: unknown, c: Channel) => (
                      <Button size="small" icon={<EditOutlined />} aria-label={`Edit calibration of ${c.symbol}`} onClick={() => setEditing(c)}>
                        Calibration
                      </Button>
                    ),
                  },
                ]
              : []),
          ]}
        />
      )}
      {!canEdit ? (
        <Typography.Paragraph type="secondary" className="card-footnote">
          Only an engineer of this campaign sets calibrations.
        </Typography.Paragraph>
      ) : null}
      {canEdit && editing ? (
        <CalibrationEditor
          key={editing.id}
          campaignId={campaignId}
          channel={editing}
          calibration={byChannel.get(editing.id)}
          open
          onClose={() => setEditing(null)}
        />
      ) : null}
    </Card>
  );
}
