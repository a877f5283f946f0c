import { AuthLayout } from '@/components/layouts/auth-layout';
import { useDocumentTitle } from '@/hooks/use-document-title';
import { ResetPasswordRequestForm } from '@/features/auth/components/reset-password-request-form';

export function ResetPasswordRoute() {
  useDocumentTitle('Reset password');
  return (
    <AuthLayout title="Reset your password" subtitle="We will e-mail you a link to choose a new password.">
      <ResetPasswordRequestForm />
    </AuthLayout>
  );
}
