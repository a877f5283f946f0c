import { useState } from 'react';
import { Button, Popconfirm, Space, Table, Typography } from 'antd';
import type { CampaignMember } from '@dialsheet/common';
import { RoleTags } from '@/components/ui/role-tags';
import { DateText } from '@/components/ui/date-text';
import { useRemoveMember } from '../api/remove-member';
import { EditMemberRolesModal } from './edit-member-roles-modal';

interface MembersTableProps {
  campaignId: string;
  members: CampaignMember[];
  /** Leads change roles and remove people; everyone else only reads the list. */
  canManage: boolean;
  currentUserId: string | undefined;
}

export function MembersTable({ campaignId, members, canManage, currentUserId }: MembersTableProps) {
  const [editing, setEditing] = useState<CampaignMember | null>(null);
  const remove = useRemoveMember();

  return (
    <>
      <Table<CampaignMember>
        className="data-table"
        size="middle"
        rowKey="userId"
        dataSource={members}
        pagination={members.length > 50 ? { pageSize: 50, showSizeChanger: false } : false}
        columns={[
          {
            title: 'Name',
            dataIndex: 'name',
            sorter: (a, b) => a.name.localeCompare(b.name),
            render: (name: string, member) => (
              <span>
                {name}
                {member.userId === currentUserId ? <Typography.Text type="secondary"> (you)</Typography.Text> : null}
              </span>
            ),
          },
          { title: 'E-mail', dataIndex: 'email', sorter: (a, b) => a.email.localeCompare(b.email) },
          { title: 'Roles', key: 'roles', render: (_, member) => <RoleTags roles={member.roles} /> },
          {
            title: 'Joined',
            dataIndex: 'joinedAt',
            width: 150,
            sorter: (a, b) => a.joinedAt.localeCompare(b.joinedAt),
            render: (value: string) => <DateText value={value} />,
          },
          ...(canManage
            ? [
                {
                  title: '',
                  key: 'actions',
                  width: 190,
                  align: 'right' as const,
                  render: (_: unknown, member: CampaignMember) => (
                    <Space size={4}>
                      <Button size="small" onClick={() => setEditing(member)} aria-label={`Change roles of ${member.name}`}>
                        Change roles
                      </Button>
                      <Popconfirm
                        title={member.userId === currentUserId ? 'Leave this campaign?' : `Remove ${member.name}?`}
                        description={
                          member.userId === currentUserId
                            ? 'You will lose access to it.'
                            : 'They lose access; what they entered stays in the record.'
                        }
                        okText="Remove"
                        okButtonProps={{ danger: true }}
                        onConfirm={() => remove.mutateAsync({ campaignId, userId: member.userId }).catch(() => undefined)}
                      >
                        <Button size="small" danger aria-label={`Remove ${member.name}`}>
                          Remove
                        </Button>
                      </Popconfirm>
                    </Space>
                  ),
                },
              ]
            : []),
        ]}
      />
      <EditMemberRolesModal campaignId={campaignId} member={editing} onClose={() => setEditing(null)} />
    </>
  );
}
