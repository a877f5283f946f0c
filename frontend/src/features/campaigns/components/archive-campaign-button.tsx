import { useState } from 'react';
import { Button, Form, Input, Modal } from 'antd';
import { InboxOutlined, UndoOutlined } from '@ant-design/icons';
import type { Campaign } from '@dialsheet/common';
import { useArchiveCampaign } from '../api/archive-campaign';
import { useRestoreCampaign } from '../api/restore-campaign';

/** Archive an active campaign or bring back an archived one, with an optional reason for the trail. */
export function ArchiveCampaignButton({ campaign }: { campaign: Campaign }) {
  const [open, setOpen] = useState(false);
  const [form] = Form.useForm<{ reason?: string }>();
  const archive = useArchiveCampaign({ mutationConfig: { onSuccess: () => setOpen(false) } });
  const restore = useRestoreCampaign({ mutationConfig: { onSuccess: () => setOpen(false) } });
  const archived = campaign.status === 'archived';
  const pending = archive.isPending || restore.isPending;

  return (
    <>
      <Button icon={archived ? <UndoOutlined /> : <InboxOutlined />} onClick={() => setOpen(true)}>
        {archived ? 'Restore' : 'Archive'}
      </Button>
      <Modal
        open={open}
        title={archived ? 'Restore this campaign?' : 'Archive this campaign?'}
        okText={archived ? 'Restore' : 'Archive'}
        okButtonProps={{ danger: !archived }}
        confirmLoading={pending}
        onOk={() => form.submit()}
        onCancel={() => setOpen(false)}
        destroyOnHidden
      >
        <p>
          {archived
            ? 'The campaign returns to everyone’s active list.'
            : 'Archiving hides the campaign from the active list. Nothing is deleted; a lead can restore it later.'}
        </p>
        <Form
          form={form}
          layout="vertical"
          preserve={false}
          onFinish={({ reason }) => {
            const input = { campaignId: campaign.id, reason: reason?.trim() || undefined };
            if (archived) restore.mutate(input);
            else archive.mutate(input);
          }}
        >
          <Form.Item label="Reason (kept in the audit trail)" name="reason">
            <Input placeholder="Optional" maxLength={500} />
          </Form.Item>
        </Form>
      </Modal>
    </>
  );
}
