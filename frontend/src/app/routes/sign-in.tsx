import { useState } from 'react';
import { Navigate, useNavigate, useSearchParams } from 'react-router-dom';
import { Alert } from 'antd';
import { safeNextPath } from '@/config/paths';
import { AuthLayout } from '@/components/layouts/auth-layout';
import { authToken, useAccessToken } from '@/lib/auth';
import { useDocumentTitle } from '@/hooks/use-document-title';
import { SignInForm } from '@/features/auth/components/sign-in-form';

const END_MESSAGES = {
  expired: 'Your session has ended. Sign in again to carry on where you were.',
  'password-changed': 'Your password was changed. Sign in with the new one.',
} as const;

export function SignInRoute() {
  useDocumentTitle('Sign in');
  const [searchParams] = useSearchParams();
  const navigate = useNavigate();
  const token = useAccessToken();
  const next = safeNextPath(searchParams.get('next'));
  // Read once: the notice explains why we are here, and should not flicker away while typing.
  const [endReason] = useState(() => authToken.lastEndReason());

  if (token) return <Navigate to={next} replace />;

  return (
    <AuthLayout title="Sign in">
      {endReason === 'expired' || endReason === 'password-changed' ? (
        <Alert type="info" showIcon title={END_MESSAGES[endReason]} className="form-alert" />
      ) : null}
      <SignInForm onSuccess={() => navigate(next, { replace: true })} />
    </AuthLayout>
  );
}
