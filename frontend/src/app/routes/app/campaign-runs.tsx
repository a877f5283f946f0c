import { useState } from 'react';
import { useNavigate, useParams } from 'react-router-dom';
import { Button, Card, Skeleton, Typography } from 'antd';
import { PlusOutlined } from '@ant-design/icons';
import { paths } from '@/config/paths';
import { PageHeader } from '@/components/ui/page-header';
import { EmptyState } from '@/components/feedback/empty-state';
import { ErrorState } from '@/components/feedback/error-state';
import { useDocumentTitle } from '@/hooks/use-document-title';
import { isProcessing } from '@/lib/recording-status';
import { useCampaign } from '@/features/campaigns/api/get-campaign';
import { useRuns } from '@/features/runs/api/get-runs';
import { RunsTable } from '@/features/runs/components/runs-table';
import { RunFormModal } from '@/features/runs/components/run-form-modal';

/** While a video is being processed the list follows its progress, more slowly than the run page. */
const LIST_POLL_MS = 2000;

export function CampaignRunsRoute() {
  const { campaignId = '' } = useParams();
  const navigate = useNavigate();
  const { data: campaign } = useCampaign({ campaignId });
  const runs = useRuns({
    campaignId,
    queryConfig: {
      refetchInterval: (query) => (query.state.data?.some((run) => isProcessing(run.recording)) ? LIST_POLL_MS : false),
    },
  });
  const [creating, setCreating] = useState(false);
  useDocumentTitle(campaign ? `Runs · ${campaign.name}` : 'Runs');
  if (!campaign) return null;

  const canEdit = campaign.myRoles.includes('lead') || campaign.myRoles.includes('engineer');
  const newRunButton = canEdit ? (
    <Button type="primary" icon={<PlusOutlined />} onClick={() => setCreating(true)}>
      New run
    </Button>
  ) : null;

  return (
    <>
      <PageHeader title="Runs" subtitle={campaign.name} actions={newRunButton} />
      <Card size="small" className="section-card">
        {runs.isPending ? (
          <Skeleton active paragraph={{ rows: 5 }} />
        ) : runs.isError ? (
          <ErrorState error={runs.error} onRetry={() => void runs.refetch()} />
        ) : runs.data.length === 0 ? (
          <EmptyState
            title="No runs yet"
            description={
              canEdit
                ? 'A run is one recording of the rig in one configuration. Create one, then upload its video.'
                : 'A lead or engineer of this campaign adds runs and their videos.'
            }
            action={newRunButton}
          />
        ) : (
          <RunsTable runs={runs.data} />
        )}
        {!canEdit && runs.data && runs.data.length > 0 ? (
          <Typography.Paragraph type="secondary" className="card-footnote">
            Only a lead or engineer of this campaign creates runs and uploads videos.
          </Typography.Paragraph>
        ) : null}
      </Card>
      {canEdit ? (
        <RunFormModal
          campaignId={campaign.id}
          open={creating}
          onClose={() => setCreating(false)}
          onSaved={(run) => {
            setCreating(false);
            navigate(paths.run.getHref(campaign.id, run.id));
          }}
        />
      ) : null}
    </>
  );
}
