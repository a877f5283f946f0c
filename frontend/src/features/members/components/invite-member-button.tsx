import { useState } from 'react';
import { App, Button, Form, Input, Modal } from 'antd';
import { UserAddOutlined } from '@ant-design/icons';
import type { CreateInvitationRequest } from '@dialsheet/common';
import { useCreateInvitation } from '../api/create-invitation';
import { RoleCheckboxes } from './role-checkboxes';

export function InviteMemberButton({ campaignId }: { campaignId: string }) {
  const [open, setOpen] = useState(false);
  const [form] = Form.useForm<CreateInvitationRequest>();
  const { message } = App.useApp();
  const invite = useCreateInvitation({
    mutationConfig: {
      onSuccess: (invitation) => {
        void message.success(`Invitation sent to ${invitation.email}`);
        setOpen(false);
      },
    },
  });

  return (
    <>
      <Button type="primary" icon={<UserAddOutlined />} onClick={() => setOpen(true)}>
        Invite by e-mail
      </Button>
      <Modal
        open={open}
        title="Invite someone to this campaign"
        okText="Send invitation"
        onOk={() => form.submit()}
        onCancel={() => setOpen(false)}
        confirmLoading={invite.isPending}
        destroyOnHidden
      >
        <Form<CreateInvitationRequest>
          form={form}
          layout="vertical"
          requiredMark={false}
          preserve={false}
          initialValues={{ email: '', roles: ['reader'] }}
          disabled={invite.isPending}
          onFinish={(values) => invite.mutate({ campaignId, data: { email: values.email.trim(), roles: values.roles } })}
        >
          <Form.Item
            label="E-mail"
            name="email"
            rules={[
              { required: true, message: 'Enter the e-mail address to invite' },
              { type: 'email', message: 'This does not look like an e-mail address' },
            ]}
          >
            <Input autoFocus inputMode="email" placeholder="name@example.org" />
          </Form.Item>
          <RoleCheckboxes />
        </Form>
        <p className="modal-note">The link in the e-mail works once and for 7 days.</p>
      </Modal>
    </>
  );
}
