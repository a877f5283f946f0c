import { Alert, Form, Input, Modal } from 'antd';
import type { DashboardRun } from '@dialsheet/common';
import { errorMessage } from '@/lib/api-client';
import { useOpenCorrection } from '../api/open-correction';

interface OpenCorrectionModalProps {
  campaignId: string;
  run: DashboardRun | null;
  onClose: () => void;
  onDone: () => void;
}

/** Lifts the lock of a released run so its data can be corrected; the reason goes to the audit trail. */
export function OpenCorrectionModal({ campaignId, run, onClose, onDone }: OpenCorrectionModalProps) {
  const [form] = Form.useForm<{ reason: string }>();
  const correction = useOpenCorrection();
  const number = run?.lockedBy?.number;
  return (
    <Modal
      open={run !== null}
      title={run ? `Open a correction of ${run.name}` : 'Open a correction'}
      okText="Open correction"
      okButtonProps={{ danger: true, loading: correction.isPending }}
      onOk={() => form.submit()}
      onCancel={() => {
        correction.reset();
        onClose();
      }}
      destroyOnHidden
    >
      {run ? (
        <>
          <Alert
            type="warning"
            showIcon
            className="modal-alert"
            title={`Release ${number ?? ''} stays exactly as it was signed`}
            description={`Its files, numbers and content hash do not change. Opening a correction lifts the lock on this run so its readings, resolutions and analyses can be changed; the next release that holds the run is a new version that supersedes release ${number ?? ''}.`}
          />
          <Form
            form={form}
            layout="vertical"
            onFinish={(values) => correction.mutate({ runId: run.id, campaignId, data: { reason: values.reason.trim() } }, { onSuccess: onDone })}
          >
            <Form.Item
              name="reason"
              label="Reason for the correction"
              rules={[{ required: true, whitespace: true, message: 'A reason is required; it is kept in the audit trail.' }]}
            >
              <Input.TextArea rows={3} maxLength={2000} placeholder="e.g. T3 misread at 4:10 found on review of the frame" />
            </Form.Item>
          </Form>
          {correction.isError ? (
            <Alert type="error" showIcon title="The lock was not lifted" description={errorMessage(correction.error)} role="alert" />
          ) : null}
        </>
      ) : null}
    </Modal>
  );
}
