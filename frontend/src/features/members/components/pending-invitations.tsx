import { Button, Card, Popconfirm, Table } from 'antd';
import type { Invitation } from '@dialsheet/common';
import { RoleTags } from '@/components/ui/role-tags';
import { DateText } from '@/components/ui/date-text';
import { ErrorState } from '@/components/feedback/error-state';
import { useInvitations } from '../api/get-invitations';
import { useRevokeInvitation } from '../api/revoke-invitation';

/** Invitations still waiting for an answer, for leads only (the server refuses everyone else). */
export function PendingInvitations({ campaignId }: { campaignId: string }) {
  const invitations = useInvitations({ campaignId });
  const revoke = useRevokeInvitation();
  const pending = (invitations.data ?? []).filter((i) => i.status === 'pending');

  return (
    <Card size="small" title="Pending invitations" className="section-card">
      {invitations.isError ? (
        <ErrorState error={invitations.error} onRetry={() => void invitations.refetch()} />
      ) : (
        <Table<Invitation>
          className="data-table"
          size="small"
          rowKey="id"
          loading={invitations.isPending}
          dataSource={pending}
          pagination={false}
          locale={{ emptyText: 'No invitations waiting for an answer.' }}
          columns={[
            { title: 'E-mail', dataIndex: 'email' },
            { title: 'Roles', key: 'roles', render: (_, invitation) => <RoleTags roles={invitation.roles} /> },
            { title: 'Sent', dataIndex: 'createdAt', width: 150, render: (v: string) => <DateText value={v} /> },
            { title: 'Expires', dataIndex: 'expiresAt', width: 150, render: (v: string) => <DateText value={v} /> },
            {
              title: '',
              key: 'actions',
              width: 100,
              align: 'right',
              render: (_, invitation) => (
                <Popconfirm
                  title={`Revoke the invitation to ${invitation.email}?`}
                  description="The link in their e-mail stops working."
                  okText="Revoke"
                  okButtonProps={{ danger: true }}
                  onConfirm={() => revoke.mutateAsync({ campaignId, invitationId: invitation.id }).catch(() => undefined)}
                >
                  <Button size="small" danger aria-label={`Revoke invitation to ${invitation.email}`}>
                    Revoke
                  </Button>
                </Popconfirm>
              ),
            },
          ]}
        />
      )}
    </Card>
  );
}
