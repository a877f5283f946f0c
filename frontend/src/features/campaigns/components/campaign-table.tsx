import { Link } from 'react-router-dom';
import { Table, Typography } from 'antd';
import type { Campaign } from '@dialsheet/common';
import { paths } from '@/config/paths';
import { RoleTags } from '@/components/ui/role-tags';
import { DateText } from '@/components/ui/date-text';

export function CampaignTable({ campaigns }: { campaigns: Campaign[] }) {
  return (
    <Table<Campaign>
      className="data-table"
      size="middle"
      rowKey="id"
      dataSource={campaigns}
      pagination={campaigns.length > 50 ? { pageSize: 50, showSizeChanger: false } : false}
      columns={[
        {
          title: 'Campaign',
          key: 'name',
          sorter: (a, b) => a.name.localeCompare(b.name),
          render: (_, campaign) => (
            <div className="campaign-cell">
              <Link to={paths.campaign.getHref(campaign.id)} className="campaign-link">
                {campaign.name}
              </Link>
              {campaign.description ? (
                <Typography.Text type="secondary" ellipsis={{ tooltip: campaign.description }} className="campaign-desc">
                  {campaign.description}
                </Typography.Text>
              ) : null}
            </div>
          ),
        },
        { title: 'Your roles', key: 'roles', width: 260, render: (_, c) => <RoleTags roles={c.myRoles} /> },
        {
          title: 'Members',
          dataIndex: 'memberCount',
          width: 100,
          align: 'right',
          sorter: (a, b) => a.memberCount - b.memberCount,
        },
        {
          title: 'Last change',
          dataIndex: 'updatedAt',
          width: 160,
          defaultSortOrder: 'descend',
          sorter: (a, b) => a.updatedAt.localeCompare(b.updatedAt),
          render: (value: string) => <DateText value={value} />,
        },
      ]}
    />
  );
}
