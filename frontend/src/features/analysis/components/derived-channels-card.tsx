import { useMemo, useState } from 'react';
import { Alert, Button, Card, Form, Input, Modal, Popconfirm, Skeleton, Space, Table, Typography } from 'antd';
import { DeleteOutlined, EditOutlined, PlusOutlined } from '@ant-design/icons';
import type { Channel, DerivedChannel } from '@dialsheet/common';
import { EmptyState } from '@/components/feedback/empty-state';
import { ErrorState } from '@/components/feedback/error-state';
import { errorMessage } from '@/lib/api-client';
import { useDerivedChannels } from '../api/get-derived-channels';
import { useCreateDerivedChannel } from '../api/create-derived-channel';
import { useUpdateDerivedChannel } from '../api/update-derived-channel';
import { useDeleteDerivedChannel } from '../api/delete-derived-channel';
import { compileExpression } from '../utils/analysis-lib';
import { thrownMessage } from '../utils/number-format';
import './analysis.css';

/** "cp = 1006" per line → {cp: 1006}; a line that is not "name = number" is an error naming it. */
export function parseConstants(text: string): { constants: Record<string, number>; error: string | null } {
  const constants: Record<string, number> = {};
  const lines = text.split('\n').map((l) => l.trim()).filter(Boolean);
  for (const line of lines) {
    const match = /^([A-Za-z_][A-Za-z0-9_]*)\s*=\s*(\S+)$/.exec(line);
    const value = match ? Number(match[2]) : NaN;
    if (!match || !Number.isFinite(value)) return { constants, error: `constant "${line}": write one per line as name = number, e.g. cp = 1006` };
    constants[match[1]] = value;
  }
  return { constants, error: null };
}

const constantsText = (constants: Record<string, number>) =>
  Object.entries(constants)
    .map(([k, v]) => `${k} = ${v}`)
    .join('\n');

interface FormValues {
  name: string;
  symbol: string;
  unit: string;
  expression: string;
  constants: string;
}

function DerivedChannelModal({
  campaignId,
  derived,
  symbols,
  onClose,
}: {
  campaignId: string;
  derived: DerivedChannel | null;
  /** Symbols an expression may use (channels and the other derived channels). */
  symbols: string[];
  onClose: () => void;
}) {
  const [form] = Form.useForm<FormValues>();
  const create = useCreateDerivedChannel({ mutationConfig: { onSuccess: onClose } });
  const update = useUpdateDerivedChannel({ mutationConfig: { onSuccess: onClose } });
  const mutation = derived ? update : create;
  const expression = Form.useWatch('expression', form) ?? derived?.expression ?? '';
  const constantsInput = Form.useWatch('constants', form) ?? (derived ? constantsText(derived.constants) : '');

  const check = useMemo(() => {
    const parsed = parseConstants(constantsInput);
    if (parsed.error) return { error: parsed.error, uses: [] as string[] };
    if (expression.trim() === '') return { error: null, uses: [] as string[] };
    try {
      return { error: null, uses: compileExpression(expression, symbols, parsed.constants).symbols };
    } catch (error) {
      return { error: thrownMessage(error), uses: [] as string[] };
    }
  }, [expression, constantsInput, symbols]);

  const submit = (values: FormValues) => {
    if (check.error) return;
    const data = {
      name: values.name.trim(),
      symbol: values.symbol.trim(),
      unit: values.unit.trim(),
      expression: values.expression.trim(),
      constants: parseConstants(values.constants ?? '').constants,
    };
    if (derived) update.mutate({ derivedChannelId: derived.id, data: { ...data, baseVersion: derived.version } });
    else create.mutate({ campaignId, data });
  };

  return (
    <Modal
      open
      title={derived ? `Edit derived channel ${derived.symbol}` : 'New derived channel'}
      okText={derived ? 'Save changes' : 'Add derived channel'}
      onOk={() => form.submit()}
      okButtonProps={{ disabled: check.error !== null }}
      onCancel={onClose}
      confirmLoading={mutation.isPending}
      destroyOnHidden
    >
      {mutation.isError ? <Alert type="error" showIcon role="alert" className="form-alert" title={errorMessage(mutation.error)} /> : null}
      <Form<FormValues>
        form={form}
        layout="vertical"
        requiredMark={false}
        onFinish={submit}
        initialValues={{
          name: derived?.name ?? '',
          symbol: derived?.symbol ?? '',
          unit: derived?.unit ?? '',
          expression: derived?.expression ?? '',
          constants: derived ? constantsText(derived.constants) : '',
        }}
      >
        <Form.Item label="Name" name="name" rules={[{ required: true, whitespace: true, message: 'Give it a name' }]}>
          <Input autoFocus placeholder="e.g. Warm stream heat rate" />
        </Form.Item>
        <Space size={12}>
          <Form.Item label="Symbol" name="symbol" rules={[{ required: true, whitespace: true, message: 'Give a symbol' }]}>
            <Input placeholder="e.g. Q1" />
          </Form.Item>
          <Form.Item label="Unit" name="unit" rules={[{ required: true, whitespace: true, message: 'Give its unit' }]}>
            <Input placeholder="e.g. W" />
          </Form.Item>
        </Space>
        <Form.Item
          label="Expression"
          name="expression"
          rules={[{ required: true, whitespace: true, message: 'Write the expression' }]}
          extra={`Plain arithmetic over ${symbols.join(', ') || 'the channel symbols'} and the constants below.`}
        >
          <Input className="numeric" placeholder="e.g. m / 60 * cp * (T1 - T2)" />
        </Form.Item>
        <Form.Item label="Constants (one per line, name = number)" name="constants">
          <Input.TextArea rows={2} placeholder="cp = 1006" />
        </Form.Item>
        {check.error ? (
          <Alert type="error" showIcon role="alert" title="The expression does not work yet" description={check.error} />
        ) : check.uses.length > 0 ? (
          <Typography.Text type="secondary">Uses {check.uses.join(', ')}.</Typography.Text>
        ) : null}
        {/* Enter in a field submits the form through this button; the dialog's own button is outside it. */}
        <button type="submit" hidden />
      </Form>
    </Modal>
  );
}

interface DerivedChannelsCardProps {
  campaignId: string;
  channels: Channel[];
  canEdit: boolean;
}

export function DerivedChannelsCard({ campaignId, channels, canEdit }: DerivedChannelsCardProps) {
  const derived = useDerivedChannels({ campaignId });
  const remove = useDeleteDerivedChannel();
  // undefined: closed; null: new.
  const [editing, setEditing] = useState<DerivedChannel | null | undefined>(undefined);
  const list = derived.data ?? [];
  const symbolsFor = (d: DerivedChannel | null) => [...channels.map((c) => c.symbol), ...list.filter((x) => x.id !== d?.id).map((x) => x.symbol)];

  return (
    <Card
      size="small"
      className="section-card"
      title="Derived channels"
      extra={
        canEdit ? (
          <Button size="small" icon={<PlusOutlined />} onClick={() => setEditing(null)}>
            New derived channel
          </Button>
        ) : null
      }
    >
      {derived.isPending ? (
        <Skeleton active paragraph={{ rows: 2 }} />
      ) : derived.isError ? (
        <ErrorState error={derived.error} onRetry={() => void derived.refetch()} />
      ) : list.length === 0 ? (
        <EmptyState
          title="No derived channels"
          description="A derived channel is computed at each timestamp from other channels, e.g. a heat rate from a mass flow and two temperatures."
        />
      ) : (
        <Table<DerivedChannel>
          size="small"
          className="data-table"
          rowKey="id"
          pagination={false}
          dataSource={list}
          columns={[
            { title: 'Symbol', dataIndex: 'symbol' },
            { title: 'Name', dataIndex: 'name' },
            { title: 'Expression', key: 'expression', render: (_, d) => <code>{d.expression}</code> },
            { title: 'Unit', dataIndex: 'unit' },
            ...(canEdit
              ? [
                  {
                    title: '',
                    key: 'actions',
                    render: (_: unknown, d: DerivedChannel) => (
                      <Space size={4}>
                        <Button size="small" aria-label={`Edit ${d.symbol}`} icon={<EditOutlined />} onClick={() => setEditing(d)} />
                        <Popconfirm title={`Delete ${d.symbol}?`} okText="Delete" onConfirm={() => remove.mutate({ campaignId, derivedChannelId: d.id })}>
                          <Button size="small" danger aria-label={`Delete ${d.symbol}`} icon={<DeleteOutlined />} />
                        </Popconfirm>
                      </Space>
                    ),
                  },
                ]
              : []),
          ]}
        />
      )}
      {canEdit && editing !== undefined ? (
        <DerivedChannelModal key={editing?.id ?? 'new'} campaignId={campaignId} derived={editing} symbols={symbolsFor(editing)} onClose={() => setEditing(undefined)} />
      ) : null}
    </Card>
  );
}
