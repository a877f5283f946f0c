import { Alert, Button, Form, Result } from 'antd';
import { Link } from 'react-router-dom';
import { paths } from '@/config/paths';
import { errorMessage } from '@/lib/api-client';
import { useConfirmPasswordReset } from '../api/confirm-password-reset';
import { NewPasswordFields } from '@/components/forms/new-password-fields';

export function ResetPasswordConfirmForm({ token }: { token: string }) {
  const confirm = useConfirmPasswordReset();

  if (confirm.isSuccess) {
    return (
      <Result
        status="success"
        title="Password changed"
        subTitle="Sign in with your new password."
        extra={<Link to={paths.signIn.getHref()}>Sign in</Link>}
      />
    );
  }

  return (
    <Form<{ newPassword: string; confirmPassword: string }>
      layout="vertical"
      requiredMark={false}
      onFinish={(values) => confirm.mutate({ token, newPassword: values.newPassword })}
      disabled={confirm.isPending}
    >
      {confirm.isError ? (
        <Alert
          type="error"
          showIcon
          title={errorMessage(confirm.error)}
          description={<Link to={paths.resetPassword.getHref()}>Ask for a new link</Link>}
          className="form-alert"
        />
      ) : null}
      <NewPasswordFields />
      <Form.Item className="form-actions">
        <Button type="primary" htmlType="submit" block loading={confirm.isPending}>
          Set new password
        </Button>
      </Form.Item>
    </Form>
  );
}
