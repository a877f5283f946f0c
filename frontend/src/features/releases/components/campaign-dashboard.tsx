import { useMemo } from 'react';
import { Link } from 'react-router-dom';
import { Alert, Card, Col, Flex, Progress, Row, Skeleton, Statistic, Table, Tag, Tooltip, Typography } from 'antd';
import { CheckCircleOutlined, LockOutlined } from '@ant-design/icons';
import type { DashboardReaderRate, DashboardRun, DashboardSheet } from '@dialsheet/common';
import { paths } from '@/config/paths';
import { EmptyState } from '@/components/feedback/empty-state';
import { ErrorState } from '@/components/feedback/error-state';
import { isApiError } from '@/lib/api-client';
import { useDashboard } from '../api/get-dashboard';
import { notReadyReason, passPercent } from '../utils/run-readiness';
import { ratePercent } from '../utils/report-format';
import './releases.css';

function SheetPass({ sheet, pass }: { sheet: DashboardSheet; pass: 1 | 2 }) {
  const entered = pass === 1 ? sheet.pass1Entered : sheet.pass2Entered;
  const finished = pass === 1 ? sheet.pass1Finished : sheet.pass2Finished;
  const label = `${sheet.name}, pass ${pass}: ${entered} of ${sheet.cells} cells entered${finished ? ', finished' : ''}`;
  return (
    <div className="dash-pass" role="group" aria-label={label}>
      <span className="dash-pass-label">Pass {pass}</span>
      <Progress
        percent={passPercent(entered, sheet.cells)}
        size="small"
        status={finished ? 'success' : 'normal'}
        className="dash-pass-bar"
        format={(p) => `${p} %`}
      />
    </div>
  );
}

function RunSheets({ campaignId, run }: { campaignId: string; run: DashboardRun }) {
  if (run.sheets.length === 0) return <Typography.Text type="secondary">No sheet planned</Typography.Text>;
  return (
    <div className="dash-sheets">
      {run.sheets.map((sheet) => (
        <div key={sheet.id} className="dash-sheet">
          <Flex justify="space-between" gap={8}>
            <Link to={paths.sheet.getHref(campaignId, sheet.id)}>{sheet.name}</Link>
            <span className="numeric muted-note">
              {sheet.rows} rows · {sheet.cells} cells
            </span>
          </Flex>
          <SheetPass sheet={sheet} pass={1} />
          <SheetPass sheet={sheet} pass={2} />
          {sheet.openMismatches > 0 ? (
            <Tag color="orange" className="dash-mismatch-tag">
              {sheet.openMismatches} open mismatch{sheet.openMismatches === 1 ? '' : 'es'}
            </Tag>
          ) : null}
        </div>
      ))}
    </div>
  );
}

interface RateRow {
  userId: string;
  displayName: string;
  byChannel: Map<string, DashboardReaderRate>;
}

/** One row per reader, one column per channel: how often their entry differed from the other pass. */
function ReaderRates({ rates }: { rates: DashboardReaderRate[] }) {
  const { rows, channels } = useMemo(() => {
    const channelMap = new Map<string, string>();
    const people = new Map<string, RateRow>();
    for (const r of rates) {
      channelMap.set(r.channelId, r.channelSymbol);
      const row = people.get(r.userId) ?? { userId: r.userId, displayName: r.displayName, byChannel: new Map() };
      row.byChannel.set(r.channelId, r);
      people.set(r.userId, row);
    }
    return {
      rows: [...people.values()].sort((a, b) => a.displayName.localeCompare(b.displayName)),
      channels: [...channelMap.entries()].map(([id, symbol]) => ({ id, symbol })),
    };
  }, [rates]);

  if (rows.length === 0) {
    return <EmptyState title="No rates yet" description="Rates appear once both passes of a sheet have cells in common." />;
  }
  return (
    <Table<RateRow>
      className="data-table reader-rates"
      size="small"
      rowKey="userId"
      pagination={false}
      dataSource={rows}
      aria-label="Mismatch rate per reader and channel"
      scroll={{ x: 'max-content' }}
      columns={[
        { title: 'Reader', key: 'reader', fixed: 'left', render: (_, row) => row.displayName },
        ...channels.map((channel) => ({
          title: channel.symbol,
          key: channel.id,
          align: 'right' as const,
          render: (_: unknown, row: RateRow) => {
            const rate = row.byChannel.get(channel.id);
            if (!rate) return <Typography.Text type="secondary">–</Typography.Text>;
            return (
              <Tooltip title={`${rate.mismatches} of ${rate.compared} compared cells differed`}>
                <span className="numeric" aria-label={`${row.displayName}, ${channel.symbol}: ${ratePercent(rate.rate)} (${rate.mismatches} of ${rate.compared})`}>
                  {ratePercent(rate.rate)} <span className="muted-note">({rate.mismatches}/{rate.compared})</span>
                </span>
              </Tooltip>
            );
          },
        })),
      ]}
    />
  );
}

/** The lead's view of a campaign: how far each run is, what is open, what can be released. */
export function CampaignDashboard({ campaignId }: { campaignId: string }) {
  const dashboard = useDashboard({ campaignId });
  if (dashboard.isPending) return <Skeleton active paragraph={{ rows: 10 }} />;
  if (dashboard.isError) {
    return (
      <ErrorState
        error={dashboard.error}
        description={isApiError(dashboard.error, 403) ? 'The dashboard is for the campaign’s leads and engineers.' : undefined}
        onRetry={() => void dashboard.refetch()}
      />
    );
  }
  const { runs, analyses, readerRates, releases } = dashboard.data;
  if (runs.length === 0) {
    return (
      <EmptyState
        title="Nothing to show yet"
        description="Add runs and plan their sheets; progress, mismatches and what is ready to release appear here."
        action={<Link to={paths.campaignRuns.getHref(campaignId)}>Go to runs</Link>}
      />
    );
  }

  const openMismatches = runs.reduce((sum, run) => sum + run.sheets.reduce((s, sheet) => s + sheet.openMismatches, 0), 0);
  const ready = runs.filter((run) => notReadyReason(run) === null);
  const published = releases.filter((r) => r.status === 'published').length;
  const waiting = releases.filter((r) => r.status === 'requested').length;

  return (
    <Flex vertical gap={16}>
      <Row gutter={[16, 16]}>
        <Col xs={12} md={6}>
          <Card size="small" className="section-card">
            <Statistic title="Runs ready to release" value={ready.length} suffix={`/ ${runs.length}`} />
          </Card>
        </Col>
        <Col xs={12} md={6}>
          <Card size="small" className="section-card">
            <Statistic title="Open mismatches" value={openMismatches} />
          </Card>
        </Col>
        <Col xs={12} md={6}>
          <Card size="small" className="section-card" aria-label="Analyses">
            <Statistic title="Analyses" value={analyses.total} />
            <Flex gap={4} wrap>
              <Tag color={analyses.stale > 0 ? 'gold' : 'default'}>{analyses.stale} stale</Tag>
              <Tag color={analyses.failed > 0 ? 'red' : 'default'}>{analyses.failed} failed</Tag>
            </Flex>
          </Card>
        </Col>
        <Col xs={12} md={6}>
          <Card size="small" className="section-card">
            <Statistic title="Releases published" value={published} />
            {waiting > 0 ? <Tag color="gold">{waiting} waiting for sign-off</Tag> : null}
          </Card>
        </Col>
      </Row>

      {ready.length > 0 ? (
        <Alert
          type="success"
          showIcon
          icon={<CheckCircleOutlined />}
          title="Ready to release"
          description={
            <>
              {ready.map((run) => run.name).join(', ')}. <Link to={paths.campaignReleases.getHref(campaignId)}>Go to releases</Link>
            </>
          }
        />
      ) : null}
      {analyses.stale > 0 || analyses.failed > 0 ? (
        <Alert
          type="warning"
          showIcon
          title="Some analyses need attention"
          description={`${analyses.stale} stale (their data changed since they were computed), ${analyses.failed} failed. Recompute them before a release so its report shows current results.`}
        />
      ) : null}

      <Card size="small" className="section-card" title="Runs and sheets">
        <Table<DashboardRun>
          className="data-table dashboard-runs"
          size="small"
          rowKey="id"
          pagination={false}
          dataSource={runs}
          aria-label="Runs and sheets"
          columns={[
            {
              title: 'Run',
              key: 'run',
              width: 240,
              render: (_, run) => (
                <Flex vertical gap={4}>
                  <Link to={paths.run.getHref(campaignId, run.id)}>{run.name}</Link>
                  <Flex gap={4} wrap>
                    {!run.hasRecording ? <Tag>no video</Tag> : !run.synced ? <Tag color="gold">not synced</Tag> : null}
                    {run.lockedBy ? (
                      <Tag icon={<LockOutlined />} color="blue">
                        release {run.lockedBy.number}
                      </Tag>
                    ) : null}
                    {notReadyReason(run) === null ? <Tag color="green">ready to release</Tag> : null}
                  </Flex>
                </Flex>
              ),
            },
            { title: 'Sheets and progress per pass', key: 'sheets', render: (_, run) => <RunSheets campaignId={campaignId} run={run} /> },
            {
              title: 'Open mismatches',
              key: 'open',
              align: 'right',
              width: 140,
              render: (_, run) => <span className="numeric">{run.sheets.reduce((s, sheet) => s + sheet.openMismatches, 0)}</span>,
            },
          ]}
        />
      </Card>

      <Card size="small" className="section-card" title="Mismatch rate per reader and channel">
        <Typography.Paragraph type="secondary">
          Cells where a person’s entry differed from the other pass, over the cells both passes hold. A high rate on one channel
          often points at a hard-to-read display rather than the person.
        </Typography.Paragraph>
        <ReaderRates rates={readerRates} />
      </Card>
    </Flex>
  );
}
