import { useMemo, useState, type KeyboardEvent } from 'react';
import { Alert, Button, Card, Flex, Input, InputNumber, Modal, Select, Skeleton, Space, Typography } from 'antd';
import { SaveOutlined } from '@ant-design/icons';
import type { Analysis, CalibrationChain, Channel, ChannelSeries, StableValueInput, StoredStabilityRule, TimeWindow } from '@dialsheet/common';
import { EmptyState } from '@/components/feedback/empty-state';
import { ErrorState } from '@/components/feedback/error-state';
import { errorMessage } from '@/lib/api-client';
import { useCalibrations } from '../api/get-calibrations';
import { useChannelSeries } from '../api/get-channel-series';
import { useCreateAnalysis } from '../api/create-analysis';
import { useDerivedChannels } from '../api/get-derived-channels';
import { useStabilityRules } from '../api/get-stability-rules';
import { computePreview, previewOptions } from '../utils/stable-preview';
import { plusMinus, sig } from '../utils/number-format';
import { AnalysisStatusTag } from './analysis-status-tag';
import { StableValueResult } from './stable-value-result';
import { ResidualChart, TrendChart } from './trend-chart';
import './analysis.css';

interface ChannelOption {
  id: string;
  symbol: string;
  name: string;
  derived: boolean;
}

function SaveAnalysisModal({
  campaignId,
  input,
  defaultName,
  onClose,
  onSaved,
}: {
  campaignId: string;
  input: StableValueInput;
  defaultName: string;
  onClose: () => void;
  onSaved: (analysis: Analysis) => void;
}) {
  const [name, setName] = useState(defaultName);
  const [note, setNote] = useState('');
  const create = useCreateAnalysis({ mutationConfig: { onSuccess: onSaved } });
  const submit = () => {
    if (name.trim() === '' || create.isPending) return;
    create.mutate({ campaignId, data: { kind: 'stable-value', name: name.trim(), note: note.trim() || null, input } });
  };
  const onKeyDown = (event: KeyboardEvent<HTMLDivElement>) => {
    if (event.key === 'Enter' && (event.target as HTMLElement).tagName === 'INPUT') {
      event.preventDefault();
      submit();
    }
  };
  return (
    <Modal open title="Save as analysis" okText="Save analysis" onOk={submit} okButtonProps={{ disabled: name.trim() === '' }} confirmLoading={create.isPending} onCancel={onClose} destroyOnHidden>
      <div onKeyDown={onKeyDown}>
        {create.isError ? <Alert type="error" showIcon role="alert" className="form-alert" title={errorMessage(create.error)} /> : null}
        <Space orientation="vertical" className="full-width">
          <label className="calibration-field">
            <Typography.Text type="secondary">Name (unique in the campaign)</Typography.Text>
            <Input aria-label="Analysis name" autoFocus value={name} onChange={(e) => setName(e.target.value)} />
          </label>
          <label className="calibration-field">
            <Typography.Text type="secondary">Note (optional)</Typography.Text>
            <Input aria-label="Note" value={note} onChange={(e) => setNote(e.target.value)} />
          </label>
          <Typography.Text type="secondary">
            The server computes the result again from the stored readings; its numbers are the ones kept.
          </Typography.Text>
        </Space>
      </div>
    </Modal>
  );
}

function ruleAppliesTo(rule: StoredStabilityRule, channelId: string) {
  return rule.channelId === null || rule.channelId === channelId;
}

function initialWindow(series: ChannelSeries): TimeWindow {
  return series.t.length > 0 ? { from: series.t[0], to: series.t[series.t.length - 1] } : { from: 0, to: 0 };
}

interface ChannelAnalysisProps {
  campaignId: string;
  series: ChannelSeries;
  channel: Channel | undefined;
  calibrationChain: CalibrationChain | null;
  rules: StoredStabilityRule[];
  canEdit: boolean;
}

/** One channel of one run: the chart with its draggable window, the live preview and the save. */
function ChannelAnalysis({ campaignId, series, channel, calibrationChain, rules, canEdit }: ChannelAnalysisProps) {
  const [window, setWindow] = useState<TimeWindow>(() => initialWindow(series));
  const [tStar, setTStar] = useState<number>(() => initialWindow(series).to);
  const [allowExtrapolation, setAllowExtrapolation] = useState(false);
  const applicable = rules.filter((r) => ruleAppliesTo(r, series.channelId));
  const [ruleId, setRuleId] = useState<string | null>(applicable[0]?.id ?? null);
  const [saving, setSaving] = useState(false);
  const [saved, setSaved] = useState<Analysis | null>(null);
  const rule = applicable.find((r) => r.id === ruleId) ?? null;
  const extent = useMemo((): [number, number] => [series.t[0] ?? 0, series.t[series.t.length - 1] ?? 0], [series]);

  const preview = useMemo(
    () => computePreview({ series, channel, calibration: calibrationChain, window, tStar, allowExtrapolation, rule }),
    [series, channel, calibrationChain, window, tStar, allowExtrapolation, rule],
  );

  const input: StableValueInput = {
    runId: series.runId,
    channelId: series.channelId,
    window,
    tStar,
    ruleId: rule?.id ?? null,
    ...previewOptions({ series, allowExtrapolation }),
  };

  const setFrom = (v: number | null) => typeof v === 'number' && setWindow((w) => ({ ...w, from: v }));
  const setTo = (v: number | null) => typeof v === 'number' && setWindow((w) => ({ ...w, to: v }));

  return (
    <Space orientation="vertical" size={12} className="full-width">
      {series.t.length < 3 ? (
        <Alert
          type="info"
          showIcon
          role="alert"
          title={`${series.symbol} has ${series.t.length} usable reading${series.t.length === 1 ? '' : 's'} in this run; a trend fit needs at least 3.`}
          description="Enter more rows of the run’s sheet, or resolve flagged readings."
        />
      ) : null}
      {series.uncheckedCount > 0 ? (
        <Alert
          type="warning"
          showIcon
          title={`${series.uncheckedCount} of ${series.t.length} readings are unchecked first-pass values (drawn as hollow triangles).`}
        />
      ) : null}
      {series.skipped.length > 0 ? (
        <Typography.Text type="secondary">
          {series.skipped.length} timestamp{series.skipped.length === 1 ? '' : 's'} left out (no usable number), e.g. t = {sig(series.skipped[0].t, 6)} s:{' '}
          {series.skipped[0].reason}.
        </Typography.Text>
      ) : null}
      <Card size="small" className="section-card">
        <Flex gap={12} wrap align="flex-end" className="analysis-controls">
          <label className="calibration-field">
            <Typography.Text type="secondary">Window from</Typography.Text>
            <InputNumber aria-label="Window from" className="numeric" controls={false} suffix="s" value={window.from} onChange={setFrom} />
          </label>
          <label className="calibration-field">
            <Typography.Text type="secondary">Window to</Typography.Text>
            <InputNumber aria-label="Window to" className="numeric" controls={false} suffix="s" value={window.to} onChange={setTo} />
          </label>
          <label className="calibration-field">
            <Typography.Text type="secondary">t*</Typography.Text>
            <InputNumber aria-label="t*" className="numeric" controls={false} suffix="s" value={tStar} onChange={(v) => typeof v === 'number' && setTStar(v)} />
          </label>
          <Button onClick={() => setTStar(window.to)}>t* = end of window</Button>
          <label className="calibration-field">
            <Typography.Text type="secondary">Stability rule</Typography.Text>
            <Select
              aria-label="Stability rule"
              style={{ width: 220 }}
              value={ruleId}
              onChange={setRuleId}
              options={[{ value: null, label: 'No rule' }, ...applicable.map((r) => ({ value: r.id, label: r.name }))]}
            />
          </label>
          {canEdit ? (
            <Button type="primary" icon={<SaveOutlined />} disabled={!preview.stable} onClick={() => setSaving(true)}>
              Save as analysis
            </Button>
          ) : null}
        </Flex>
        <Typography.Paragraph type="secondary" className="card-footnote">
          Drag across the chart to set the window (drag its edges to adjust it); double-click the chart to set t*. The numbers below are a
          live preview computed in your browser.
        </Typography.Paragraph>
        <TrendChart
          series={series}
          stable={preview.stable}
          window={window}
          tStar={tStar}
          onWindowChange={(w) => setWindow(w)}
          onTStarChange={setTStar}
        />
        <ResidualChart stable={preview.stable} windowT={preview.windowT} unit={series.unit} extent={extent} />
      </Card>
      {preview.needsExtrapolation ? (
        <Alert
          type="warning"
          showIcon
          role="alert"
          title="t* lies outside the window’s readings"
          description="The value would assume the trend carries on unchanged beyond the readings. Confirm to extrapolate, or move t* inside the window."
          action={
            <Button size="small" onClick={() => setAllowExtrapolation(true)}>
              Confirm extrapolation
            </Button>
          }
        />
      ) : preview.error ? (
        <Alert type="error" showIcon role="alert" title="No stable value for this window" description={preview.error} />
      ) : null}
      {preview.stabilityError ? <Alert type="warning" showIcon title={preview.stabilityError} /> : null}
      {saved ? (
        <Alert
          type={saved.status === 'failed' ? 'error' : 'success'}
          showIcon
          data-testid="saved-result"
          title={
            <>
              Saved “{saved.name}” <AnalysisStatusTag analysis={saved} />
            </>
          }
          description={
            saved.kind === 'stable-value' && saved.result
              ? `Server result: ${plusMinus(saved.result.stable.value, saved.result.stable.expandedUncertainty, saved.result.stable.unit, 5)} at t* = ${sig(saved.input.tStar, 6)} s`
              : (saved.error ?? undefined)
          }
        />
      ) : null}
      {preview.stable ? (
        <Card size="small" className="section-card" title="Preview">
          <StableValueResult stable={preview.stable} stability={preview.stability} />
        </Card>
      ) : null}
      {saving ? (
        <SaveAnalysisModal
          campaignId={campaignId}
          input={input}
          defaultName={`${series.symbol} at ${sig(tStar, 6)} s`}
          onClose={() => setSaving(false)}
          onSaved={(a) => {
            setSaved(a);
            setSaving(false);
          }}
        />
      ) : null}
    </Space>
  );
}

interface RunAnalysisViewProps {
  campaignId: string;
  runId: string;
  channels: Channel[];
  canEdit: boolean;
  canReadSeries: boolean;
}

/** Pick a channel of the run, then fit it; reads every analysis input the campaign holds. */
export function RunAnalysisView({ campaignId, runId, channels, canEdit, canReadSeries }: RunAnalysisViewProps) {
  const derived = useDerivedChannels({ campaignId });
  const calibrations = useCalibrations({ campaignId });
  const rules = useStabilityRules({ campaignId });
  const options: ChannelOption[] = useMemo(
    () => [
      ...channels.map((c) => ({ id: c.id, symbol: c.symbol, name: c.name, derived: false })),
      ...(derived.data ?? []).map((d) => ({ id: d.id, symbol: d.symbol, name: d.name, derived: true })),
    ],
    [channels, derived.data],
  );
  const [picked, setPicked] = useState<string | null>(null);
  const channelId = picked ?? options[0]?.id ?? '';
  const series = useChannelSeries({ runId, channelId, queryConfig: { enabled: canReadSeries && channelId !== '' } });

  if (!canReadSeries) {
    return (
      <Alert
        type="info"
        showIcon
        title="The readings behind the charts are for the campaign’s lead and engineer"
        description="The stable values saved for this run are listed below."
      />
    );
  }
  if (options.length === 0) {
    return <EmptyState title="No channels to analyse" description="Add the campaign’s channels and enter a sheet for this run first." />;
  }
  const setupLoading = calibrations.isPending || rules.isPending;
  const setupError = calibrations.error ?? rules.error;
  const calibration = calibrations.data?.find((c) => c.channelId === channelId) ?? null;

  return (
    <Space orientation="vertical" size={12} className="full-width">
      <Flex gap={8} align="center" wrap>
        <Typography.Text strong>Channel</Typography.Text>
        <Select
          aria-label="Channel"
          style={{ minWidth: 320 }}
          value={channelId}
          onChange={setPicked}
          options={options.map((o) => ({ value: o.id, label: `${o.symbol} · ${o.name}${o.derived ? ' (derived)' : ''}` }))}
        />
      </Flex>
      {series.isPending || setupLoading ? (
        <Skeleton active paragraph={{ rows: 8 }} />
      ) : series.isError || setupError ? (
        <ErrorState error={series.error ?? setupError} onRetry={() => void (series.isError ? series.refetch() : calibrations.refetch())} />
      ) : (
        <ChannelAnalysis
          key={`${series.data.channelId}:${series.data.t.length}`}
          campaignId={campaignId}
          series={series.data}
          channel={channels.find((c) => c.id === series.data.channelId)}
          calibrationChain={calibration?.chain ?? null}
          rules={rules.data ?? []}
          canEdit={canEdit}
        />
      )}
    </Space>
  );
}
