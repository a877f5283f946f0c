import { useSearchParams } from 'react-router-dom';
import { Button, Card, Col, Row, Skeleton } from 'antd';
import { ReloadOutlined } from '@ant-design/icons';
import { AdminRoute } from '@/lib/auth';
import { PageHeader } from '@/components/ui/page-header';
import { EmptyState } from '@/components/feedback/empty-state';
import { ErrorState } from '@/components/feedback/error-state';
import { useDocumentTitle } from '@/hooks/use-document-title';
import { useMails } from '@/features/admin/api/get-mails';
import { MailList } from '@/features/admin/components/mail-list';
import { MailMessage } from '@/features/admin/components/mail-message';

function AdminMail() {
  const [searchParams, setSearchParams] = useSearchParams();
  const selectedId = searchParams.get('id') ?? undefined;
  // New messages arrive while someone is waiting for an invitation or reset link.
  const mails = useMails({ queryConfig: { refetchInterval: 5_000 } });

  return (
    <>
      <PageHeader
        title="Captured e-mail"
        subtitle="Messages the local mail catcher received: invitations and password resets."
        actions={
          <Button icon={<ReloadOutlined />} loading={mails.isFetching} onClick={() => void mails.refetch()}>
            Refresh
          </Button>
        }
      />
      {mails.isPending ? (
        <Card size="small" className="section-card">
          <Skeleton active paragraph={{ rows: 6 }} />
        </Card>
      ) : mails.isError ? (
        <ErrorState error={mails.error} onRetry={() => void mails.refetch()} />
      ) : mails.data.length === 0 ? (
        <Card size="small" className="section-card">
          <EmptyState
            title="No messages captured"
            description="Messages appear here only while the server sends through the local mail catcher (the demo set-up). With a real mail server they go to people's inboxes instead, and this page stays empty."
          />
        </Card>
      ) : (
        <Row gutter={[16, 16]}>
          <Col xs={24} xl={11}>
            <Card size="small" className="section-card">
              <MailList mails={mails.data} selectedId={selectedId} onOpen={(id) => setSearchParams({ id })} />
            </Card>
          </Col>
          <Col xs={24} xl={13}>
            {selectedId ? (
              <MailMessage mailId={selectedId} />
            ) : (
              <Card size="small" className="section-card">
                <EmptyState title="Pick a message" description="Its text shows here, with its links clickable." />
              </Card>
            )}
          </Col>
        </Row>
      )}
    </>
  );
}

export function AdminMailRoute() {
  useDocumentTitle('Captured e-mail');
  return (
    <AdminRoute>
      <AdminMail />
    </AdminRoute>
  );
}
