import { Alert, Form, Input, Modal } from 'antd';
import type { Release } from '@dialsheet/common';
import { errorMessage } from '@/lib/api-client';
import { useDeclineRelease } from '../api/decline-release';

interface DeclineReleaseModalProps {
  release: Release | null;
  onClose: () => void;
  onDone: (release: Release) => void;
}

/** The requester reads the reason, so one is required. */
export function DeclineReleaseModal({ release, onClose, onDone }: DeclineReleaseModalProps) {
  const [form] = Form.useForm<{ reason: string }>();
  const decline = useDeclineRelease();
  return (
    <Modal
      open={release !== null}
      title={release ? `Decline “${release.title}”` : 'Decline'}
      okText="Decline request"
      okButtonProps={{ danger: true, loading: decline.isPending }}
      onOk={() => form.submit()}
      onCancel={() => {
        decline.reset();
        onClose();
      }}
      destroyOnHidden
    >
      {release ? (
        <Form
          form={form}
          layout="vertical"
          onFinish={(values) => decline.mutate({ releaseId: release.id, data: { reason: values.reason.trim() } }, { onSuccess: onDone })}
        >
          <Form.Item name="reason" label="Reason" rules={[{ required: true, whitespace: true, message: 'Say why, so the engineer knows what to change.' }]}>
            <Input.TextArea rows={3} maxLength={2000} />
          </Form.Item>
        </Form>
      ) : null}
      {decline.isError ? <Alert type="error" showIcon title="Not declined" description={errorMessage(decline.error)} role="alert" /> : null}
    </Modal>
  );
}
