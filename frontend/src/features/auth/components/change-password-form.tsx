import { Alert, Button, Form, Input } from 'antd';
import { errorMessage } from '@/lib/api-client';
import { useChangePassword } from '../api/change-password';
import { NewPasswordFields } from '@/components/forms/new-password-fields';

interface ChangePasswordValues {
  currentPassword: string;
  newPassword: string;
  confirmPassword: string;
}

/** After a change the server ends every older session, this one included, so the caller signs out. */
export function ChangePasswordForm({ onChanged }: { onChanged: () => void }) {
  const [form] = Form.useForm<ChangePasswordValues>();
  const change = useChangePassword({ mutationConfig: { onSuccess: onChanged } });

  return (
    <Form<ChangePasswordValues>
      form={form}
      layout="vertical"
      requiredMark={false}
      onFinish={(values) => change.mutate({ currentPassword: values.currentPassword, newPassword: values.newPassword })}
      disabled={change.isPending}
      className="narrow-form"
    >
      {change.isError ? <Alert type="error" showIcon title={errorMessage(change.error)} className="form-alert" /> : null}
      <Form.Item
        label="Current password"
        name="currentPassword"
        rules={[{ required: true, message: 'Enter your current password' }]}
      >
        <Input.Password autoComplete="current-password" />
      </Form.Item>
      <NewPasswordFields />
      <Button type="primary" htmlType="submit" loading={change.isPending}>
        Change password
      </Button>
    </Form>
  );
}
