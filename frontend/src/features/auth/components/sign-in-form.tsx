import { Alert, Button, Form, Input } from 'antd';
import { Link } from 'react-router-dom';
import type { LoginRequest } from '@dialsheet/common';
import { paths } from '@/config/paths';
import { errorMessage } from '@/lib/api-client';
import { useLogin } from '../api/login';

interface SignInFormProps {
  onSuccess: () => void;
  defaultEmail?: string;
}

export function SignInForm({ onSuccess, defaultEmail }: SignInFormProps) {
  const login = useLogin({ mutationConfig: { onSuccess } });

  return (
    <Form<LoginRequest>
      layout="vertical"
      requiredMark={false}
      initialValues={{ email: defaultEmail ?? '' }}
      onFinish={(values) => login.mutate({ email: values.email.trim(), password: values.password })}
      disabled={login.isPending}
    >
      {login.isError ? (
        <Alert type="error" showIcon title={errorMessage(login.error)} className="form-alert" role="alert" />
      ) : null}
      <Form.Item
        label="E-mail"
        name="email"
        rules={[
          { required: true, message: 'Enter your e-mail address' },
          { type: 'email', message: 'This does not look like an e-mail address' },
        ]}
      >
        <Input autoComplete="username" autoFocus inputMode="email" />
      </Form.Item>
      <Form.Item label="Password" name="password" rules={[{ required: true, message: 'Enter your password' }]}>
        <Input.Password autoComplete="current-password" />
      </Form.Item>
      <Form.Item className="form-actions">
        <Button type="primary" htmlType="submit" block loading={login.isPending}>
          Sign in
        </Button>
      </Form.Item>
      <Link to={paths.resetPassword.getHref()}>Forgot your password?</Link>
    </Form>
  );
}
