import { Link, useSearchParams } from 'react-router-dom';
import { Result } from 'antd';
import { paths } from '@/config/paths';
import { AuthLayout } from '@/components/layouts/auth-layout';
import { useDocumentTitle } from '@/hooks/use-document-title';
import { ResetPasswordConfirmForm } from '@/features/auth/components/reset-password-confirm-form';

export function ResetPasswordConfirmRoute() {
  useDocumentTitle('Choose a new password');
  const [searchParams] = useSearchParams();
  const token = searchParams.get('token');

  return (
    <AuthLayout title="Choose a new password">
      {token ? (
        <ResetPasswordConfirmForm token={token} />
      ) : (
        <Result
          status="warning"
          title="This link is incomplete"
          subTitle="Open the link from the e-mail exactly as it was sent, or ask for a new one."
          extra={<Link to={paths.resetPassword.getHref()}>Ask for a new link</Link>}
        />
      )}
    </AuthLayout>
  );
}
