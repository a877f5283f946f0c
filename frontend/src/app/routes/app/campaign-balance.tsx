import { Link, useParams } from 'react-router-dom';
import { Breadcrumb } from 'antd';
import { paths } from '@/config/paths';
import { PageHeader } from '@/components/ui/page-header';
import { useDocumentTitle } from '@/hooks/use-document-title';
import { useCampaign } from '@/features/campaigns/api/get-campaign';
import { useChannels } from '@/features/channels/api/get-channels';
import { useRuns } from '@/features/runs/api/get-runs';
import { useDerivedChannels } from '@/features/analysis/api/get-derived-channels';
import { BalanceView } from '@/features/analysis/components/balance-view';
import { mayEditAnalysis } from '@/features/analysis/utils/analysis-access';

/** Mass and energy balances across runs, from saved stable values. */
export function CampaignBalanceRoute() {
  const { campaignId = '' } = useParams();
  const { data: campaign } = useCampaign({ campaignId });
  const channels = useChannels({ campaignId });
  const runs = useRuns({ campaignId });
  const derived = useDerivedChannels({ campaignId });
  useDocumentTitle(campaign ? `Balances · ${campaign.name}` : 'Balances');
  if (!campaign) return null;
  const channelName = (id: string) =>
    channels.data?.find((c) => c.id === id)?.symbol ?? derived.data?.find((d) => d.id === id)?.symbol ?? 'unknown channel';
  const runName = (id: string) => runs.data?.find((r) => r.id === id)?.name ?? 'unknown run';
  return (
    <>
      <Breadcrumb
        className="page-breadcrumb"
        items={[{ title: <Link to={paths.campaignAnalysis.getHref(campaign.id)}>Analysis</Link> }, { title: 'Balances' }]}
      />
      <PageHeader title="Balances" subtitle="Streams in against streams out, each from its own run at its own t*" />
      <BalanceView campaignId={campaign.id} canEdit={mayEditAnalysis(campaign.myRoles)} channelName={channelName} runName={runName} />
    </>
  );
}
