import { Link, Outlet, useParams } from 'react-router-dom';
import { Button, Skeleton } from 'antd';
import { paths } from '@/config/paths';
import { isApiError } from '@/lib/api-client';
import { ErrorState } from '@/components/feedback/error-state';
import { useCampaign } from '@/features/campaigns/api/get-campaign';

/** Loads the campaign once for all its pages; a campaign you are not in reads as "not found". */
export function CampaignLayout() {
  const { campaignId = '' } = useParams();
  const campaign = useCampaign({ campaignId });

  if (campaign.isPending) return <Skeleton active paragraph={{ rows: 8 }} />;
  if (campaign.isError) {
    const missing = isApiError(campaign.error, 404);
    return (
      <ErrorState
        error={campaign.error}
        title={missing ? 'Campaign not found' : undefined}
        description={missing ? 'It does not exist, or you are not a member of it.' : undefined}
        onRetry={() => void campaign.refetch()}
        extra={
          <Link to={paths.campaigns.getHref()}>
            <Button>All campaigns</Button>
          </Link>
        }
      />
    );
  }
  return <Outlet />;
}
