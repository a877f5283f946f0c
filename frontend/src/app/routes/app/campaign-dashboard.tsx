import { Link, useParams } from 'react-router-dom';
import { Button } from 'antd';
import { SafetyCertificateOutlined } from '@ant-design/icons';
import { paths } from '@/config/paths';
import { PageHeader } from '@/components/ui/page-header';
import { useDocumentTitle } from '@/hooks/use-document-title';
import { useCampaign } from '@/features/campaigns/api/get-campaign';
import { CampaignDashboard } from '@/features/releases/components/campaign-dashboard';

/** Progress, open work and what is ready to release, for the people who sign off. */
export function CampaignDashboardRoute() {
  const { campaignId = '' } = useParams();
  const { data: campaign } = useCampaign({ campaignId });
  useDocumentTitle(campaign ? `Dashboard · ${campaign.name}` : 'Dashboard');
  if (!campaign) return null;
  return (
    <>
      <PageHeader
        title="Dashboard"
        subtitle={campaign.name}
        actions={
          <Link to={paths.campaignReleases.getHref(campaign.id)}>
            <Button icon={<SafetyCertificateOutlined />}>Releases</Button>
          </Link>
        }
      />
      <CampaignDashboard campaignId={campaign.id} />
    </>
  );
}
