import { useState } from 'react';
import { Alert, Form, Modal, Select, Typography } from 'antd';
import type { CampaignMember, CampaignRole, Sheet } from '@dialsheet/common';
import { errorMessage, isApiError } from '@/lib/api-client';
import { useAssignSheet } from '../api/assign-sheet';

interface AssignFormValues {
  readerId: string | null;
  checkerId: string | null;
}

interface AssignSheetModalProps {
  sheet: Sheet;
  members: CampaignMember[];
  open: boolean;
  onClose: () => void;
  onSaved?: (sheet: Sheet) => void;
}

function optionsFor(members: CampaignMember[], role: CampaignRole) {
  return members
    .filter((m) => m.roles.includes(role))
    .map((m) => ({ value: m.userId, label: m.name, title: `${m.name} · ${m.email}` }));
}

function serverMessages(error: unknown): string[] {
  if (!isApiError(error) || !error.body) return [errorMessage(error)];
  const message = error.body.message;
  return Array.isArray(message) ? message : [message || errorMessage(error)];
}

/**
 * Who types pass 1 and who types the blind pass 2. They must be two people: the second pass only
 * catches misreadings when someone else reads the frame. Each newly assigned person gets an e-mail.
 */
export function AssignSheetModal({ sheet, members, open, onClose, onSaved }: AssignSheetModalProps) {
  const [form] = Form.useForm<AssignFormValues>();
  const [generalErrors, setGeneralErrors] = useState<string[]>([]);
  const assign = useAssignSheet({
    mutationConfig: {
      onSuccess: (saved) => onSaved?.(saved),
      onError: (error) => {
        const general: string[] = [];
        const fields: { name: keyof AssignFormValues; errors: string[] }[] = [];
        for (const message of serverMessages(error)) {
          if (message.startsWith('readerId and checkerId')) fields.push({ name: 'checkerId', errors: [message] });
          else if (message.startsWith('readerId')) fields.push({ name: 'readerId', errors: [message] });
          else if (message.startsWith('checkerId')) fields.push({ name: 'checkerId', errors: [message] });
          else general.push(message);
        }
        form.setFields(fields);
        setGeneralErrors(general);
      },
    },
  });
  const readers = optionsFor(members, 'reader');
  const checkers = optionsFor(members, 'checker');
  const started = sheet.progress.pass1.done > 0 || sheet.progress.pass2.done > 0;

  const submit = (values: AssignFormValues) => {
    setGeneralErrors([]);
    const data: { readerId?: string | null; checkerId?: string | null } = {};
    if ((values.readerId ?? null) !== sheet.readerId) data.readerId = values.readerId ?? null;
    if ((values.checkerId ?? null) !== sheet.checkerId) data.checkerId = values.checkerId ?? null;
    if (Object.keys(data).length === 0) {
      onClose();
      return;
    }
    assign.mutate({ sheetId: sheet.id, data });
  };

  return (
    <Modal
      open={open}
      title={`Assign ${sheet.name}`}
      okText="Save assignment"
      onOk={() => form.submit()}
      onCancel={onClose}
      confirmLoading={assign.isPending}
      afterClose={() => {
        assign.reset();
        setGeneralErrors([]);
      }}
      destroyOnHidden
    >
      {generalErrors.length > 0 ? (
        <Alert type="error" showIcon role="alert" className="form-alert" title={generalErrors.join(' ')} />
      ) : null}
      <Typography.Paragraph type="secondary" className="modal-note">
        The reader types pass 1; the checker types pass 2 without seeing pass 1. Each newly assigned person gets an e-mail with a link
        to the sheet.
      </Typography.Paragraph>
      {started ? (
        <Alert
          type="warning"
          showIcon
          className="form-alert"
          title="Entry has started. Entries already typed stay with the person who typed them; a new owner carries on the pass from there."
        />
      ) : null}
      <Form<AssignFormValues>
        form={form}
        layout="vertical"
        requiredMark={false}
        preserve={false}
        disabled={assign.isPending}
        initialValues={{ readerId: sheet.readerId, checkerId: sheet.checkerId }}
        onFinish={submit}
      >
        <Form.Item
          label="Reader (pass 1)"
          name="readerId"
          extra={readers.length === 0 ? 'Nobody in this campaign holds the reader role yet. Give someone the role on the Members page.' : undefined}
        >
          <Select allowClear placeholder="Nobody yet" options={readers} showSearch={{ optionFilterProp: 'label' }} />
        </Form.Item>
        <Form.Item
          label="Checker (pass 2, blind)"
          name="checkerId"
          dependencies={['readerId']}
          rules={[
            ({ getFieldValue }) => ({
              validator: (_, value: string | null | undefined) =>
                value && value === getFieldValue('readerId')
                  ? Promise.reject(new Error('Choose someone other than the reader: the blind pass needs a second pair of eyes'))
                  : Promise.resolve(),
            }),
          ]}
          extra={checkers.length === 0 ? 'Nobody in this campaign holds the checker role yet. Give someone the role on the Members page.' : undefined}
        >
          <Select allowClear placeholder="Nobody yet" options={checkers} showSearch={{ optionFilterProp: 'label' }} />
        </Form.Item>
      </Form>
    </Modal>
  );
}
