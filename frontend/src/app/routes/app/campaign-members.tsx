import { useParams } from 'react-router-dom';
import { Card, Skeleton, Space, Typography } from 'antd';
import { PageHeader } from '@/components/ui/page-header';
import { ErrorState } from '@/components/feedback/error-state';
import { useUser } from '@/lib/auth';
import { useDocumentTitle } from '@/hooks/use-document-title';
import { useCampaign } from '@/features/campaigns/api/get-campaign';
import { useMembers } from '@/features/members/api/get-members';
import { MembersTable } from '@/features/members/components/members-table';
import { InviteMemberButton } from '@/features/members/components/invite-member-button';
import { PendingInvitations } from '@/features/members/components/pending-invitations';

export function CampaignMembersRoute() {
  const { campaignId = '' } = useParams();
  const { data: campaign } = useCampaign({ campaignId });
  const members = useMembers({ campaignId });
  const me = useUser().data;
  useDocumentTitle(campaign ? `Members · ${campaign.name}` : 'Members');
  if (!campaign) return null;

  const isLead = campaign.myRoles.includes('lead');

  return (
    <>
      <PageHeader
        title="Members"
        subtitle={campaign.name}
        actions={isLead ? <InviteMemberButton campaignId={campaign.id} /> : null}
      />
      <Space orientation="vertical" size={16} className="full-width">
        <Card size="small" className="section-card">
          {members.isPending ? (
            <Skeleton active paragraph={{ rows: 4 }} />
          ) : members.isError ? (
            <ErrorState error={members.error} onRetry={() => void members.refetch()} />
          ) : (
            <MembersTable campaignId={campaign.id} members={members.data} canManage={isLead} currentUserId={me?.id} />
          )}
          {!isLead ? (
            <Typography.Paragraph type="secondary" className="card-footnote">
              Only a lead of this campaign can invite people or change roles.
            </Typography.Paragraph>
          ) : null}
        </Card>
        {isLead ? <PendingInvitations campaignId={campaign.id} /> : null}
      </Space>
    </>
  );
}
