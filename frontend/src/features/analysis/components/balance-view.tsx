import { useMemo, useState, type KeyboardEvent } from 'react';
import { Alert, Button, Card, Checkbox, Flex, Input, InputNumber, Modal, Popconfirm, Select, Skeleton, Space, Table, Typography } from 'antd';
import { DeleteOutlined, PlusOutlined, ReloadOutlined, SaveOutlined } from '@ant-design/icons';
import type { Analysis, BalanceAnalysis, BalanceInput, BalanceStreamInput, EnthalpyModel, StableValueAnalysis } from '@dialsheet/common';
import { EmptyState } from '@/components/feedback/empty-state';
import { ErrorState } from '@/components/feedback/error-state';
import { errorMessage } from '@/lib/api-client';
import { useAnalyses } from '../api/get-analyses';
import { useCreateAnalysis } from '../api/create-analysis';
import { useRecomputeAnalysis } from '../api/recompute-analysis';
import { useDeleteAnalysis } from '../api/delete-analysis';
import { computeBalance } from '../utils/balance-preview';
import { plusMinus, sig } from '../utils/number-format';
import { AnalysisStatusTag } from './analysis-status-tag';
import { ClosureView } from './closure-view';
import { ResultCaution } from './result-caution';
import './analysis.css';

interface BalanceViewProps {
  campaignId: string;
  canEdit: boolean;
  channelName: (id: string) => string;
  runName: (id: string) => string;
}

let nextStream = 1;
const newStream = (side: 'in' | 'out'): BalanceStreamInput => {
  const n = nextStream++;
  return { id: `s${n}`, label: side === 'in' ? `Stream in ${n}` : `Stream out ${n}`, side, massFlowAnalysisId: '', temperatureAnalysisId: null, minusTemperatureAnalysisId: null };
};

const isStable = (a: Analysis): a is StableValueAnalysis => a.kind === 'stable-value';
const isBalance = (a: Analysis): a is BalanceAnalysis => a.kind === 'balance';

function SaveBalanceModal({ campaignId, input, onClose }: { campaignId: string; input: BalanceInput; onClose: () => void }) {
  const [name, setName] = useState('');
  const [note, setNote] = useState('');
  const create = useCreateAnalysis({ mutationConfig: { onSuccess: onClose } });
  const submit = () => {
    if (name.trim() === '' || create.isPending) return;
    create.mutate({ campaignId, data: { kind: 'balance', name: name.trim(), note: note.trim() || null, input } });
  };
  const onKeyDown = (event: KeyboardEvent<HTMLDivElement>) => {
    if (event.key === 'Enter' && (event.target as HTMLElement).tagName === 'INPUT') {
      event.preventDefault();
      submit();
    }
  };
  return (
    <Modal open title="Save balance" okText="Save balance" onOk={submit} okButtonProps={{ disabled: name.trim() === '' }} confirmLoading={create.isPending} onCancel={onClose} destroyOnHidden>
      <div onKeyDown={onKeyDown}>
        {create.isError ? <Alert type="error" showIcon role="alert" className="form-alert" title={errorMessage(create.error)} /> : null}
        <Space orientation="vertical" className="full-width">
          <label className="calibration-field">
            <Typography.Text type="secondary">Name (unique in the campaign)</Typography.Text>
            <Input aria-label="Balance name" autoFocus value={name} onChange={(e) => setName(e.target.value)} />
          </label>
          <label className="calibration-field">
            <Typography.Text type="secondary">Note (optional)</Typography.Text>
            <Input aria-label="Note" value={note} onChange={(e) => setNote(e.target.value)} />
          </label>
        </Space>
      </div>
    </Modal>
  );
}

/** Streams in and out from saved stable values of any run; the closure is computed as you choose. */
function BalanceEditor({ campaignId, stable, label }: { campaignId: string; stable: StableValueAnalysis[]; label: (a: StableValueAnalysis) => string }) {
  const [streams, setStreams] = useState<BalanceStreamInput[]>(() => [newStream('in'), newStream('out')]);
  const [energy, setEnergy] = useState(false);
  const [model, setModel] = useState<EnthalpyModel>({ kind: 'constant-cp', cp: 1006, referenceTemperatureC: 0 });
  const [saving, setSaving] = useState(false);
  const byId = useMemo(() => new Map(stable.map((a) => [a.id, a])), [stable]);
  const input: BalanceInput = { streams, energy, enthalpyModel: energy ? model : null, coverageFactor: 2 };
  const computed = useMemo(() => computeBalance(input, byId), [streams, energy, model, byId]); // eslint-disable-line react-hooks/exhaustive-deps
  const choices = stable.map((a) => ({
    value: a.id,
    label: `${label(a)}${a.result ? ` = ${plusMinus(a.result.stable.value, a.result.stable.expandedUncertainty, a.result.stable.unit, 4)}` : ' (no result)'}`,
  }));
  const set = (i: number, patch: Partial<BalanceStreamInput>) => setStreams((all) => all.map((s, j) => (j === i ? { ...s, ...patch } : s)));

  return (
    <Space orientation="vertical" size={12} className="full-width">
      <Table<BalanceStreamInput>
        size="small"
        className="data-table"
        rowKey="id"
        pagination={false}
        dataSource={streams}
        columns={[
          {
            title: 'Stream',
            key: 'label',
            render: (_, s, i) => <Input aria-label={`Stream ${i + 1} label`} value={s.label} onChange={(e) => set(i, { label: e.target.value })} />,
          },
          {
            title: 'Side',
            key: 'side',
            render: (_, s, i) => (
              <Select aria-label={`Stream ${i + 1} side`} value={s.side} style={{ width: 80 }} onChange={(side) => set(i, { side })} options={[{ value: 'in', label: 'in' }, { value: 'out', label: 'out' }]} />
            ),
          },
          {
            title: 'Mass flow',
            key: 'mass',
            render: (_, s, i) => (
              <Select aria-label={`Stream ${i + 1} mass flow`} style={{ minWidth: 260 }} value={s.massFlowAnalysisId || undefined} placeholder="Saved stable value" options={choices} onChange={(v) => set(i, { massFlowAnalysisId: v })} />
            ),
          },
          ...(energy
            ? [
                {
                  title: 'Temperature',
                  key: 'temperature',
                  render: (_: unknown, s: BalanceStreamInput, i: number) => (
                    <Select aria-label={`Stream ${i + 1} temperature`} style={{ minWidth: 220 }} value={s.temperatureAnalysisId ?? undefined} placeholder="Saved stable value" options={choices} onChange={(v) => set(i, { temperatureAnalysisId: v })} />
                  ),
                },
                {
                  title: 'Minus temperature (optional)',
                  key: 'minus',
                  render: (_: unknown, s: BalanceStreamInput, i: number) => (
                    <Select
                      aria-label={`Stream ${i + 1} minus temperature`}
                      style={{ minWidth: 200 }}
                      allowClear
                      value={s.minusTemperatureAnalysisId ?? undefined}
                      placeholder="none"
                      options={choices}
                      onChange={(v) => set(i, { minusTemperatureAnalysisId: v ?? null })}
                    />
                  ),
                },
              ]
            : []),
          {
            title: '',
            key: 'remove',
            render: (_, s) => (
              <Button aria-label={`Remove ${s.label}`} icon={<DeleteOutlined />} disabled={streams.length <= 2} onClick={() => setStreams((all) => all.filter((x) => x.id !== s.id))} />
            ),
          },
        ]}
      />
      <Flex gap={12} wrap align="center">
        <Button icon={<PlusOutlined />} onClick={() => setStreams((all) => [...all, newStream('in')])}>
          Add stream
        </Button>
        <Checkbox checked={energy} onChange={(e) => setEnergy(e.target.checked)}>
          Energy balance as well (ṁ·h, air as an ideal gas)
        </Checkbox>
        {energy ? (
          <>
            <Select<EnthalpyModel['kind']>
              aria-label="Enthalpy model"
              value={model.kind}
              style={{ width: 260 }}
              onChange={(kind) => setModel(kind === 'constant-cp' ? { kind, cp: 1006, referenceTemperatureC: 0 } : { kind })}
              options={[
                { value: 'constant-cp', label: 'Constant cp' },
                { value: 'ideal-gas-table', label: 'h(T) from the ideal-gas table of air' },
              ]}
            />
            {model.kind === 'constant-cp' ? (
              <InputNumber
                aria-label="cp"
                className="numeric"
                controls={false}
                suffix="J/(kg K)"
                value={model.cp ?? 1006}
                onChange={(cp) => setModel({ ...model, cp: typeof cp === 'number' ? cp : undefined })}
              />
            ) : null}
          </>
        ) : null}
        <Button type="primary" icon={<SaveOutlined />} disabled={!computed.output} onClick={() => setSaving(true)}>
          Save balance
        </Button>
      </Flex>
      {computed.error ? <Alert type="info" showIcon role="alert" title="No closure yet" description={computed.error} /> : null}
      {computed.output ? (
        <Card size="small" className="section-card" title="Closure (live)">
          <Space orientation="vertical" size={16} className="full-width">
            <ClosureView result={computed.output.mass} />
            {computed.output.energy ? <ClosureView result={computed.output.energy} /> : null}
          </Space>
        </Card>
      ) : null}
      {saving ? <SaveBalanceModal campaignId={campaignId} input={input} onClose={() => setSaving(false)} /> : null}
    </Space>
  );
}

function SavedBalances({ balances, canEdit }: { balances: BalanceAnalysis[]; canEdit: boolean }) {
  const recompute = useRecomputeAnalysis();
  const remove = useDeleteAnalysis();
  if (balances.length === 0) return <EmptyState title="No balances saved yet" description={canEdit ? 'Build one above and save it.' : 'An engineer of this campaign builds and saves them.'} />;
  return (
    <Table<BalanceAnalysis>
      size="small"
      className="data-table"
      rowKey="id"
      pagination={false}
      dataSource={balances}
      expandable={{
        expandedRowRender: (b) =>
          b.result ? (
            <Space orientation="vertical" size={16} className="full-width">
              <ClosureView result={b.result.mass} />
              {b.result.energy ? <ClosureView result={b.result.energy} /> : null}
            </Space>
          ) : (
            <Typography.Text type="secondary">{b.error ?? 'No result.'}</Typography.Text>
          ),
      }}
      columns={[
        { title: 'Name', dataIndex: 'name' },
        { title: 'Streams', key: 'streams', render: (_, b) => b.input.streams.length },
        { title: 'Mass closure', key: 'mass', align: 'right', render: (_, b) => (b.result ? `${sig(b.result.mass.closurePercent, 3)} % ± ${sig(b.result.mass.expandedUncertaintyPercent, 2)} %` : '–') },
        {
          title: 'Energy closure',
          key: 'energy',
          align: 'right',
          render: (_, b) => (b.result?.energy ? `${sig(b.result.energy.closurePercent, 3)} % ± ${sig(b.result.energy.expandedUncertaintyPercent, 2)} %` : '–'),
        },
        { title: 'Status', key: 'status', render: (_, b) => <AnalysisStatusTag analysis={b} /> },
        ...(canEdit
          ? [
              {
                title: '',
                key: 'actions',
                render: (_: unknown, b: BalanceAnalysis) => (
                  <Space size={4}>
                    <Button size="small" icon={<ReloadOutlined />} aria-label={`Recompute ${b.name}`} onClick={() => recompute.mutate({ analysisId: b.id })}>
                      Recompute
                    </Button>
                    <Popconfirm title={`Delete ${b.name}?`} okText="Delete" onConfirm={() => remove.mutate({ analysisId: b.id })}>
                      <Button size="small" danger aria-label={`Delete ${b.name}`} icon={<DeleteOutlined />} />
                    </Popconfirm>
                  </Space>
                ),
              },
            ]
          : []),
      ]}
    />
  );
}

/** The balance page's body: an editor for the engineer, then every saved balance. */
export function BalanceView({ campaignId, canEdit, channelName, runName }: BalanceViewProps) {
  const analyses = useAnalyses({ campaignId });
  const label = (a: StableValueAnalysis) => `${a.name} (${channelName(a.input.channelId)}, ${runName(a.input.runId)})`;
  return (
    <Space orientation="vertical" size={16} className="full-width">
      <ResultCaution />
      {analyses.isPending ? (
        <Skeleton active paragraph={{ rows: 6 }} />
      ) : analyses.isError ? (
        <ErrorState error={analyses.error} onRetry={() => void analyses.refetch()} />
      ) : (
        <>
          {canEdit ? (
            <Card size="small" className="section-card" title="New balance">
              {analyses.data.some(isStable) ? (
                <BalanceEditor campaignId={campaignId} stable={analyses.data.filter(isStable)} label={label} />
              ) : (
                <EmptyState title="No stable values to balance" description="Save stable values of mass flows (and temperatures) on the runs’ analysis pages first." />
              )}
            </Card>
          ) : null}
          <Card size="small" className="section-card" title="Saved balances">
            <SavedBalances balances={analyses.data.filter(isBalance)} canEdit={canEdit} />
          </Card>
        </>
      )}
    </Space>
  );
}
