import { useEffect } from 'react';
import { Alert, Descriptions, Form, Input, Modal } from 'antd';
import type { Release } from '@dialsheet/common';
import { errorMessage } from '@/lib/api-client';
import { formatDateTime } from '@/components/ui/date-text';
import { useSignRelease } from '../api/sign-release';

interface SignReleaseModalProps {
  release: Release | null;
  runName: (runId: string) => string;
  onClose: () => void;
  onDone: (release: Release) => void;
}

/** The lead signs an engineer's request; the note may be edited on the way. */
export function SignReleaseModal({ release, runName, onClose, onDone }: SignReleaseModalProps) {
  const [form] = Form.useForm<{ note: string }>();
  const sign = useSignRelease();
  useEffect(() => {
    if (release) form.setFieldsValue({ note: release.note });
  }, [release, form]);

  return (
    <Modal
      open={release !== null}
      title={release ? `Sign “${release.title}”` : 'Sign'}
      okText="Sign and publish"
      okButtonProps={{ loading: sign.isPending }}
      onOk={() => form.submit()}
      onCancel={() => {
        sign.reset();
        onClose();
      }}
      destroyOnHidden
    >
      {release ? (
        <>
          <Descriptions size="small" column={1} className="modal-facts">
            <Descriptions.Item label="Requested by">
              {release.requestedBy.displayName}, {formatDateTime(release.requestedAt)}
            </Descriptions.Item>
            <Descriptions.Item label="Runs">{release.runIds.map(runName).join(', ')}</Descriptions.Item>
          </Descriptions>
          <Alert
            type="info"
            showIcon
            className="modal-alert"
            title="Signing locks these runs"
            description="The release gets the next number and a content hash; edits to its runs are refused until a correction is opened."
          />
          <Form
            form={form}
            layout="vertical"
            onFinish={(values) =>
              sign.mutate({ releaseId: release.id, campaignId: release.campaignId, data: { note: values.note } }, { onSuccess: onDone })
            }
          >
            <Form.Item name="note" label="Note">
              <Input.TextArea rows={3} maxLength={4000} />
            </Form.Item>
          </Form>
          {sign.isError ? (
            <Alert type="error" showIcon title="Not signed" description={errorMessage(sign.error)} role="alert" />
          ) : null}
        </>
      ) : null}
    </Modal>
  );
}
