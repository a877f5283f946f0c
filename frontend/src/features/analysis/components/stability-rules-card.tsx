import { useMemo, useState } from 'react';
import { Alert, Button, Card, Form, Input, InputNumber, Modal, Popconfirm, Select, Skeleton, Space, Table, Typography } from 'antd';
import { DeleteOutlined, EditOutlined, PlusOutlined } from '@ant-design/icons';
import type { Channel, CreateStabilityRuleRequest, StoredStabilityRule } from '@dialsheet/common';
import { EmptyState } from '@/components/feedback/empty-state';
import { ErrorState } from '@/components/feedback/error-state';
import { errorMessage } from '@/lib/api-client';
import { useStabilityRules } from '../api/get-stability-rules';
import { useCreateStabilityRule } from '../api/create-stability-rule';
import { useUpdateStabilityRule } from '../api/update-stability-rule';
import { useDeleteStabilityRule } from '../api/delete-stability-rule';
import { validateStabilityRule } from '../utils/analysis-lib';
import { sig, thrownMessage } from '../utils/number-format';
import './analysis.css';

interface FormValues {
  name: string;
  channelId: string | null;
  windowMinutes: number | null;
  slopeLimitPerMinute: number | null;
  bandLimit: number | null;
  driftLimit: number | null;
}

const orNull = (v: number | null | undefined) => (typeof v === 'number' && Number.isFinite(v) ? v : null);

function toRequest(v: Partial<FormValues>): CreateStabilityRuleRequest {
  return {
    name: (v.name ?? '').trim(),
    channelId: v.channelId ?? null,
    windowSeconds: (orNull(v.windowMinutes) ?? NaN) * 60,
    slopeLimitPerMinute: orNull(v.slopeLimitPerMinute),
    bandLimit: orNull(v.bandLimit),
    driftLimit: orNull(v.driftLimit),
  };
}

function StabilityRuleModal({
  campaignId,
  rule,
  channels,
  onClose,
}: {
  campaignId: string;
  rule: StoredStabilityRule | null;
  channels: Channel[];
  onClose: () => void;
}) {
  const [form] = Form.useForm<FormValues>();
  const create = useCreateStabilityRule({ mutationConfig: { onSuccess: onClose } });
  const update = useUpdateStabilityRule({ mutationConfig: { onSuccess: onClose } });
  const mutation = rule ? update : create;
  const values = Form.useWatch([], form) as Partial<FormValues> | undefined;
  const error = useMemo(() => {
    if (!values || !values.name?.trim() || values.windowMinutes === undefined) return null;
    try {
      validateStabilityRule(toRequest(values));
      return null;
    } catch (e) {
      return thrownMessage(e);
    }
  }, [values]);

  const submit = (v: FormValues) => {
    const data = toRequest(v);
    try {
      validateStabilityRule(data);
    } catch {
      return;
    }
    if (rule) update.mutate({ stabilityRuleId: rule.id, data: { ...data, baseVersion: rule.version } });
    else create.mutate({ campaignId, data });
  };

  return (
    <Modal
      open
      title={rule ? `Edit rule ${rule.name}` : 'New stability rule'}
      okText={rule ? 'Save changes' : 'Add rule'}
      onOk={() => form.submit()}
      okButtonProps={{ disabled: error !== null }}
      onCancel={onClose}
      confirmLoading={mutation.isPending}
      destroyOnHidden
    >
      {mutation.isError ? <Alert type="error" showIcon role="alert" className="form-alert" title={errorMessage(mutation.error)} /> : null}
      <Typography.Paragraph type="secondary">
        The window ends at the chosen time t* and reaches back its length. Set at least one limit; each set limit is judged on its own.
        (Kind of rule: ASHRAE 93 calls a collector outlet steady when it varies less than 0.05 °C per minute.)
      </Typography.Paragraph>
      <Form<FormValues>
        form={form}
        layout="vertical"
        requiredMark={false}
        onFinish={submit}
        initialValues={{
          name: rule?.name ?? '',
          channelId: rule?.channelId ?? null,
          windowMinutes: rule ? rule.windowSeconds / 60 : 5,
          slopeLimitPerMinute: rule?.slopeLimitPerMinute ?? null,
          bandLimit: rule?.bandLimit ?? null,
          driftLimit: rule?.driftLimit ?? null,
        }}
      >
        <Form.Item label="Name" name="name" rules={[{ required: true, whitespace: true, message: 'Give the rule a name' }]}>
          <Input autoFocus placeholder="e.g. Outlet steady, 5 min" />
        </Form.Item>
        <Form.Item label="Applies to" name="channelId">
          <Select
            options={[{ value: null, label: 'Any channel of the campaign' }, ...channels.map((c) => ({ value: c.id, label: `${c.symbol} · ${c.name}` }))]}
          />
        </Form.Item>
        <Space size={12} wrap>
          <Form.Item label="Window" name="windowMinutes" rules={[{ required: true, type: 'number', message: 'Give the window length' }]}>
            <InputNumber className="numeric" controls={false} suffix="min" />
          </Form.Item>
          <Form.Item label="Slope limit" name="slopeLimitPerMinute">
            <InputNumber className="numeric" controls={false} suffix="units/min" />
          </Form.Item>
          <Form.Item label="Max − min band" name="bandLimit">
            <InputNumber className="numeric" controls={false} suffix="units" />
          </Form.Item>
          <Form.Item label="Drift over window" name="driftLimit">
            <InputNumber className="numeric" controls={false} suffix="units" />
          </Form.Item>
        </Space>
        {error ? <Alert type="error" showIcon role="alert" title={error} /> : null}
        <button type="submit" hidden />
      </Form>
    </Modal>
  );
}

interface StabilityRulesCardProps {
  campaignId: string;
  channels: Channel[];
  canEdit: boolean;
}

export function StabilityRulesCard({ campaignId, channels, canEdit }: StabilityRulesCardProps) {
  const rules = useStabilityRules({ campaignId });
  const remove = useDeleteStabilityRule();
  const [editing, setEditing] = useState<StoredStabilityRule | null | undefined>(undefined);
  const symbolOf = (id: string | null) => (id ? (channels.find((c) => c.id === id)?.symbol ?? '?') : 'any');
  const limit = (v: number | null | undefined, unit: string) => (v === null || v === undefined ? '–' : `${sig(v)} ${unit}`);

  return (
    <Card
      size="small"
      className="section-card"
      title="Stability rules"
      extra={
        canEdit ? (
          <Button size="small" icon={<PlusOutlined />} onClick={() => setEditing(null)}>
            New rule
          </Button>
        ) : null
      }
    >
      {rules.isPending ? (
        <Skeleton active paragraph={{ rows: 2 }} />
      ) : rules.isError ? (
        <ErrorState error={rules.error} onRetry={() => void rules.refetch()} />
      ) : rules.data.length === 0 ? (
        <EmptyState title="No stability rules" description="A rule judges whether a channel has settled: a slope limit, a max − min band or a drift over a window." />
      ) : (
        <Table<StoredStabilityRule>
          size="small"
          className="data-table"
          rowKey="id"
          pagination={false}
          dataSource={rules.data}
          columns={[
            { title: 'Rule', dataIndex: 'name' },
            { title: 'Channel', key: 'channel', render: (_, r) => symbolOf(r.channelId) },
            { title: 'Window', key: 'window', align: 'right', render: (_, r) => `${sig(r.windowSeconds / 60)} min` },
            { title: '|Slope| ≤', key: 'slope', align: 'right', render: (_, r) => limit(r.slopeLimitPerMinute, '/min') },
            { title: 'Band ≤', key: 'band', align: 'right', render: (_, r) => limit(r.bandLimit, '') },
            { title: 'Drift ≤', key: 'drift', align: 'right', render: (_, r) => limit(r.driftLimit, '') },
            ...(canEdit
              ? [
                  {
                    title: '',
                    key: 'actions',
                    render: (_: unknown, r: StoredStabilityRule) => (
                      <Space size={4}>
                        <Button size="small" aria-label={`Edit rule ${r.name}`} icon={<EditOutlined />} onClick={() => setEditing(r)} />
                        <Popconfirm title={`Delete rule ${r.name}?`} okText="Delete" onConfirm={() => remove.mutate({ campaignId, stabilityRuleId: r.id })}>
                          <Button size="small" danger aria-label={`Delete rule ${r.name}`} icon={<DeleteOutlined />} />
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
        <StabilityRuleModal key={editing?.id ?? 'new'} campaignId={campaignId} rule={editing} channels={channels} onClose={() => setEditing(undefined)} />
      ) : null}
    </Card>
  );
}
