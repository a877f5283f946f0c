import { Card, Descriptions, Tag, Typography } from 'antd';
import type { Campaign } from '@dialsheet/common';
import { RoleTags } from '@/components/ui/role-tags';
import { DateText } from '@/components/ui/date-text';

export function CampaignSummary({ campaign }: { campaign: Campaign }) {
  return (
    <Card title="About this campaign" size="small" className="section-card">
      <Typography.Paragraph className="campaign-description">
        {campaign.description || <Typography.Text type="secondary">No description yet.</Typography.Text>}
      </Typography.Paragraph>
      <Descriptions
        colon={false}
        size="small"
        column={{ xs: 1, sm: 2, lg: 3 }}
        items={[
          { key: 'roles', label: 'Your roles', children: <RoleTags roles={campaign.myRoles} /> },
          {
            key: 'members',
            label: 'Members',
            children: <span className="numeric" data-testid="member-count">{campaign.memberCount}</span>,
          },
          {
            key: 'status',
            label: 'Status',
            children: campaign.status === 'archived' ? <Tag>Archived</Tag> : <Tag color="green">Active</Tag>,
          },
          {
            key: 'decimal',
            label: 'Decimal separator',
            children: campaign.decimalComma ? 'Point or comma' : 'Point only',
          },
          { key: 'created', label: 'Created', children: <DateText value={campaign.createdAt} /> },
          { key: 'updated', label: 'Last change', children: <DateText value={campaign.updatedAt} /> },
        ]}
      />
    </Card>
  );
}
