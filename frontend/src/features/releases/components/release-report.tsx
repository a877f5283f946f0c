import { Alert, Button, Descriptions, Table, Tag, Typography } from 'antd';
import { PrinterOutlined, WarningOutlined } from '@ant-design/icons';
import type { Analysis, BalanceAnalysis, BalanceResult, ClosureBudgetLine, Release, StabilityPart, StableValueAnalysis } from '@dialsheet/common';
import { formatDateTime } from '@/components/ui/date-text';
import { percentText, sig, valuePlusMinus } from '../utils/report-format';
import { ContentHash } from './content-hash';
import { ReportTrendChart } from './report-trend-chart';
import { ReleaseStatusTag, releaseLabel } from './release-status-tag';
import './release-report.css';

/** One sheet of a released run with the people who typed it (names resolved by the page). */
export interface ReportSheet {
  id: string;
  runId: string;
  name: string;
  reader: string | null;
  checker: string | null;
  pass1FinishedAt: string | null;
  pass2FinishedAt: string | null;
}

export interface ReleaseReportProps {
  release: Release;
  campaignName: string;
  runName: (runId: string) => string;
  channelName: (channelId: string) => string;
  /** The campaign's analyses; those whose runs are all in the release are reported. */
  analyses: Analysis[];
  sheets: ReportSheet[];
  /** Runs whose data is still the released data (locked by this release). */
  runsLockedByThis: ReadonlySet<string>;
  /** May read the readings behind a chart (leads and engineers). */
  canSeeReadings: boolean;
  /** The analyses are the release's own, as signed (not the campaign's live ones). */
  analysesFrozen?: boolean;
}

/** Why a stored result may differ from what was signed. */
function resultNotes(analysis: Analysis, release: Release, runsLockedByThis: ReadonlySet<string>, frozen: boolean) {
  const notes: string[] = [];
  if (frozen) {
    // As signed: later recomputes and corrections do not reach these numbers.
    if (analysis.status === 'failed') notes.push(`failed${analysis.error ? `: ${analysis.error}` : ''}`);
    return notes;
  }
  if (analysis.status === 'stale') notes.push(`stale${analysis.staleReason ? `: ${analysis.staleReason}` : ''}`);
  if (analysis.status === 'failed') notes.push(`failed${analysis.error ? `: ${analysis.error}` : ''}`);
  if (release.signedAt && analysis.computedAt && analysis.computedAt > release.signedAt) notes.push('recomputed after signing');
  if (analysis.runIds.some((id) => !runsLockedByThis.has(id))) notes.push('a run was opened for correction since');
  return notes;
}

function NoteTags({ notes }: { notes: string[] }) {
  return (
    <>
      {notes.map((note) => (
        <Tag key={note} color="gold" className="report-note-tag">
          {note}
        </Tag>
      ))}
    </>
  );
}

function PartsList({ parts }: { parts: StabilityPart[] }) {
  return (
    <ul className="report-parts">
      {parts.map((part) => (
        <li key={part.part}>
          <strong>{part.pass ? 'pass' : 'FAIL'}</strong> {part.part}: {sig(part.measured)} (limit {sig(part.limit)}) {part.unit}
        </li>
      ))}
    </ul>
  );
}

function StableValuesSection({ items, props }: { items: StableValueAnalysis[]; props: ReleaseReportProps }) {
  const { release, runName, channelName, runsLockedByThis } = props;
  return (
    <section className="report-section" aria-labelledby="report-stable">
      <Typography.Title level={4} id="report-stable">
        Stable values
      </Typography.Title>
      {items.length === 0 ? (
        <Typography.Paragraph type="secondary">No stable-value analysis covers the runs of this release.</Typography.Paragraph>
      ) : (
        <Table<StableValueAnalysis>
          className="data-table report-table"
          size="small"
          rowKey="id"
          pagination={false}
          dataSource={items}
          aria-label="Stable values"
          columns={[
            {
              title: 'Analysis',
              key: 'name',
              render: (_, a) => (
                <>
                  {a.name} <NoteTags notes={resultNotes(a, release, runsLockedByThis, props.analysesFrozen === true)} />
                </>
              ),
            },
            { title: 'Run', key: 'run', render: (_, a) => runName(a.input.runId) },
            { title: 'Channel', key: 'channel', render: (_, a) => channelName(a.input.channelId) },
            {
              title: 'Window, t*',
              key: 'window',
              render: (_, a) => (
                <span className="numeric">
                  {sig(a.input.window.from)}–{sig(a.input.window.to)} s, t* {sig(a.input.tStar)} s
                </span>
              ),
            },
            {
              title: 'Value ± U',
              key: 'value',
              align: 'right',
              render: (_, a) =>
                a.result ? (
                  <span className="numeric report-value" data-testid={`stable-value-${a.id}`}>
                    {valuePlusMinus(a.result.stable.value, a.result.stable.expandedUncertainty, a.result.stable.unit)}
                  </span>
                ) : (
                  '–'
                ),
            },
            { title: 'k', key: 'k', align: 'right', render: (_, a) => (a.result ? <span className="numeric">{sig(a.result.stable.budget.coverageFactor, 3)}</span> : '–') },
            {
              title: 'U rel.',
              key: 'rel',
              align: 'right',
              render: (_, a) => <span className="numeric">{percentText(a.result?.stable.budget.relativeExpandedPercent)}</span>,
            },
            { title: 'n', key: 'n', align: 'right', render: (_, a) => <span className="numeric">{a.result?.stable.fit.n ?? '–'}</span> },
            {
              title: 'Stability',
              key: 'stability',
              render: (_, a) => {
                const verdict = a.result?.stability;
                if (!verdict) return <Typography.Text type="secondary">no rule</Typography.Text>;
                return (
                  <>
                    <Tag color={verdict.pass ? 'green' : 'red'}>
                      {verdict.pass ? 'stable' : 'not stable'} · {verdict.rule}
                    </Tag>
                    <PartsList parts={verdict.parts} />
                  </>
                );
              },
            },
          ]}
        />
      )}
    </section>
  );
}

function ClosureBlock({ result }: { result: BalanceResult }) {
  const label = result.kind === 'mass' ? 'Mass' : 'Energy';
  return (
    <div className="report-closure">
      <Typography.Title level={5}>
        {label} balance{' '}
        <Tag color={result.pass ? 'green' : 'red'}>{result.pass ? 'closes within its uncertainty' : 'does not close'}</Tag>
      </Typography.Title>
      <Descriptions size="small" column={{ xs: 1, md: 3 }} bordered className="report-facts">
        <Descriptions.Item label="Σ in">
          <span className="numeric">
            {sig(result.sumIn, 5)} {result.unit}
          </span>
        </Descriptions.Item>
        <Descriptions.Item label="Σ out">
          <span className="numeric">
            {sig(result.sumOut, 5)} {result.unit}
          </span>
        </Descriptions.Item>
        <Descriptions.Item label="R = Σout/Σin">
          <span className="numeric">{sig(result.ratio, 5)}</span>
        </Descriptions.Item>
        <Descriptions.Item label="Closure">
          <span className="numeric" data-testid={`closure-${result.kind}`}>
            {sig(result.closurePercent, 3)} ± {sig(result.expandedUncertaintyPercent, 2)} % (k = {sig(result.coverageFactor, 3)})
          </span>
        </Descriptions.Item>
        <Descriptions.Item label="|R − 1| / U_R">
          <span className="numeric">{sig(result.normalisedError, 3)}</span>
        </Descriptions.Item>
      </Descriptions>
      <Table<ClosureBudgetLine>
        className="data-table report-table"
        size="small"
        rowKey={(line) => `${line.sourceId ?? 'own'}:${line.name}`}
        pagination={false}
        dataSource={result.budget}
        aria-label={`${label} closure budget`}
        columns={[
          { title: 'Source', key: 'name', render: (_, line) => line.name },
          { title: 'Streams', key: 'streams', render: (_, line) => line.streams.join(', ') },
          { title: 'Effect on R', key: 'effect', align: 'right', render: (_, line) => <span className="numeric">{sig(line.effect, 3)}</span> },
          {
            title: '% of variance',
            key: 'share',
            align: 'right',
            render: (_, line) => <span className="numeric">{percentText(line.percentOfVariance, 3)}</span>,
          },
        ]}
      />
    </div>
  );
}

function BalancesSection({ items, props }: { items: BalanceAnalysis[]; props: ReleaseReportProps }) {
  return (
    <section className="report-section" aria-labelledby="report-balances">
      <Typography.Title level={4} id="report-balances">
        Balance closures
      </Typography.Title>
      {items.length === 0 ? (
        <Typography.Paragraph type="secondary">No balance check covers the runs of this release.</Typography.Paragraph>
      ) : (
        items.map((b) => (
          <article key={b.id} className="report-balance">
            <Typography.Title level={5}>
              {b.name} <NoteTags notes={resultNotes(b, props.release, props.runsLockedByThis, props.analysesFrozen === true)} />
            </Typography.Title>
            <Typography.Paragraph type="secondary">Runs: {b.runIds.map(props.runName).join(', ')}</Typography.Paragraph>
            {b.result ? (
              <>
                <ClosureBlock result={b.result.mass} />
                {b.result.energy ? <ClosureBlock result={b.result.energy} /> : null}
              </>
            ) : (
              <Typography.Text type="secondary">No result stored{b.error ? `: ${b.error}` : ''}.</Typography.Text>
            )}
          </article>
        ))
      )}
    </section>
  );
}

/** The release as a document: who signed what, the numbers with their uncertainty, and who typed them. */
export function ReleaseReport(props: ReleaseReportProps) {
  const { release, campaignName, runName, channelName, analyses, sheets, runsLockedByThis, canSeeReadings } = props;
  const inRelease = new Set(release.runIds);
  const covered = analyses.filter((a) => a.runIds.length > 0 && a.runIds.every((id) => inRelease.has(id)));
  const stable = covered.filter((a): a is StableValueAnalysis => a.kind === 'stable-value');
  const balances = covered.filter((a): a is BalanceAnalysis => a.kind === 'balance');
  const releaseSheets = sheets.filter((s) => inRelease.has(s.runId));

  return (
    <div className="release-report">
      <header className="report-header">
        <div className="report-heading">
          <Typography.Title level={2} className="report-title">
            {releaseLabel(release)}: {release.title}
          </Typography.Title>
          <Typography.Text type="secondary">{campaignName}</Typography.Text>
        </div>
        <Button type="primary" icon={<PrinterOutlined />} className="no-print" onClick={() => window.print()}>
          Print
        </Button>
      </header>

      {release.status !== 'published' ? (
        <Alert type="warning" showIcon title="Not a signed release" description="This request has not been signed; the report is a preview only." />
      ) : null}

      <section className="report-section" aria-label="Release">
        <Descriptions size="small" bordered column={{ xs: 1, md: 2 }} className="report-facts">
          <Descriptions.Item label="Release">
            {release.number ?? '–'} <ReleaseStatusTag release={release} />
          </Descriptions.Item>
          <Descriptions.Item label="Signed">
            {release.signedBy && release.signedAt ? `${release.signedBy.displayName}, ${formatDateTime(release.signedAt)}` : 'not signed'}
          </Descriptions.Item>
          <Descriptions.Item label="Content hash (SHA-256)" span={2}>
            <ContentHash hash={release.contentHash} full />
          </Descriptions.Item>
          <Descriptions.Item label="Runs">{release.runIds.map(runName).join(', ')}</Descriptions.Item>
          <Descriptions.Item label="Readings">
            <span className="numeric">{release.readingCount ?? '–'}</span>
          </Descriptions.Item>
          <Descriptions.Item label="Requested">
            {release.requestedBy.displayName}, {formatDateTime(release.requestedAt)}
          </Descriptions.Item>
          <Descriptions.Item label="Note">
            <span className="report-note">{release.note || '–'}</span>
          </Descriptions.Item>
        </Descriptions>
      </section>

      <Alert
        type="warning"
        showIcon
        icon={<WarningOutlined />}
        className="report-caution"
        title="Results are not a safety clearance"
        description="The values, uncertainties and balances in this report support engineering judgement. Where pressurised lines and hot surfaces are involved they do not replace local codes, the instrument makers’ instructions or the practice and sign-off of qualified, licensed people."
      />

      <StableValuesSection items={stable} props={props} />

      {stable.some((a) => a.result) ? (
        <section className="report-section report-charts" aria-labelledby="report-trends">
          <Typography.Title level={4} id="report-trends">
            Trends
          </Typography.Title>
          {stable
            .filter((a) => a.result)
            .map((a) => (
              <ReportTrendChart
                key={a.id}
                analysis={a}
                title={`${a.name} (${channelName(a.input.channelId)}, ${runName(a.input.runId)})`}
                drawReadings={canSeeReadings && runsLockedByThis.has(a.input.runId)}
              />
            ))}
        </section>
      ) : null}

      <BalancesSection items={balances} props={props} />

      <section className="report-section" aria-labelledby="report-people">
        <Typography.Title level={4} id="report-people">
          Who read and who checked
        </Typography.Title>
        <Table<ReportSheet>
          className="data-table report-table"
          size="small"
          rowKey="id"
          pagination={false}
          dataSource={releaseSheets}
          aria-label="Who read and who checked each sheet"
          locale={{ emptyText: 'No sheets' }}
          columns={[
            { title: 'Run', key: 'run', render: (_, s) => runName(s.runId) },
            { title: 'Sheet', key: 'sheet', render: (_, s) => s.name },
            {
              title: 'Read by (pass 1)',
              key: 'reader',
              render: (_, s) => (
                <>
                  {s.reader ?? '–'}
                  {s.pass1FinishedAt ? <span className="muted-note"> · finished {formatDateTime(s.pass1FinishedAt)}</span> : null}
                </>
              ),
            },
            {
              title: 'Checked by (pass 2, blind)',
              key: 'checker',
              render: (_, s) => (
                <>
                  {s.checker ?? '–'}
                  {s.pass2FinishedAt ? <span className="muted-note"> · finished {formatDateTime(s.pass2FinishedAt)}</span> : null}
                </>
              ),
            },
          ]}
        />
      </section>

      <footer className="report-footer">
        <Typography.Text type="secondary">
          {releaseLabel(release)} of {campaignName}
          {release.contentHash ? ` · SHA-256 ${release.contentHash}` : ''} · printed from Dialsheet
        </Typography.Text>
      </footer>
    </div>
  );
}
