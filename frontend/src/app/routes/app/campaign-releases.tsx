import { useParams } from 'react-router-dom';
import { PageHeader } from '@/components/ui/page-header';
import { useDocumentTitle } from '@/hooks/use-document-title';
import { useCampaign } from '@/features/campaigns/api/get-campaign';
import { useRuns } from '@/features/runs/api/get-runs';
import { ReleasesView } from '@/features/releases/components/releases-view';

/** Numbered, signed, locked versions of the campaign's data, and their exports. */
export function CampaignReleasesRoute() {
  const { campaignId = '' } = useParams();
  const { data: campaign } = useCampaign({ campaignId });
  const runs = useRuns({ campaignId });
  useDocumentTitle(campaign ? `Releases · ${campaign.name}` : 'Releases');
  if (!campaign) return null;
  const runName = (id: string) => runs.data?.find((r) => r.id === id)?.name ?? 'run';
  return (
    <>
      <PageHeader title="Releases" subtitle="Signed, locked versions of the data, with their exports" />
      <ReleasesView campaignId={campaign.id} roles={campaign.myRoles} runName={runName} />
    </>
  );
}
