import { useState } from 'react';
import { useParams } from 'react-router-dom';
import { Alert, Button, Card, Skeleton, Typography } from 'antd';
import { PlusOutlined } from '@ant-design/icons';
import type { Channel } from '@dialsheet/common';
import { PageHeader } from '@/components/ui/page-header';
import { EmptyState } from '@/components/feedback/empty-state';
import { ErrorState } from '@/components/feedback/error-state';
import { useDocumentTitle } from '@/hooks/use-document-title';
import { errorMessage } from '@/lib/api-client';
import { useCampaign } from '@/features/campaigns/api/get-campaign';
import { useChannels } from '@/features/channels/api/get-channels';
import { useReorderChannels } from '@/features/channels/api/reorder-channels';
import { ChannelsTable } from '@/features/channels/components/channels-table';
import { ChannelFormModal } from '@/features/channels/components/channel-form-modal';

/** The order with one channel moved one place up (-1) or down (+1). */
export function movedOrder(channels: Channel[], channelId: string, direction: -1 | 1): string[] {
  const ids = channels.map((c) => c.id);
  const from = ids.indexOf(channelId);
  const to = from + direction;
  if (from < 0 || to < 0 || to >= ids.length) return ids;
  [ids[from], ids[to]] = [ids[to], ids[from]];
  return ids;
}

export function CampaignChannelsRoute() {
  const { campaignId = '' } = useParams();
  const { data: campaign } = useCampaign({ campaignId });
  const channels = useChannels({ campaignId });
  const reorder = useReorderChannels();
  // undefined: closed; null: a new channel; a channel: editing it.
  const [editing, setEditing] = useState<Channel | null | undefined>(undefined);
  useDocumentTitle(campaign ? `Channels · ${campaign.name}` : 'Channels');
  if (!campaign) return null;

  const canEdit = campaign.myRoles.includes('lead') || campaign.myRoles.includes('engineer');
  const addButton = canEdit ? (
    <Button type="primary" icon={<PlusOutlined />} onClick={() => setEditing(null)}>
      New channel
    </Button>
  ) : null;

  const move = (channel: Channel, direction: -1 | 1) => {
    if (!channels.data) return;
    reorder.mutate({ campaignId: campaign.id, channelIds: movedOrder(channels.data, channel.id, direction) });
  };

  return (
    <>
      <PageHeader title="Channels" subtitle={campaign.name} actions={addButton} />
      <Card size="small" className="section-card">
        {channels.isPending ? (
          <Skeleton active paragraph={{ rows: 5 }} />
        ) : channels.isError ? (
          <ErrorState error={channels.error} onRetry={() => void channels.refetch()} />
        ) : channels.data.length === 0 ? (
          <EmptyState
            title="No channels yet"
            description={
              <>
                A channel is one instrument display filmed during the runs: a thermometer, a pressure gauge, a flow meter.
                It holds what the display shows, in which unit, how fine its last digit is and how accurate it is.{' '}
                {canEdit ? 'Add one for each display in view.' : 'A lead or engineer of this campaign adds them.'}
              </>
            }
            action={addButton}
          />
        ) : (
          <ChannelsTable channels={channels.data} canEdit={canEdit} reordering={reorder.isPending} onMove={move} onEdit={setEditing} />
        )}
        {reorder.isError ? (
          <Alert type="error" showIcon title={`The new order was not saved: ${errorMessage(reorder.error)}`} className="card-footnote" />
        ) : null}
        {!canEdit && channels.data && channels.data.length > 0 ? (
          <Typography.Paragraph type="secondary" className="card-footnote">
            Only a lead or engineer of this campaign adds or changes channels.
          </Typography.Paragraph>
        ) : null}
      </Card>
      {canEdit ? (
        <ChannelFormModal
          key={editing?.id ?? 'new'}
          campaignId={campaign.id}
          channel={editing ?? undefined}
          open={editing !== undefined}
          onClose={() => setEditing(undefined)}
          onSaved={() => setEditing(undefined)}
        />
      ) : null}
    </>
  );
}
