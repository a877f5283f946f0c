import { useState } from 'react';
import { Alert, Button, Card, Flex, Input, Select, Table, Tooltip, Typography } from 'antd';
import { CloseOutlined, SaveOutlined } from '@ant-design/icons';
import type { Channel, DisplayRegionInput } from '@dialsheet/common';
import { errorMessage } from '@/lib/api-client';
import type { RegionEditor } from '../hooks/use-region-editor';
import { channelLabel } from '../utils/channel-format';

interface DisplayRegionsCardProps {
  editor: RegionEditor;
  channels: Channel[];
  /** False while the video cannot be shown: there is no frame to draw on. */
  videoReady: boolean;
}

interface RegionRow extends DisplayRegionInput {
  channel: Channel;
}

const pct = (fraction: number) => `${(fraction * 100).toFixed(1)} %`;

/** Pick a channel, drag a box round its display on the still frame; save the run's set at once. */
export function DisplayRegionsCard({ editor, channels, videoReady }: DisplayRegionsCardProps) {
  const [reason, setReason] = useState('');
  const byId = new Map(channels.map((c) => [c.id, c]));
  const drawn = new Set(editor.regions.map((r) => r.channelId));
  const rows: RegionRow[] = channels
    .map((channel) => {
      const region = editor.regions.find((r) => r.channelId === channel.id);
      return region ? { ...region, channel } : null;
    })
    .filter((row): row is RegionRow => row !== null);
  const active = editor.activeChannelId ? byId.get(editor.activeChannelId) : undefined;

  if (channels.length === 0) {
    return (
      <Card size="small" className="section-card" title="Display regions">
        <Typography.Paragraph type="secondary" className="card-footnote">
          This campaign has no channels yet. Add them on the Channels page, then mark where each display sits in this run’s frame.
        </Typography.Paragraph>
      </Card>
    );
  }

  return (
    <Card size="small" className="section-card" title="Display regions">
      {videoReady ? (
        <>
          <Select<string>
            className="full-width"
            placeholder="Pick a channel, then drag a box round its display"
            aria-label="Channel to draw"
            allowClear
            value={editor.activeChannelId ?? undefined}
            onChange={(value) => editor.setActiveChannelId(value ?? null)}
            options={channels.map((c) => ({ value: c.id, label: `${channelLabel(c)}${drawn.has(c.id) ? ' ✓' : ''}` }))}
            disabled={editor.saving}
          />
          <Typography.Paragraph type="secondary" className="region-help">
            {active
              ? `Drag on the frame round the display of ${active.symbol}. Esc cancels a drag.`
              : 'Step to a frame where every display is clear, pick a channel and drag a box round it.'}
          </Typography.Paragraph>
        </>
      ) : (
        <Typography.Paragraph type="secondary" className="card-footnote">
          Regions are drawn on the video once it is ready to play.
        </Typography.Paragraph>
      )}
      {rows.length > 0 ? (
        <Table<RegionRow>
          size="small"
          className="data-table"
          pagination={false}
          rowKey="channelId"
          dataSource={rows}
          columns={[
            { title: 'Channel', key: 'symbol', render: (_, row) => <Tooltip title={row.channel.name}>{row.channel.symbol}</Tooltip> },
            { title: 'Left', dataIndex: 'x', align: 'right', render: (v: number) => <span className="numeric">{pct(v)}</span> },
            { title: 'Top', dataIndex: 'y', align: 'right', render: (v: number) => <span className="numeric">{pct(v)}</span> },
            {
              title: 'Size',
              key: 'size',
              align: 'right',
              render: (_, row) => (
                <span className="numeric">
                  {pct(row.width)} × {pct(row.height)}
                </span>
              ),
            },
            {
              key: 'remove',
              width: 40,
              render: (_, row) => (
                <Button
                  size="small"
                  type="text"
                  icon={<CloseOutlined />}
                  aria-label={`Remove the region of ${row.channel.symbol}`}
                  onClick={() => editor.removeRegion(row.channelId)}
                  disabled={editor.saving}
                />
              ),
            },
          ]}
        />
      ) : (
        <Typography.Paragraph type="secondary">No regions marked in this run yet.</Typography.Paragraph>
      )}
      {editor.dirty ? (
        <div className="region-save">
          <Input
            value={reason}
            onChange={(event) => setReason(event.target.value)}
            placeholder="Reason for the change (optional, kept in the audit trail)"
            aria-label="Reason for the change"
            maxLength={500}
          />
          <Flex gap={8} justify="flex-end">
            <Button onClick={editor.discard} disabled={editor.saving}>
              Discard
            </Button>
            <Button
              type="primary"
              icon={<SaveOutlined />}
              loading={editor.saving}
              onClick={() => editor.submit(reason)}
            >
              Save regions
            </Button>
          </Flex>
        </div>
      ) : null}
      {editor.saveError ? <Alert type="error" showIcon title={errorMessage(editor.saveError)} role="alert" className="sync-error" /> : null}
    </Card>
  );
}
