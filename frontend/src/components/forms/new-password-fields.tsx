import { Form, Input } from 'antd';
import { MIN_PASSWORD_LENGTH } from '@dialsheet/common';

/**
 * A new password and its confirmation, with the same length rule the server applies. Shared by
 * the reset, change-password and accept-invitation forms; `name` is the form field it fills.
 */
export function NewPasswordFields({ label = 'New password', name = 'newPassword' }: { label?: string; name?: string }) {
  return (
    <>
      <Form.Item
        label={label}
        name={name}
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
        dependencies={[name]}
        rules={[
          { required: true, message: 'Repeat the password' },
          ({ getFieldValue }) => ({
            validator: (_, value) =>
              !value || getFieldValue(name) === value
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
