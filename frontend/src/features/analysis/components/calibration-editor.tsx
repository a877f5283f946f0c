import { useMemo, useState, type KeyboardEvent } from 'react';
import { Alert, AutoComplete, Button, Card, Checkbox, Flex, Input, InputNumber, Modal, Select, Space, Table, Typography } from 'antd';
import { DeleteOutlined, PlusOutlined } from '@ant-design/icons';
import type { CalibrationPoint, CalibrationStep, Channel, ChannelCalibration, StandardConditionId, StatedUncertainty } from '@dialsheet/common';
import { errorMessage, isApiError } from '@/lib/api-client';
import { useSetCalibration } from '../api/set-calibration';
import { useDeleteCalibration } from '../api/delete-calibration';
import { chainComponents, compileChain } from '../utils/analysis-lib';
import { STANDARD_CONDITION_OPTIONS, STEP_KINDS, chainUnit, newStep, newUncertainty, type StepKind } from '../utils/chain-draft';
import { sig, thrownMessage } from '../utils/number-format';
import { ResultCaution } from './result-caution';

const UNIT_SUGGESTIONS = ['V', 'mV', 'mA', '°C', 'K', 'L/min', 'SLPM', 'g/min', 'kg/s', 'kg/h', 'kPa', 'bar', 'Pa', 'W', 'kW'].map((value) => ({
  value,
}));

const num = (x: number | null | undefined): number | null => (typeof x === 'number' && Number.isFinite(x) ? x : null);

interface NumberFieldProps {
  label: string;
  value: number | null | undefined;
  onChange: (value: number) => void;
  suffix?: string;
  width?: number;
}

function NumberField({ label, value, onChange, suffix, width = 130 }: NumberFieldProps) {
  return (
    <label className="calibration-field">
      <Typography.Text type="secondary">{label}</Typography.Text>
      <InputNumber
        aria-label={label}
        className="numeric"
        style={{ width }}
        controls={false}
        value={num(value)}
        suffix={suffix}
        onChange={(v) => onChange(typeof v === 'number' ? v : NaN)}
      />
    </label>
  );
}

function UnitField({ label, value, onChange }: { label: string; value: string; onChange: (value: string) => void }) {
  return (
    <label className="calibration-field">
      <Typography.Text type="secondary">{label}</Typography.Text>
      <AutoComplete aria-label={label} style={{ width: 110 }} options={UNIT_SUGGESTIONS} value={value} onChange={(v) => onChange(String(v ?? ''))} />
    </label>
  );
}

function PointsEditor({
  step,
  points,
  min,
  max,
  prefix,
  onChange,
}: {
  step: CalibrationStep;
  points: CalibrationPoint[];
  min: number;
  max?: number;
  prefix: string;
  onChange: (points: CalibrationPoint[]) => void;
}) {
  const set = (i: number, key: keyof CalibrationPoint, v: number) => onChange(points.map((p, j) => (j === i ? { ...p, [key]: v } : p)));
  return (
    <Space orientation="vertical" size={4}>
      {points.map((p, i) => (
        <Flex key={i} gap={8} align="flex-end">
          <NumberField label={`${prefix} point ${i + 1} raw`} value={p.raw} suffix={step.inputUnit} onChange={(v) => set(i, 'raw', v)} />
          <NumberField label={`${prefix} point ${i + 1} value`} value={p.eng} suffix={step.outputUnit} onChange={(v) => set(i, 'eng', v)} />
          {points.length > min ? (
            <Button aria-label={`Remove ${prefix} point ${i + 1}`} icon={<DeleteOutlined />} onClick={() => onChange(points.filter((_, j) => j !== i))} />
          ) : null}
        </Flex>
      ))}
      {max === undefined ? (
        <Button size="small" icon={<PlusOutlined />} onClick={() => onChange([...points, { raw: NaN, eng: NaN }])}>
          Add point
        </Button>
      ) : null}
    </Space>
  );
}

function UncertaintyEditor({ prefix, unit, value, onChange }: { prefix: string; unit: string; value: StatedUncertainty | null | undefined; onChange: (u: StatedUncertainty | null) => void }) {
  if (!value) {
    return (
      <Button size="small" onClick={() => onChange(newUncertainty())}>
        State this step’s uncertainty
      </Button>
    );
  }
  return (
    <Flex gap={8} wrap align="flex-end">
      <NumberField
        label={`${prefix} uncertainty`}
        value={value.value}
        suffix={value.basis === 'relative' ? '%' : unit}
        onChange={(v) => onChange({ ...value, value: v })}
      />
      <label className="calibration-field">
        <Typography.Text type="secondary">Stated as</Typography.Text>
        <Select
          aria-label={`${prefix} uncertainty basis`}
          style={{ width: 150 }}
          value={value.basis}
          options={[
            { value: 'relative', label: '% of the value' },
            { value: 'absolute', label: `in ${unit || 'the output unit'}` },
          ]}
          onChange={(basis) => onChange({ ...value, basis })}
        />
      </label>
      <label className="calibration-field">
        <Typography.Text type="secondary">Distribution</Typography.Text>
        <Select
          aria-label={`${prefix} distribution`}
          style={{ width: 190 }}
          value={value.distribution ?? 'rectangular'}
          options={[
            { value: 'rectangular', label: '± bound (rectangular, ÷√3)' },
            { value: 'normal', label: 'Expanded U with k (normal)' },
          ]}
          onChange={(distribution) => onChange({ ...value, distribution, k: distribution === 'normal' ? (value.k ?? 2) : null })}
        />
      </label>
      {value.distribution === 'normal' ? <NumberField label={`${prefix} k`} value={value.k} width={70} onChange={(k) => onChange({ ...value, k })} /> : null}
      <label className="calibration-field">
        <Typography.Text type="secondary">Shared source (optional)</Typography.Text>
        <Input
          aria-label={`${prefix} shared source`}
          style={{ width: 160 }}
          placeholder="e.g. flow-meter-1"
          value={value.sourceId ?? ''}
          onChange={(e) => onChange({ ...value, sourceId: e.target.value.trim() || null })}
        />
      </label>
      <Button aria-label={`Remove ${prefix} uncertainty`} icon={<DeleteOutlined />} onClick={() => onChange(null)} />
    </Flex>
  );
}

function StepEditor({
  step,
  index,
  count,
  onChange,
  onRemove,
  onMove,
}: {
  step: CalibrationStep;
  index: number;
  count: number;
  onChange: (step: CalibrationStep) => void;
  onRemove: () => void;
  onMove: (direction: -1 | 1) => void;
}) {
  const prefix = `Step ${index + 1}`;
  const conditions = typeof step === 'object' && step.kind === 'standard-to-mass' ? step.standardConditions : null;
  return (
    <Card
      size="small"
      className="calibration-step"
      title={
        <Flex gap={8} align="center" wrap>
          <span>{prefix}</span>
          <Select<StepKind>
            aria-label={`${prefix} kind`}
            style={{ width: 230 }}
            value={step.kind}
            options={STEP_KINDS}
            onChange={(kind) => onChange(newStep(kind, step.inputUnit, step.outputUnit, step))}
          />
        </Flex>
      }
      extra={
        <Space size={4}>
          <Button size="small" aria-label={`Move ${prefix} up`} disabled={index === 0} onClick={() => onMove(-1)}>
            ↑
          </Button>
          <Button size="small" aria-label={`Move ${prefix} down`} disabled={index === count - 1} onClick={() => onMove(1)}>
            ↓
          </Button>
          <Button size="small" danger aria-label={`Remove ${prefix}`} icon={<DeleteOutlined />} onClick={onRemove} />
        </Space>
      }
    >
      <Space orientation="vertical" size={8} className="full-width">
        <Flex gap={8} wrap align="flex-end">
          <UnitField label={`${prefix} input unit`} value={step.inputUnit} onChange={(inputUnit) => onChange({ ...step, inputUnit })} />
          <UnitField label={`${prefix} output unit`} value={step.outputUnit} onChange={(outputUnit) => onChange({ ...step, outputUnit })} />
          <label className="calibration-field">
            <Typography.Text type="secondary">Label (optional)</Typography.Text>
            <Input
              aria-label={`${prefix} label`}
              style={{ width: 220 }}
              value={step.label ?? ''}
              placeholder="e.g. meter span × bypass"
              onChange={(e) => onChange({ ...step, label: e.target.value || null })}
            />
          </label>
        </Flex>
        {step.kind === 'linear' ? (
          <Flex gap={8} wrap>
            <NumberField label={`${prefix} gain a`} value={step.a} suffix={`${step.outputUnit}/${step.inputUnit}`} width={170} onChange={(a) => onChange({ ...step, a })} />
            <NumberField label={`${prefix} offset b`} value={step.b} suffix={step.outputUnit} onChange={(b) => onChange({ ...step, b })} />
          </Flex>
        ) : null}
        {step.kind === 'two-point' ? (
          <PointsEditor
            step={step}
            prefix={prefix}
            points={step.points}
            min={2}
            max={2}
            onChange={(points) => onChange({ ...step, points: points as [CalibrationPoint, CalibrationPoint] })}
          />
        ) : null}
        {step.kind === 'table' ? (
          <>
            <PointsEditor step={step} prefix={prefix} points={step.points} min={2} onChange={(points) => onChange({ ...step, points })} />
            <Checkbox checked={step.allowExtrapolation === true} onChange={(e) => onChange({ ...step, allowExtrapolation: e.target.checked })}>
              Extend the end segments beyond the table
            </Checkbox>
          </>
        ) : null}
        {step.kind === 'standard-to-mass' && conditions !== null ? (
          <Flex gap={8} wrap align="flex-end">
            <label className="calibration-field">
              <Typography.Text type="secondary">Meter’s standard conditions</Typography.Text>
              <Select
                aria-label={`${prefix} standard conditions`}
                style={{ width: 230 }}
                value={typeof conditions === 'string' ? conditions : 'custom'}
                options={STANDARD_CONDITION_OPTIONS}
                onChange={(v) =>
                  onChange({
                    ...step,
                    standardConditions: v === 'custom' ? { temperatureC: 20, pressureKPa: 101.325 } : (v as StandardConditionId),
                  })
                }
              />
            </label>
            {typeof conditions === 'object' ? (
              <>
                <NumberField
                  label={`${prefix} standard temperature`}
                  value={conditions.temperatureC}
                  suffix="°C"
                  onChange={(temperatureC) => onChange({ ...step, standardConditions: { ...conditions, temperatureC } })}
                />
                <NumberField
                  label={`${prefix} standard pressure`}
                  value={conditions.pressureKPa}
                  suffix="kPa"
                  onChange={(pressureKPa) => onChange({ ...step, standardConditions: { ...conditions, pressureKPa } })}
                />
              </>
            ) : null}
          </Flex>
        ) : null}
        <UncertaintyEditor prefix={prefix} unit={step.outputUnit} value={step.uncertainty} onChange={(uncertainty) => onChange({ ...step, uncertainty })} />
      </Space>
    </Card>
  );
}

interface CalibrationEditorProps {
  campaignId: string;
  channel: Channel;
  calibration: ChannelCalibration | undefined;
  open: boolean;
  onClose: () => void;
}

interface StaleBody {
  current?: ChannelCalibration | null;
}

/**
 * A channel's chain, step by step, checked live by the same compiler the server uses (an error
 * names the step and what to change) with a preview of one raw value through it.
 */
export function CalibrationEditor({ campaignId, channel, calibration, open, onClose }: CalibrationEditorProps) {
  const [steps, setSteps] = useState<CalibrationStep[]>(() => calibration?.chain.steps ?? []);
  const [baseVersion, setBaseVersion] = useState<number | undefined>(calibration?.version);
  const [reason, setReason] = useState('');
  const [previewRaw, setPreviewRaw] = useState<number | null>(channel.fullScale ?? channel.rangeMax);
  const save = useSetCalibration({ mutationConfig: { onSuccess: () => onClose() } });
  const remove = useDeleteCalibration({ mutationConfig: { onSuccess: () => onClose() } });

  const check = useMemo(() => {
    if (steps.length === 0) return { error: null, compiled: null };
    try {
      return { error: null, compiled: compileChain({ steps }, channel.rawUnit) };
    } catch (error) {
      return { error: thrownMessage(error), compiled: null };
    }
  }, [steps, channel.rawUnit]);

  const preview = useMemo(() => {
    if (!check.compiled || previewRaw === null) return null;
    try {
      return { evaluation: chainComponents(check.compiled, previewRaw), error: null };
    } catch (error) {
      return { evaluation: null, error: thrownMessage(error) };
    }
  }, [check.compiled, previewRaw]);

  const conflict = isApiError(save.error, 409) || isApiError(remove.error, 409);
  const canSave = steps.length > 0 && check.error === null && (preview === null || preview.error === null) && !save.isPending;

  const submit = () => {
    if (!canSave) return;
    save.mutate({ campaignId, channelId: channel.id, data: { chain: { steps }, baseVersion, reason: reason.trim() || undefined } });
  };

  const reload = () => {
    const error = save.error ?? remove.error;
    const current = isApiError(error) ? (error.body as StaleBody | null)?.current : undefined;
    setSteps(current?.chain.steps ?? []);
    setBaseVersion(current?.version);
    save.reset();
    remove.reset();
  };

  // Enter in any field saves (antd's own inputs swallow nothing here); Esc is the modal's.
  const onKeyDown = (event: KeyboardEvent<HTMLDivElement>) => {
    const target = event.target as HTMLElement;
    if (event.key !== 'Enter' || event.nativeEvent.isComposing || target.tagName !== 'INPUT') return;
    if (target.closest('.ant-select') && target.getAttribute('aria-expanded') === 'true') return;
    event.preventDefault();
    submit();
  };

  const update = (i: number, step: CalibrationStep) => setSteps((all) => all.map((s, j) => (j === i ? step : s)));
  const move = (i: number, d: -1 | 1) =>
    setSteps((all) => {
      const next = [...all];
      [next[i], next[i + d]] = [next[i + d], next[i]];
      return next;
    });
  const add = () => setSteps((all) => [...all, newStep('linear', chainUnit(all, channel.rawUnit))]);

  return (
    <Modal
      open={open}
      title={`Calibration of ${channel.symbol}`}
      width={880}
      onCancel={onClose}
      destroyOnHidden
      footer={
        <Flex justify="space-between" gap={8}>
          <span>
            {calibration ? (
              <Button danger loading={remove.isPending} onClick={() => remove.mutate({ campaignId, channelId: channel.id, baseVersion: baseVersion ?? calibration.version })}>
                Remove calibration
              </Button>
            ) : null}
          </span>
          <Space>
            <Button onClick={onClose}>Cancel</Button>
            <Button type="primary" disabled={!canSave} loading={save.isPending} onClick={submit}>
              Save calibration
            </Button>
          </Space>
        </Flex>
      }
    >
      <div onKeyDown={onKeyDown} className="calibration-editor">
        <Typography.Paragraph type="secondary">
          {channel.name}: the display shows {channel.rawUnit}. Each step turns its input unit into its output unit; the last output is
          the engineering unit. State each step’s own uncertainty on its output (a bare ± is taken as rectangular).
        </Typography.Paragraph>
        {conflict ? (
          <Alert
            type="warning"
            showIcon
            role="alert"
            className="form-alert"
            title="Someone changed this calibration since you opened it"
            description="Reload their version, then make your change again."
            action={
              <Button size="small" onClick={reload}>
                Reload
              </Button>
            }
          />
        ) : save.isError || remove.isError ? (
          <Alert type="error" showIcon role="alert" className="form-alert" title={errorMessage(save.error ?? remove.error)} />
        ) : null}
        <Space orientation="vertical" size={8} className="full-width">
          {steps.length === 0 ? (
            <Typography.Text type="secondary">No steps: readings stay in {channel.rawUnit}.</Typography.Text>
          ) : (
            steps.map((step, i) => (
              <StepEditor
                key={i}
                step={step}
                index={i}
                count={steps.length}
                onChange={(s) => update(i, s)}
                onRemove={() => setSteps((all) => all.filter((_, j) => j !== i))}
                onMove={(d) => move(i, d)}
              />
            ))
          )}
          <Button icon={<PlusOutlined />} onClick={add}>
            Add step
          </Button>
          {check.error ? <Alert type="error" showIcon role="alert" title="The chain does not work yet" description={check.error} /> : null}
          {check.compiled ? (
            <Card size="small" title="Preview">
              <Flex gap={8} align="flex-end" wrap>
                <NumberField label="Raw value" value={previewRaw} suffix={channel.rawUnit} onChange={(v) => setPreviewRaw(Number.isFinite(v) ? v : null)} />
                {preview?.evaluation ? (
                  <Typography.Text strong className="numeric" data-testid="calibration-preview">
                    {sig(previewRaw)} {channel.rawUnit} → {sig(preview.evaluation.value, 5)} {preview.evaluation.unit}
                  </Typography.Text>
                ) : null}
              </Flex>
              {preview?.error ? <Alert type="error" showIcon className="card-footnote" title={preview.error} /> : null}
              {preview?.evaluation && preview.evaluation.intermediate.length > 1 ? (
                <Table
                  size="small"
                  className="card-footnote"
                  pagination={false}
                  rowKey="label"
                  dataSource={preview.evaluation.intermediate}
                  columns={[
                    { title: 'After', dataIndex: 'label' },
                    { title: 'Value', key: 'v', align: 'right', render: (_, r) => `${sig(r.value, 5)} ${r.unit}` },
                  ]}
                />
              ) : null}
            </Card>
          ) : null}
          <label className="calibration-field">
            <Typography.Text type="secondary">Reason for the change (optional, kept in the audit trail)</Typography.Text>
            <Input aria-label="Reason" value={reason} onChange={(e) => setReason(e.target.value)} />
          </label>
          <ResultCaution />
        </Space>
      </div>
    </Modal>
  );
}
