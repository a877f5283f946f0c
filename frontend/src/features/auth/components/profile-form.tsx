import { App, Button, Form, Input } from 'antd';
import type { UpdateProfileRequest, User } from '@dialsheet/common';
import { useUpdateProfile } from '../api/update-profile';

export function ProfileForm({ user }: { user: User }) {
  const [form] = Form.useForm<UpdateProfileRequest>();
  const { message } = App.useApp();
  const update = useUpdateProfile({
    mutationConfig: { onSuccess: () => void message.success('Name saved') },
  });

  return (
    <Form<UpdateProfileRequest>
      form={form}
      layout="vertical"
      requiredMark={false}
      initialValues={{ name: user.name }}
      onFinish={(values) => update.mutate({ name: values.name.trim() })}
      disabled={update.isPending}
      className="narrow-form"
    >
      <Form.Item label="E-mail">
        <Input value={user.email} disabled />
      </Form.Item>
      <Form.Item
        label="Name"
        name="name"
        extra="Shown to your team beside everything you enter."
        rules={[
          { required: true, whitespace: true, message: 'Enter your name' },
          { max: 120, message: 'Keep the name under 120 characters' },
        ]}
      >
        <Input autoComplete="name" />
      </Form.Item>
      <Button type="primary" htmlType="submit" loading={update.isPending}>
        Save name
      </Button>
    </Form>
  );
}
