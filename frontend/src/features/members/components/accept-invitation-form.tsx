import { Alert, Button, Descriptions, Divider, Form, Input } from 'antd';
import { MIN_PASSWORD_LENGTH, type InvitationPreview, type LoginResponse } from '@dialsheet/common';
import { errorMessage } from '@/lib/api-client';
import { RoleTags } from '@/components/ui/role-tags';
import { DateText } from '@/components/ui/date-text';
import { useAcceptInvitation } from '../api/accept-invitation';

interface AcceptInvitationFormProps {
  token: string;
  preview: InvitationPreview;
  onAccepted: (session: LoginResponse) => void;
}

interface AcceptValues {
  name?: string;
  password: string;
  confirmPassword?: string;
}

export function AcceptInvitationForm({ token, preview, onAccepted }: AcceptInvitationFormProps) {
  const accept = useAcceptInvitation({ mutationConfig: { onSuccess: onAccepted } });
  const newAccount = !preview.accountExists;

  return (
    <>
      <Descriptions
        colon={false}
        size="small"
        column={1}
        className="invitation-facts"
        items={[
          { key: 'campaign', label: 'Campaign', children: <strong>{preview.campaignName}</strong> },
          { key: 'roles', label: 'Your roles', children: <RoleTags roles={preview.roles} /> },
          { key: 'inviter', label: 'Invited by', children: preview.invitedByName },
          { key: 'email', label: 'For', children: preview.email },
          { key: 'expires', label: 'Link valid until', children: <DateText value={preview.expiresAt} /> },
        ]}
      />
      <Divider className="compact-divider" />
      <Form<AcceptValues>
        layout="vertical"
        requiredMark={false}
        disabled={accept.isPending}
        onFinish={(values) =>
          accept.mutate(
            newAccount
              ? { token, name: values.name?.trim(), password: values.password }
              : { token, password: values.password },
          )
        }
      >
        {accept.isError ? <Alert type="error" showIcon title={errorMessage(accept.error)} className="form-alert" /> : null}
        {newAccount ? (
          <>
            <Form.Item
              label="Your name"
              name="name"
              extra="Your team sees it beside everything you enter."
              rules={[
                { required: true, whitespace: true, message: 'Enter your name' },
                { max: 120, message: 'Keep the name under 120 characters' },
              ]}
            >
              <Input autoComplete="name" autoFocus />
            </Form.Item>
            <Form.Item
              label="Choose a password"
              name="password"
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
              dependencies={['password']}
              rules={[
                { required: true, message: 'Repeat the password' },
                ({ getFieldValue }) => ({
                  validator: (_, value) =>
                    !value || getFieldValue('password') === value
                      ? Promise.resolve()
                      : Promise.reject(new Error('The two passwords differ')),
                }),
              ]}
            >
              <Input.Password autoComplete="new-password" />
            </Form.Item>
          </>
        ) : (
          <Form.Item
            label={`Password of your account ${preview.email}`}
            name="password"
            rules={[{ required: true, message: 'Enter your password' }]}
          >
            <Input.Password autoComplete="current-password" autoFocus />
          </Form.Item>
        )}
        <Button type="primary" htmlType="submit" block loading={accept.isPending}>
          {newAccount ? 'Create account and join' : 'Join the campaign'}
        </Button>
      </Form>
    </>
  );
}
