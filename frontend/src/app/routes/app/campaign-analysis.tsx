import { Link, useParams } from 'react-router-dom';
import { Breadcrumb, Button, Card, Col, Row, Skeleton } from 'antd';
import { paths } from '@/config/paths';
import { PageHeader } from '@/components/ui/page-header';
import { ErrorState } from '@/components/feedback/error-state';
import { useDocumentTitle } from '@/hooks/use-document-title';
import { useCampaign } from '@/features/campaigns/api/get-campaign';
import { useChannels } from '@/features/channels/api/get-channels';
import { useRuns } from '@/features/runs/api/get-runs';
import { useDerivedChannels } from '@/features/analysis/api/get-derived-channels';
import { CalibrationsCard } from '@/features/analysis/components/calibrations-card';
import { DerivedChannelsCard } from '@/features/analysis/components/derived-channels-card';
import { StabilityRulesCard } from '@/features/analysis/components/stability-rules-card';
import { StableValuesTable } from '@/features/analysis/components/stable-values-table';
import { ResultCaution } from '@/features/analysis/components/result-caution';
import { mayEditAnalysis } from '@/features/analysis/utils/analysis-access';

/** The campaign's analysis set-up (calibrations, derived channels, rules) and its stable values. */
export function CampaignAnalysisRoute() {
  const { campaignId = '' } = useParams();
  const { data: campaign } = useCampaign({ campaignId });
  const channels = useChannels({ campaignId });
  const runs = useRuns({ campaignId });
  const derived = useDerivedChannels({ campaignId });
  useDocumentTitle(campaign ? `Analysis · ${campaign.name}` : 'Analysis');
  if (!campaign) return null;
  const canEdit = mayEditAnalysis(campaign.myRoles);
  const channelName = (id: string) =>
    channels.data?.find((c) => c.id === id)?.symbol ?? derived.data?.find((d) => d.id === id)?.symbol ?? 'unknown channel';
  const runName = (id: string) => runs.data?.find((r) => r.id === id)?.name ?? 'unknown run';

  return (
    <>
      <Breadcrumb className="page-breadcrumb" items={[{ title: <Link to={paths.campaign.getHref(campaign.id)}>{campaign.name}</Link> }, { title: 'Analysis' }]} />
      <PageHeader
        title="Analysis"
        subtitle="Calibrations, derived channels, stability rules and the stable values of every run"
        actions={
          <Link to={paths.campaignBalance.getHref(campaign.id)}>
            <Button>Balances</Button>
          </Link>
        }
      />
      {channels.isPending ? (
        <Skeleton active paragraph={{ rows: 6 }} />
      ) : channels.isError ? (
        <ErrorState error={channels.error} onRetry={() => void channels.refetch()} />
      ) : (
        <Row gutter={[16, 16]}>
          <Col span={24}>
            <CalibrationsCard campaignId={campaign.id} channels={channels.data} canEdit={canEdit} />
          </Col>
          <Col xs={24} xl={12}>
            <DerivedChannelsCard campaignId={campaign.id} channels={channels.data} canEdit={canEdit} />
          </Col>
          <Col xs={24} xl={12}>
            <StabilityRulesCard campaignId={campaign.id} channels={channels.data} canEdit={canEdit} />
          </Col>
          <Col span={24}>
            <Card size="small" className="section-card" title="Stable values of every run">
              <StableValuesTable campaignId={campaign.id} canEdit={canEdit} channelName={channelName} runName={runName} />
            </Card>
          </Col>
          <Col span={24}>
            <ResultCaution />
          </Col>
        </Row>
      )}
    </>
  );
}
