import { Form, Modal } from 'antd';
import type { Campaign, CreateCampaignRequest } from '@dialsheet/common';
import { useCreateCampaign } from '../api/create-campaign';
import { CampaignFormFields } from './campaign-form-fields';

interface CreateCampaignModalProps {
  open: boolean;
  onClose: () => void;
  onCreated: (campaign: Campaign) => void;
}

export function CreateCampaignModal({ open, onClose, onCreated }: CreateCampaignModalProps) {
  const [form] = Form.useForm<CreateCampaignRequest>();
  const create = useCreateCampaign({
    mutationConfig: {
      onSuccess: (campaign) => {
        form.resetFields();
        onCreated(campaign);
      },
    },
  });

  return (
    <Modal
      open={open}
      title="New campaign"
      okText="Create campaign"
      onOk={() => form.submit()}
      onCancel={onClose}
      confirmLoading={create.isPending}
      destroyOnHidden
    >
      <Form<CreateCampaignRequest>
        form={form}
        layout="vertical"
        requiredMark={false}
        initialValues={{ name: '', description: '', decimalComma: false }}
        onFinish={(values) =>
          create.mutate({
            name: values.name.trim(),
            description: values.description?.trim() ?? '',
            decimalComma: Boolean(values.decimalComma),
          })
        }
        disabled={create.isPending}
        preserve={false}
      >
        <CampaignFormFields />
      </Form>
      <p className="modal-note">You become the lead of the new campaign and can invite others from its Members page.</p>
    </Modal>
  );
}
