import { Alert, Button, Form, Input, Result } from 'antd';
import { Link } from 'react-router-dom';
import type { PasswordResetRequest } from '@dialsheet/common';
import { paths } from '@/config/paths';
import { errorMessage } from '@/lib/api-client';
import { useRequestPasswordReset } from '../api/request-password-reset';

export function ResetPasswordRequestForm() {
  const reset = useRequestPasswordReset();

  if (reset.isSuccess) {
    return (
      <Result
        status="success"
        title="Check your e-mail"
        subTitle={
          <>
            If an account exists for <strong>{reset.variables.email}</strong>, a link to choose a new password is
            on its way. The link works once, for 60 minutes.
          </>
        }
        extra={<Link to={paths.signIn.getHref()}>Back to sign in</Link>}
      />
    );
  }

  return (
    <Form<PasswordResetRequest>
      layout="vertical"
      requiredMark={false}
      onFinish={(values) => reset.mutate({ email: values.email.trim() })}
      disabled={reset.isPending}
    >
      {reset.isError ? <Alert type="error" showIcon title={errorMessage(reset.error)} className="form-alert" /> : null}
      <Form.Item
        label="E-mail"
        name="email"
        rules={[
          { required: true, message: 'Enter the e-mail address of your account' },
          { type: 'email', message: 'This does not look like an e-mail address' },
        ]}
      >
        <Input autoComplete="username" autoFocus inputMode="email" />
      </Form.Item>
      <Form.Item className="form-actions">
        <Button type="primary" htmlType="submit" block loading={reset.isPending}>
          Send reset link
        </Button>
      </Form.Item>
      <Link to={paths.signIn.getHref()}>Back to sign in</Link>
    </Form>
  );
}
