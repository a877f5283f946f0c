import { useState } from 'react';
import { Alert, Col, Form, Input, Modal, Row, Typography, type FormRule } from 'antd';
import { formatTestTime, parseTimecode, sheetRowTimes, type Channel, type Sheet, type UpdateSheetRequest } from '@dialsheet/common';
import { errorMessage, isApiError } from '@/lib/api-client';
import { useCreateSheet } from '../api/create-sheet';
import { useUpdateSheet } from '../api/update-sheet';
import { formatCount } from '../utils/sheet-format';
import { ChannelOrderPicker } from './channel-order-picker';
import { IntervalInput } from './interval-input';

interface SheetFormValues {
  name: string;
  start: string;
  end: string;
  interval: number | null;
  channelIds: string[];
  reason?: string;
}

type FieldName = keyof SheetFormValues;

interface SheetFormModalProps {
  runId: string;
  /** The campaign's channels in their order. */
  channels: Channel[];
  /** The sheet to change; left out, the modal plans a new one. */
  sheet?: Sheet;
  /** Test time where the recording ends (the last possible row), when known. */
  maxEndTime: number | null;
  open: boolean;
  onClose: () => void;
  onSaved?: (sheet: Sheet) => void;
}

const MIN_INTERVAL = 0.1;

/** The server names the field first in each message ("endTime must be …", "channelIds.2 is …"). */
const SERVER_FIELDS: [RegExp, FieldName][] = [
  [/^name\b/, 'name'],
  [/^startTime\b/, 'start'],
  [/^endTime\b/, 'end'],
  [/^interval\b/, 'interval'],
  [/^channelIds\b/, 'channelIds'],
];

function serverMessages(error: unknown): string[] {
  if (!isApiError(error) || !error.body) return [errorMessage(error)];
  const message = error.body.message;
  return Array.isArray(message) ? message : [message || errorMessage(error)];
}

function timeOf(text: string | undefined): number | null {
  if (!text?.trim()) return null;
  try {
    return parseTimecode(text.trim());
  } catch {
    return null;
  }
}

const timeRule: FormRule = {
  validator: (_, text: string | undefined) => {
    if (!text?.trim()) return Promise.reject(new Error('Give a test time, e.g. 0, 90 or 01:30.000'));
    try {
      if (parseTimecode(text.trim()) < 0) return Promise.reject(new Error('Test time must be 0 s or later'));
      return Promise.resolve();
    } catch (error) {
      return Promise.reject(new Error(`Not a time: ${(error as Error).message}`));
    }
  },
};

/** "301 rows × 6 channels = 1 806 cells", or why the plan does not work yet. */
function planSummary(start: number | null, end: number | null, interval: number | null, channels: number): string | null {
  if (start === null || end === null || interval === null || !(interval >= MIN_INTERVAL) || !(end > start)) return null;
  try {
    const rows = sheetRowTimes(start, end, interval).length;
    return `${formatCount(rows)} rows × ${channels} channel${channels === 1 ? '' : 's'} = ${formatCount(rows * channels)} cells`;
  } catch (error) {
    return (error as Error).message;
  }
}

/** Plans a sheet on a run (or changes one): start, end, interval and the channels in entry order. */
export function SheetFormModal({ runId, channels, sheet, maxEndTime, open, onClose, onSaved }: SheetFormModalProps) {
  const [form] = Form.useForm<SheetFormValues>();
  const editing = sheet !== undefined;
  const [generalErrors, setGeneralErrors] = useState<string[]>([]);

  const showServerError = (error: unknown) => {
    const general: string[] = [];
    const byField = new Map<FieldName, string[]>();
    for (const message of serverMessages(error)) {
      const field = SERVER_FIELDS.find(([pattern]) => pattern.test(message))?.[1];
      if (field) byField.set(field, [...(byField.get(field) ?? []), message]);
      else general.push(message);
    }
    form.setFields([...byField].map(([name, errors]) => ({ name, errors })));
    setGeneralErrors(general);
  };

  const create = useCreateSheet({ mutationConfig: { onSuccess: (saved) => onSaved?.(saved), onError: showServerError } });
  const update = useUpdateSheet({ mutationConfig: { onSuccess: (saved) => onSaved?.(saved), onError: showServerError } });
  const pending = create.isPending || update.isPending;

  const start = timeOf(Form.useWatch('start', form));
  const end = timeOf(Form.useWatch('end', form));
  const interval = Form.useWatch('interval', form) ?? null;
  const channelCount = Form.useWatch('channelIds', form)?.length ?? 0;
  const summary = planSummary(start, end, interval, channelCount);

  const submit = (values: SheetFormValues) => {
    setGeneralErrors([]);
    const data = {
      name: values.name.trim(),
      startTime: parseTimecode(values.start.trim()),
      endTime: parseTimecode(values.end.trim()),
      interval: values.interval as number,
      channelIds: values.channelIds,
    };
    if (sheet) {
      const changed: UpdateSheetRequest = {};
      if (data.name !== sheet.name) changed.name = data.name;
      if (data.startTime !== sheet.startTime) changed.startTime = data.startTime;
      if (data.endTime !== sheet.endTime) changed.endTime = data.endTime;
      if (data.interval !== sheet.interval) changed.interval = data.interval;
      if (data.channelIds.join() !== sheet.channelIds.join()) changed.channelIds = data.channelIds;
      const reason = values.reason?.trim();
      update.mutate({ sheetId: sheet.id, data: { ...changed, ...(reason ? { reason } : {}) } });
    } else {
      create.mutate({ runId, data });
    }
  };

  const endRules: FormRule[] = [
    timeRule,
    ({ getFieldValue }) => ({
      validator: (_, text: string | undefined) => {
        const value = timeOf(text);
        const from = timeOf(getFieldValue('start') as string | undefined);
        if (value !== null && from !== null && !(value > from)) return Promise.reject(new Error('The end must come after the start'));
        if (value !== null && maxEndTime !== null && value > maxEndTime + 1e-6) {
          return Promise.reject(new Error(`The recording ends at ${formatTestTime(maxEndTime)} test time; end there or earlier`));
        }
        return Promise.resolve();
      },
    }),
  ];

  return (
    <Modal
      open={open}
      title={editing ? `Edit sheet ${sheet.name}` : 'New sheet'}
      okText={editing ? 'Save changes' : 'Create sheet'}
      onOk={() => form.submit()}
      onCancel={onClose}
      confirmLoading={pending}
      afterClose={() => {
        create.reset();
        update.reset();
        setGeneralErrors([]);
      }}
      width={720}
      destroyOnHidden
    >
      {generalErrors.length > 0 ? (
        <Alert
          type="error"
          showIcon
          role="alert"
          className="form-alert"
          title={generalErrors.length === 1 ? generalErrors[0] : 'The sheet was not saved'}
          description={generalErrors.length > 1 ? <ul className="plain-list">{generalErrors.map((m) => <li key={m}>{m}</li>)}</ul> : undefined}
        />
      ) : null}
      <Form<SheetFormValues>
        form={form}
        layout="vertical"
        requiredMark={false}
        preserve={false}
        disabled={pending}
        initialValues={{
          name: sheet?.name ?? '',
          start: sheet ? formatTestTime(sheet.startTime) : '0',
          end: sheet ? formatTestTime(sheet.endTime) : maxEndTime !== null ? formatTestTime(Math.floor(maxEndTime * 1000) / 1000) : '',
          interval: sheet?.interval ?? 2,
          channelIds: sheet?.channelIds ?? channels.map((c) => c.id),
        }}
        onFinish={submit}
      >
        <Form.Item
          label="Name"
          name="name"
          rules={[
            { required: true, whitespace: true, message: 'Give the sheet a name' },
            { max: 200, message: 'Keep the name under 200 characters' },
          ]}
        >
          <Input placeholder="e.g. Warm-up, every 2 s" autoFocus />
        </Form.Item>
        <Row gutter={16}>
          <Col xs={24} sm={12}>
            <Form.Item label="Start (test time)" name="start" rules={[timeRule]} extra="Seconds, or mm:ss.SSS">
              <Input className="numeric" placeholder="0" />
            </Form.Item>
          </Col>
          <Col xs={24} sm={12}>
            <Form.Item
              label="End (test time)"
              name="end"
              dependencies={['start']}
              rules={endRules}
              extra={maxEndTime !== null ? `The recording ends at ${formatTestTime(maxEndTime)}` : undefined}
            >
              <Input className="numeric" placeholder="e.g. 10:00" />
            </Form.Item>
          </Col>
        </Row>
        <Form.Item
          label="Interval"
          name="interval"
          rules={[
            { required: true, type: 'number', message: 'Choose the seconds between rows' },
            { type: 'number', min: MIN_INTERVAL, message: `The interval must be at least ${MIN_INTERVAL} s` },
          ]}
          extra={summary ? <span className="numeric" data-testid="sheet-plan-summary">{summary}</span> : undefined}
        >
          <IntervalInput />
        </Form.Item>
        <Form.Item
          label="Channels"
          name="channelIds"
          rules={[{ required: true, type: 'array', min: 1, message: 'Put at least one channel on the sheet' }]}
        >
          <ChannelOrderPicker channels={channels} />
        </Form.Item>
        {editing ? (
          <>
            <Typography.Paragraph type="secondary" className="modal-note">
              Entries already typed stay with their rows and channels; rows or channels dropped from the plan keep their entries but no
              longer count.
            </Typography.Paragraph>
            <Form.Item label="Reason for the change (kept in the audit trail)" name="reason">
              <Input placeholder="Optional" maxLength={500} />
            </Form.Item>
          </>
        ) : null}
      </Form>
    </Modal>
  );
}
