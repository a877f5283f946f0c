import { useState } from 'react';
import { Link } from 'react-router-dom';
import { App, Button, Card, Flex, Skeleton, Space, Table, Tag, Tooltip, Typography } from 'antd';
import { CheckOutlined, CloseOutlined, FileTextOutlined, LockOutlined, SafetyCertificateOutlined, SendOutlined, UnlockOutlined } from '@ant-design/icons';
import type { CampaignRole, DashboardRun, Release } from '@dialsheet/common';
import { paths } from '@/config/paths';
import { formatDateTime } from '@/components/ui/date-text';
import { EmptyState } from '@/components/feedback/empty-state';
import { ErrorState } from '@/components/feedback/error-state';
import { useReleases } from '../api/get-releases';
import { useDashboard } from '../api/get-dashboard';
import { mayOversee, mayRequest, maySign } from '../utils/release-access';
import { ContentHash } from './content-hash';
import { DeclineReleaseModal } from './decline-release-modal';
import { DraftExportButton } from './draft-export-button';
import { ExportButtons } from './export-buttons';
import { OpenCorrectionModal } from './open-correction-modal';
import { ReleaseRequestModal } from './release-request-modal';
import { ReleaseStatusTag, releaseLabel } from './release-status-tag';
import { SignReleaseModal } from './sign-release-modal';
import './releases.css';

interface ReleasesViewProps {
  campaignId: string;
  roles: readonly CampaignRole[];
  /** A run's name for its id (composed by the page from the runs feature). */
  runName: (runId: string) => string;
}

/** Every release of the campaign, requesting and signing them, corrections and exports. */
export function ReleasesView({ campaignId, roles, runName }: ReleasesViewProps) {
  const { message } = App.useApp();
  const releases = useReleases({ campaignId });
  const oversee = mayOversee(roles);
  const lead = maySign(roles);
  // Run readiness comes from the dashboard, which only those who prepare releases read.
  const dashboard = useDashboard({ campaignId, queryConfig: { enabled: oversee } });
  const [requesting, setRequesting] = useState(false);
  const [signing, setSigning] = useState<Release | null>(null);
  const [declining, setDeclining] = useState<Release | null>(null);
  const [correcting, setCorrecting] = useState<DashboardRun | null>(null);

  if (releases.isPending) return <Skeleton active paragraph={{ rows: 6 }} />;
  if (releases.isError) return <ErrorState error={releases.error} onRetry={() => void releases.refetch()} />;

  const list = releases.data.slice().sort((a, b) => (b.number ?? Infinity) - (a.number ?? Infinity) || b.requestedAt.localeCompare(a.requestedAt));
  const byId = new Map(list.map((r) => [r.id, r]));
  const runs = dashboard.data?.runs ?? [];
  const lockedRuns = runs.filter((run) => run.lockedBy !== null);

  const toolbar = (
    <Flex gap={8} wrap className="releases-toolbar">
      {mayRequest(roles) ? (
        <Button
          type="primary"
          icon={lead ? <SafetyCertificateOutlined /> : <SendOutlined />}
          onClick={() => setRequesting(true)}
          disabled={!dashboard.data}
          aria-label={lead ? 'Release' : 'Request release'}
        >
          {lead ? 'Release' : 'Request release'}
        </Button>
      ) : null}
      {oversee ? <DraftExportButton campaignId={campaignId} runs={runs.map((r) => ({ id: r.id, name: r.name }))} /> : null}
    </Flex>
  );

  return (
    <Space orientation="vertical" size={16} className="full-width">
      {toolbar}
      <Card size="small" className="section-card" title="Releases">
        {list.length === 0 ? (
          <EmptyState
            title="No releases yet"
            description={
              oversee
                ? 'When every sheet of a run has both passes finished and no open mismatch, the run can be released.'
                : 'A lead signs releases here; you will see them once there are some.'
            }
          />
        ) : (
          <Table<Release>
            className="data-table releases-table"
            size="small"
            rowKey="id"
            pagination={false}
            dataSource={list}
            aria-label="Releases"
            expandable={{
              rowExpandable: (r) => r.status === 'published',
              expandedRowRender: (r) => (
                <Flex gap={12} align="center" wrap>
                  <Typography.Text type="secondary">Export</Typography.Text>
                  <ExportButtons release={r} />
                </Flex>
              ),
              // Controlled, not `defaultExpandAllRows`: a release signed while the page is open
              // must show its export buttons too (the default only applies when the table mounts).
              expandedRowKeys: list.filter((r) => r.status === 'published').map((r) => r.id),
              showExpandColumn: false,
            }}
            columns={[
              {
                title: 'Release',
                key: 'release',
                render: (_, r) => (
                  <div className="release-cell">
                    <Typography.Text strong>{releaseLabel(r)}</Typography.Text> <ReleaseStatusTag release={r} />
                    <div>{r.title}</div>
                    {r.note ? <Typography.Text type="secondary" className="release-note">{r.note}</Typography.Text> : null}
                    {r.status === 'declined' && r.declineReason ? (
                      <Typography.Text type="danger" className="release-note">
                        Declined: {r.declineReason}
                      </Typography.Text>
                    ) : null}
                  </div>
                ),
              },
              { title: 'Runs', key: 'runs', render: (_, r) => r.runIds.map(runName).join(', ') },
              { title: 'Content hash', key: 'hash', render: (_, r) => <ContentHash hash={r.contentHash} /> },
              {
                title: 'Signed',
                key: 'signed',
                render: (_, r) =>
                  r.signedBy && r.signedAt ? (
                    <span>
                      {r.signedBy.displayName}
                      <br />
                      <Typography.Text type="secondary" className="numeric">
                        {formatDateTime(r.signedAt)}
                      </Typography.Text>
                    </span>
                  ) : (
                    <Typography.Text type="secondary">
                      requested by {r.requestedBy.displayName}, {formatDateTime(r.requestedAt)}
                    </Typography.Text>
                  ),
              },
              {
                title: 'Supersedes',
                key: 'supersedes',
                render: (_, r) => {
                  const older = r.supersedesId ? byId.get(r.supersedesId) : undefined;
                  const newer = r.supersededById ? byId.get(r.supersededById) : undefined;
                  return (
                    <Space orientation="vertical" size={0}>
                      {r.supersedesId ? <span>replaces {older ? releaseLabel(older).toLowerCase() : 'an earlier release'}</span> : null}
                      {r.supersededById ? (
                        <Typography.Text type="secondary">replaced by {newer ? releaseLabel(newer).toLowerCase() : 'a later release'}</Typography.Text>
                      ) : null}
                      {!r.supersedesId && !r.supersededById ? <Typography.Text type="secondary">–</Typography.Text> : null}
                    </Space>
                  );
                },
              },
              {
                title: '',
                key: 'actions',
                align: 'right',
                render: (_, r) => (
                  <Space size={4} wrap>
                    {r.status === 'published' ? (
                      <Link to={paths.releaseReport.getHref(campaignId, r.id)}>
                        <Button size="small" icon={<FileTextOutlined />} aria-label={`Report of ${releaseLabel(r).toLowerCase()}`}>
                          Report
                        </Button>
                      </Link>
                    ) : null}
                    {lead && r.status === 'requested' ? (
                      <>
                        <Button size="small" type="primary" icon={<CheckOutlined />} onClick={() => setSigning(r)} aria-label={`Sign ${r.title}`}>
                          Sign
                        </Button>
                        <Button size="small" danger icon={<CloseOutlined />} onClick={() => setDeclining(r)} aria-label={`Decline ${r.title}`}>
                          Decline
                        </Button>
                      </>
                    ) : null}
                  </Space>
                ),
              },
            ]}
          />
        )}
      </Card>

      {oversee && lockedRuns.length > 0 ? (
        <Card size="small" className="section-card" title="Locked runs">
          <Typography.Paragraph type="secondary">
            Data inside a release is locked: edits are refused with a message naming the release.
          </Typography.Paragraph>
          <Table<DashboardRun>
            className="data-table"
            size="small"
            rowKey="id"
            pagination={false}
            dataSource={lockedRuns}
            aria-label="Locked runs"
            columns={[
              { title: 'Run', key: 'name', render: (_, run) => <Link to={paths.run.getHref(campaignId, run.id)}>{run.name}</Link> },
              {
                title: 'Locked by',
                key: 'lock',
                render: (_, run) => (
                  <Tag icon={<LockOutlined />} color="blue">
                    release {run.lockedBy?.number}
                  </Tag>
                ),
              },
              {
                title: '',
                key: 'actions',
                align: 'right',
                render: (_, run) =>
                  lead ? (
                    <Button size="small" icon={<UnlockOutlined />} onClick={() => setCorrecting(run)} aria-label={`Open correction of ${run.name}`}>
                      Open correction
                    </Button>
                  ) : (
                    <Tooltip title="Only a lead can open a correction">
                      <Typography.Text type="secondary">locked</Typography.Text>
                    </Tooltip>
                  ),
              },
            ]}
          />
        </Card>
      ) : null}

      {mayRequest(roles) ? (
        <ReleaseRequestModal
          open={requesting}
          campaignId={campaignId}
          runs={runs}
          signNow={lead}
          onClose={() => setRequesting(false)}
          onDone={(release) => {
            setRequesting(false);
            void message.success(
              release.status === 'published' ? `Release ${release.number} is signed and published` : 'Request sent; a lead will review it',
            );
          }}
        />
      ) : null}
      {lead ? (
        <>
          <SignReleaseModal
            release={signing}
            runName={runName}
            onClose={() => setSigning(null)}
            onDone={(release) => {
              setSigning(null);
              void message.success(`Release ${release.number} is signed and published`);
            }}
          />
          <DeclineReleaseModal
            release={declining}
            onClose={() => setDeclining(null)}
            onDone={() => {
              setDeclining(null);
              void message.success('Request declined');
            }}
          />
          <OpenCorrectionModal
            campaignId={campaignId}
            run={correcting}
            onClose={() => setCorrecting(null)}
            onDone={() => {
              setCorrecting(null);
              void message.success('Correction opened: the run can be edited again');
            }}
          />
        </>
      ) : null}
    </Space>
  );
}
