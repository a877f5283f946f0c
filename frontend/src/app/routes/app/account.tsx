import { Button, Card, Col, Row, Typography } from 'antd';
import { LogoutOutlined } from '@ant-design/icons';
import { useSignOut, useUser } from '@/lib/auth';
import { PageHeader } from '@/components/ui/page-header';
import { useDocumentTitle } from '@/hooks/use-document-title';
import { ProfileForm } from '@/features/auth/components/profile-form';
import { ChangePasswordForm } from '@/features/auth/components/change-password-form';
import { NotificationSettings } from '@/features/releases/components/notification-settings';

export function AccountRoute() {
  useDocumentTitle('Account');
  const user = useUser().data;
  const signOut = useSignOut();
  if (!user) return null;

  return (
    <>
      <PageHeader title="Your account" subtitle={user.email} />
      <Row gutter={[16, 16]}>
        <Col xs={24} lg={12}>
          <Card size="small" title="Profile" className="section-card">
            <ProfileForm user={user} />
          </Card>
        </Col>
        <Col xs={24} lg={12}>
          <Card size="small" title="Password" className="section-card">
            <Typography.Paragraph type="secondary">
              Changing it signs you out everywhere, this browser included.
            </Typography.Paragraph>
            <ChangePasswordForm
              onChanged={() => void signOut({ reason: 'password-changed', skipServer: true })}
            />
          </Card>
        </Col>
        <Col xs={24} lg={12}>
          <Card size="small" title="E-mail notifications" className="section-card">
            <NotificationSettings />
          </Card>
        </Col>
        <Col xs={24} lg={12}>
          <Card size="small" title="Session" className="section-card">
            <Typography.Paragraph type="secondary">Sign out when you leave a shared computer.</Typography.Paragraph>
            <Button icon={<LogoutOutlined />} onClick={() => void signOut()}>
              Sign out
            </Button>
          </Card>
        </Col>
      </Row>
    </>
  );
}
