import { Alert, Button, Descriptions, Divider, Form, Input } from 'antd';
import type { InvitationPreview, LoginResponse } from '@dialsheet/common';
import { errorMessage } from '@/lib/api-client';
import { RoleTags } from '@/components/ui/role-tags';
import { DateText } from '@/components/ui/date-text';
import { NewPasswordFields } from '@/components/forms/new-password-fields';
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
            <NewPasswordFields label="Choose a password" name="password" />
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
