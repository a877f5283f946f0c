import { Button, Popconfirm, Skeleton, Space, Table, Tag, Typography } from 'antd';
import { DeleteOutlined, ReloadOutlined } from '@ant-design/icons';
import type { Analysis, StableValueAnalysis } from '@dialsheet/common';
import { EmptyState } from '@/components/feedback/empty-state';
import { ErrorState } from '@/components/feedback/error-state';
import { useAnalyses } from '../api/get-analyses';
import { useRecomputeAnalysis } from '../api/recompute-analysis';
import { useDeleteAnalysis } from '../api/delete-analysis';
import { plusMinus, sig } from '../utils/number-format';
import { AnalysisStatusTag } from './analysis-status-tag';

interface StableValuesTableProps {
  campaignId: string;
  /** Only this run's; left out, the whole campaign's. */
  runId?: string;
  canEdit: boolean;
  /** Names for ids: channels and derived channels by id, runs by id. */
  channelName: (id: string) => string;
  runName?: (id: string) => string;
}

const isStable = (a: Analysis): a is StableValueAnalysis => a.kind === 'stable-value';

/** Saved stable values with value ± U, verdict and status; the engineer recomputes a stale one. */
export function StableValuesTable({ campaignId, runId, canEdit, channelName, runName }: StableValuesTableProps) {
  const analyses = useAnalyses({ campaignId, filter: { runId, kind: 'stable-value' } });
  const recompute = useRecomputeAnalysis();
  const remove = useDeleteAnalysis();

  if (analyses.isPending) return <Skeleton active paragraph={{ rows: 3 }} />;
  if (analyses.isError) return <ErrorState error={analyses.error} onRetry={() => void analyses.refetch()} />;
  const rows = analyses.data.filter(isStable);
  if (rows.length === 0) {
    return (
      <EmptyState
        title="No stable values saved yet"
        description={canEdit ? 'Pick a channel on a run’s analysis page, set the window and t*, and save it as an analysis.' : 'An engineer saves them from a run’s analysis page.'}
      />
    );
  }
  return (
    <Table<StableValueAnalysis>
      size="small"
      className="data-table"
      rowKey="id"
      pagination={false}
      dataSource={rows}
      data-testid="stable-values-table"
      columns={[
        { title: 'Name', key: 'name', render: (_, a) => <Typography.Text strong>{a.name}</Typography.Text> },
        ...(runName ? [{ title: 'Run', key: 'run', render: (_: unknown, a: StableValueAnalysis) => runName(a.input.runId) }] : []),
        { title: 'Channel', key: 'channel', render: (_, a) => channelName(a.input.channelId) },
        { title: 't*', key: 'tstar', align: 'right', render: (_, a) => `${sig(a.input.tStar, 6)} s` },
        {
          title: 'Value ± U (k = 2)',
          key: 'value',
          align: 'right',
          render: (_, a) => (a.result ? <span className="numeric">{plusMinus(a.result.stable.value, a.result.stable.expandedUncertainty, a.result.stable.unit, 5)}</span> : '–'),
        },
        {
          title: 'Verdict',
          key: 'verdict',
          render: (_, a) =>
            a.result?.stability ? (
              <Tag color={a.result.stability.pass ? 'green' : 'red'}>
                {a.result.stability.pass ? 'steady' : 'not steady'} ({a.result.stability.rule})
              </Tag>
            ) : (
              <Typography.Text type="secondary">no rule</Typography.Text>
            ),
        },
        { title: 'Status', key: 'status', render: (_, a) => <AnalysisStatusTag analysis={a} /> },
        ...(canEdit
          ? [
              {
                title: '',
                key: 'actions',
                render: (_: unknown, a: StableValueAnalysis) => (
                  <Space size={4}>
                    <Button
                      size="small"
                      icon={<ReloadOutlined />}
                      aria-label={`Recompute ${a.name}`}
                      loading={recompute.isPending && recompute.variables?.analysisId === a.id}
                      onClick={() => recompute.mutate({ analysisId: a.id })}
                    >
                      Recompute
                    </Button>
                    <Popconfirm title={`Delete ${a.name}?`} okText="Delete" onConfirm={() => remove.mutate({ analysisId: a.id })}>
                      <Button size="small" danger aria-label={`Delete ${a.name}`} icon={<DeleteOutlined />} />
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
