import { Form, Input, Modal } from 'antd';
import type { CampaignMember, CampaignRole } from '@dialsheet/common';
import { useUpdateMemberRoles } from '../api/update-member-roles';
import { RoleCheckboxes } from './role-checkboxes';

interface EditMemberRolesModalProps {
  campaignId: string;
  member: CampaignMember | null;
  onClose: () => void;
}

export function EditMemberRolesModal({ campaignId, member, onClose }: EditMemberRolesModalProps) {
  const [form] = Form.useForm<{ roles: CampaignRole[]; reason?: string }>();
  const update = useUpdateMemberRoles({ mutationConfig: { onSuccess: onClose } });

  return (
    <Modal
      open={member !== null}
      title={member ? `Roles of ${member.name}` : 'Roles'}
      okText="Save roles"
      onOk={() => form.submit()}
      onCancel={onClose}
      confirmLoading={update.isPending}
      destroyOnHidden
    >
      {member ? (
        <Form
          form={form}
          layout="vertical"
          requiredMark={false}
          preserve={false}
          initialValues={{ roles: member.roles, reason: '' }}
          disabled={update.isPending}
          onFinish={(values) =>
            update.mutate({
              campaignId,
              userId: member.userId,
              data: { roles: values.roles, reason: values.reason?.trim() || undefined },
            })
          }
        >
          <RoleCheckboxes />
          <Form.Item label="Reason (kept in the audit trail)" name="reason">
            <Input placeholder="Optional" maxLength={500} />
          </Form.Item>
        </Form>
      ) : null}
    </Modal>
  );
}
