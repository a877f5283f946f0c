import { Button, Popconfirm, Table, Tag, Typography } from 'antd';
import type { AdminUser } from '@dialsheet/common';
import { DateText } from '@/components/ui/date-text';
import { useUpdateUser } from '../api/update-user';

interface UsersTableProps {
  users: AdminUser[];
  loading: boolean;
  currentUserId: string | undefined;
}

export function UsersTable({ users, loading, currentUserId }: UsersTableProps) {
  const update = useUpdateUser();

  return (
    <Table<AdminUser>
      className="data-table"
      size="middle"
      rowKey="id"
      loading={loading}
      dataSource={users}
      pagination={users.length > 50 ? { pageSize: 50, showSizeChanger: false } : false}
      columns={[
        {
          title: 'Name',
          dataIndex: 'name',
          sorter: (a, b) => a.name.localeCompare(b.name),
          render: (name: string, user) => (
            <span>
              {name}
              {user.id === currentUserId ? <Typography.Text type="secondary"> (you)</Typography.Text> : null}
            </span>
          ),
        },
        { title: 'E-mail', dataIndex: 'email', sorter: (a, b) => a.email.localeCompare(b.email) },
        {
          title: 'Account',
          key: 'status',
          width: 200,
          render: (_, user) => (
            <>
              {user.isAdmin ? <Tag color="green">Administrator</Tag> : null}
              {user.disabled ? <Tag color="red">Disabled</Tag> : <Tag>Active</Tag>}
            </>
          ),
        },
        {
          title: 'Created',
          dataIndex: 'createdAt',
          width: 150,
          sorter: (a, b) => a.createdAt.localeCompare(b.createdAt),
          render: (v: string) => <DateText value={v} />,
        },
        {
          title: '',
          key: 'actions',
          width: 120,
          align: 'right',
          render: (_, user) =>
            user.id === currentUserId ? null : user.disabled ? (
              <Button size="small" onClick={() => update.mutate({ userId: user.id, data: { disabled: false } })}>
                Enable
              </Button>
            ) : (
              <Popconfirm
                title={`Disable ${user.name}?`}
                description="They can no longer sign in and their open sessions end. Their records stay."
                okText="Disable"
                okButtonProps={{ danger: true }}
                onConfirm={() => update.mutateAsync({ userId: user.id, data: { disabled: true } }).catch(() => undefined)}
              >
                <Button size="small" danger aria-label={`Disable ${user.name}`}>
                  Disable
                </Button>
              </Popconfirm>
            ),
        },
      ]}
    />
  );
}
