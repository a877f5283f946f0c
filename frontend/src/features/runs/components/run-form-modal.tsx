import { Alert, DatePicker, Form, Input, Modal } from 'antd';
import dayjs, { type Dayjs } from 'dayjs';
import type { Run } from '@dialsheet/common';
import { errorMessage } from '@/lib/api-client';
import { useCreateRun } from '../api/create-run';
import { useUpdateRun } from '../api/update-run';

interface RunFormValues {
  name: string;
  runDate?: Dayjs | null;
  configuration?: string;
  operator?: string;
  notes?: string;
  reason?: string;
}

interface RunFormModalProps {
  campaignId: string;
  /** The run to edit; left out, the modal creates a new run. */
  run?: Run;
  open: boolean;
  onClose: () => void;
  onSaved?: (run: Run) => void;
}

const DATE_FORMAT = 'YYYY-MM-DD';

/** New run, or changes to one: name, day of the test, rig configuration, operator and notes. */
export function RunFormModal({ campaignId, run, open, onClose, onSaved }: RunFormModalProps) {
  const [form] = Form.useForm<RunFormValues>();
  const editing = run !== undefined;
  const create = useCreateRun({ mutationConfig: { onSuccess: (saved) => onSaved?.(saved) } });
  const update = useUpdateRun({ mutationConfig: { onSuccess: (saved) => onSaved?.(saved) } });
  const mutation = editing ? update : create;

  const submit = (values: RunFormValues) => {
    const data = {
      name: values.name.trim(),
      runDate: values.runDate ? values.runDate.format(DATE_FORMAT) : null,
      configuration: values.configuration?.trim() ?? '',
      operator: values.operator?.trim() ?? '',
      notes: values.notes?.trim() ?? '',
    };
    if (run) update.mutate({ runId: run.id, data: { ...data, reason: values.reason?.trim() || undefined } });
    else create.mutate({ campaignId, data });
  };

  return (
    <Modal
      open={open}
      title={editing ? 'Edit run' : 'New run'}
      okText={editing ? 'Save changes' : 'Create run'}
      onOk={() => form.submit()}
      onCancel={onClose}
      confirmLoading={mutation.isPending}
      afterClose={() => {
        create.reset();
        update.reset();
      }}
      destroyOnHidden
    >
      {mutation.isError ? <Alert type="error" showIcon className="form-alert" title={errorMessage(mutation.error)} /> : null}
      <Form<RunFormValues>
        form={form}
        layout="vertical"
        requiredMark={false}
        preserve={false}
        disabled={mutation.isPending}
        initialValues={{
          name: run?.name ?? '',
          runDate: run?.runDate ? dayjs(run.runDate, DATE_FORMAT) : null,
          configuration: run?.configuration ?? '',
          operator: run?.operator ?? '',
          notes: run?.notes ?? '',
        }}
        onFinish={submit}
      >
        <Form.Item
          label="Name"
          name="name"
          rules={[
            { required: true, whitespace: true, message: 'Give the run a name' },
            { max: 200, message: 'Keep the name under 200 characters' },
          ]}
        >
          <Input placeholder="e.g. Run 3, meter on the cool stream" autoFocus />
        </Form.Item>
        <Form.Item label="Day of the test" name="runDate">
          <DatePicker format={DATE_FORMAT} className="full-width" placeholder="YYYY-MM-DD" />
        </Form.Item>
        <Form.Item
          label="Configuration"
          name="configuration"
          rules={[{ max: 1000, message: 'Keep the configuration under 1000 characters' }]}
          extra="How the rig was set up for this run, such as which stream the movable meter sits on."
        >
          <Input placeholder="e.g. flow meter on warm stream" />
        </Form.Item>
        <Form.Item label="Operator" name="operator" rules={[{ max: 200, message: 'Keep the operator under 200 characters' }]}>
          <Input placeholder="Who ran the rig" />
        </Form.Item>
        <Form.Item label="Notes" name="notes" rules={[{ max: 10000, message: 'Keep the notes under 10 000 characters' }]}>
          <Input.TextArea autoSize={{ minRows: 2, maxRows: 6 }} />
        </Form.Item>
        {editing ? (
          <Form.Item label="Reason for the change (kept in the audit trail)" name="reason">
            <Input placeholder="Optional" maxLength={500} />
          </Form.Item>
        ) : null}
      </Form>
    </Modal>
  );
}
