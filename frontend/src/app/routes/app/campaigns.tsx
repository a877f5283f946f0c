import { useState } from 'react';
import { useNavigate, useSearchParams } from 'react-router-dom';
import { Button, Card, Segmented, Skeleton } from 'antd';
import { PlusOutlined } from '@ant-design/icons';
import type { CampaignStatus } from '@dialsheet/common';
import { paths } from '@/config/paths';
import { PageHeader } from '@/components/ui/page-header';
import { EmptyState } from '@/components/feedback/empty-state';
import { ErrorState } from '@/components/feedback/error-state';
import { useDocumentTitle } from '@/hooks/use-document-title';
import { useCampaigns } from '@/features/campaigns/api/get-campaigns';
import { CampaignTable } from '@/features/campaigns/components/campaign-table';
import { CreateCampaignModal } from '@/features/campaigns/components/create-campaign-modal';

export function CampaignsRoute() {
  useDocumentTitle('Campaigns');
  const navigate = useNavigate();
  const [searchParams, setSearchParams] = useSearchParams();
  const status: CampaignStatus = searchParams.get('status') === 'archived' ? 'archived' : 'active';
  const campaigns = useCampaigns({ status });
  const [creating, setCreating] = useState(false);

  const newButton = (
    <Button type="primary" icon={<PlusOutlined />} onClick={() => setCreating(true)}>
      New campaign
    </Button>
  );

  let body;
  if (campaigns.isPending) {
    body = <Skeleton active paragraph={{ rows: 5 }} />;
  } else if (campaigns.isError) {
    body = <ErrorState error={campaigns.error} onRetry={() => void campaigns.refetch()} />;
  } else if (campaigns.data.length === 0) {
    body =
      status === 'archived' ? (
        <EmptyState title="No archived campaigns" description="Campaigns a lead archives are kept here and can be restored." />
      ) : (
        <EmptyState
          title="No campaigns yet"
          description="A campaign holds one test programme: its runs, recordings and the people who read them. Create one, or ask a lead to invite you to theirs."
          action={newButton}
        />
      );
  } else {
    body = <CampaignTable campaigns={campaigns.data} />;
  }

  return (
    <>
      <PageHeader
        title="Campaigns"
        subtitle="The test programmes you take part in."
        actions={newButton}
      />
      <Card size="small" className="section-card">
        <div className="card-toolbar">
          <Segmented<CampaignStatus>
            aria-label="Which campaigns"
            value={status}
            options={[
              { label: 'Active', value: 'active' },
              { label: 'Archived', value: 'archived' },
            ]}
            onChange={(value) => setSearchParams(value === 'archived' ? { status: 'archived' } : {})}
          />
          {campaigns.isFetching && !campaigns.isPending ? <span className="muted-note">Refreshing…</span> : null}
        </div>
        {body}
      </Card>
      <CreateCampaignModal
        open={creating}
        onClose={() => setCreating(false)}
        onCreated={(campaign) => {
          setCreating(false);
          navigate(paths.campaign.getHref(campaign.id));
        }}
      />
    </>
  );
}
