import { Form, Input } from 'antd';
import { MIN_PASSWORD_LENGTH } from '@dialsheet/common';

/** "New password" and its confirmation, with the same length rule the server applies. */
export function NewPasswordFields({ label = 'New password' }: { label?: string }) {
  return (
    <>
      <Form.Item
        label={label}
        name="newPassword"
        extra={`At least ${MIN_PASSWORD_LENGTH} characters.`}
        rules={[
          { required: true, message: 'Choose a password' },
          { min: MIN_PASSWORD_LENGTH, message: `Use at least ${MIN_PASSWORD_LENGTH} characters` },
        ]}
      >
        <Input.Password autoComplete="new-password" />
      </Form.Item>
      <Form.Item
        label="Repeat the password"
        name="confirmPassword"
        dependencies={['newPassword']}
        rules={[
          { required: true, message: 'Repeat the password' },
          ({ getFieldValue }) => ({
            validator: (_, value) =>
              !value || getFieldValue('newPassword') === value
                ? Promise.resolve()
                : Promise.reject(new Error('The two passwords differ')),
          }),
        ]}
      >
        <Input.Password autoComplete="new-password" />
      </Form.Item>
    </>
  );
}
