import { Link, useParams } from 'react-router-dom';
import { Breadcrumb, Button, Card, Skeleton, Space } from 'antd';
import { paths } from '@/config/paths';
import { PageHeader } from '@/components/ui/page-header';
import { ErrorState } from '@/components/feedback/error-state';
import { useDocumentTitle } from '@/hooks/use-document-title';
import { isApiError } from '@/lib/api-client';
import { useCampaign } from '@/features/campaigns/api/get-campaign';
import { useChannels } from '@/features/channels/api/get-channels';
import { useRun } from '@/features/runs/api/get-run';
import { useDerivedChannels } from '@/features/analysis/api/get-derived-channels';
import { RunAnalysisView } from '@/features/analysis/components/run-analysis-view';
import { StableValuesTable } from '@/features/analysis/components/stable-values-table';
import { mayEditAnalysis, mayReadSeries } from '@/features/analysis/utils/analysis-access';

/** One run's trend fits and stable values. */
export function RunAnalysisRoute() {
  const { campaignId = '', runId = '' } = useParams();
  const { data: campaign } = useCampaign({ campaignId });
  const run = useRun({ runId });
  const channels = useChannels({ campaignId });
  const derived = useDerivedChannels({ campaignId });
  useDocumentTitle(run.data ? `Analysis · ${run.data.name}` : 'Run analysis');
  if (!campaign) return null;
  if (run.isPending || channels.isPending) return <Skeleton active paragraph={{ rows: 10 }} />;
  if (run.isError || run.data.campaignId !== campaign.id) {
    const missing = run.isError ? isApiError(run.error, 404) : true;
    return (
      <ErrorState
        error={run.error}
        title={missing ? 'Run not found' : undefined}
        description={missing ? 'It does not exist in this campaign, or it was deleted.' : undefined}
        onRetry={() => void run.refetch()}
      />
    );
  }
  if (channels.isError) return <ErrorState error={channels.error} onRetry={() => void channels.refetch()} />;
  const canEdit = mayEditAnalysis(campaign.myRoles);
  const channelName = (id: string) =>
    channels.data.find((c) => c.id === id)?.symbol ?? derived.data?.find((d) => d.id === id)?.symbol ?? 'unknown channel';

  return (
    <>
      <Breadcrumb
        className="page-breadcrumb"
        items={[
          { title: <Link to={paths.campaignRuns.getHref(campaign.id)}>Runs</Link> },
          { title: <Link to={paths.run.getHref(campaign.id, run.data.id)}>{run.data.name}</Link> },
          { title: 'Analysis' },
        ]}
      />
      <PageHeader
        title={`Analysis of ${run.data.name}`}
        subtitle="Trend fit, stable value at t* and its uncertainty"
        actions={
          <Space>
            <Link to={paths.campaignAnalysis.getHref(campaign.id)}>
              <Button>Calibrations and rules</Button>
            </Link>
            <Link to={paths.campaignBalance.getHref(campaign.id)}>
              <Button>Balances</Button>
            </Link>
          </Space>
        }
      />
      <Space orientation="vertical" size={16} className="full-width">
        <RunAnalysisView campaignId={campaign.id} runId={run.data.id} channels={channels.data} canEdit={canEdit} canReadSeries={mayReadSeries(campaign.myRoles)} />
        <Card size="small" className="section-card" title="Stable values of this run">
          <StableValuesTable campaignId={campaign.id} runId={run.data.id} canEdit={canEdit} channelName={channelName} />
        </Card>
      </Space>
    </>
  );
}
