import { Form, Input, Modal } from 'antd';
import type { Campaign, UpdateCampaignRequest } from '@dialsheet/common';
import { useUpdateCampaign } from '../api/update-campaign';
import { CampaignFormFields } from './campaign-form-fields';

interface EditCampaignModalProps {
  campaign: Campaign;
  open: boolean;
  onClose: () => void;
}

export function EditCampaignModal({ campaign, open, onClose }: EditCampaignModalProps) {
  const [form] = Form.useForm<UpdateCampaignRequest>();
  const update = useUpdateCampaign({ mutationConfig: { onSuccess: onClose } });

  return (
    <Modal
      open={open}
      title="Edit campaign"
      okText="Save changes"
      onOk={() => form.submit()}
      onCancel={onClose}
      confirmLoading={update.isPending}
      destroyOnHidden
    >
      <Form<UpdateCampaignRequest>
        form={form}
        layout="vertical"
        requiredMark={false}
        preserve={false}
        initialValues={{ name: campaign.name, description: campaign.description, decimalComma: campaign.decimalComma }}
        disabled={update.isPending}
        onFinish={(values) =>
          update.mutate({
            campaignId: campaign.id,
            data: {
              name: values.name?.trim(),
              description: values.description?.trim() ?? '',
              decimalComma: Boolean(values.decimalComma),
              reason: values.reason?.trim() || undefined,
            },
          })
        }
      >
        <CampaignFormFields />
        <Form.Item label="Reason for the change (kept in the audit trail)" name="reason">
          <Input placeholder="Optional" maxLength={500} />
        </Form.Item>
      </Form>
    </Modal>
  );
}
