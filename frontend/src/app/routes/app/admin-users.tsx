import { Card } from 'antd';
import { AdminRoute, useUser } from '@/lib/auth';
import { PageHeader } from '@/components/ui/page-header';
import { ErrorState } from '@/components/feedback/error-state';
import { useDocumentTitle } from '@/hooks/use-document-title';
import { useUsers } from '@/features/admin/api/get-users';
import { UsersTable } from '@/features/admin/components/users-table';

function AdminUsers() {
  const users = useUsers();
  const me = useUser().data;
  return (
    <>
      <PageHeader title="User accounts" subtitle="Everyone with an account on this installation." />
      <Card size="small" className="section-card">
        {users.isError ? (
          <ErrorState error={users.error} onRetry={() => void users.refetch()} />
        ) : (
          <UsersTable users={users.data ?? []} loading={users.isPending} currentUserId={me?.id} />
        )}
      </Card>
    </>
  );
}

export function AdminUsersRoute() {
  useDocumentTitle('User accounts');
  return (
    <AdminRoute>
      <AdminUsers />
    </AdminRoute>
  );
}
