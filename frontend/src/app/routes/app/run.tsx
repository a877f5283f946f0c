import { useCallback, useRef, useState } from 'react';
import { Link, useNavigate, useParams } from 'react-router-dom';
import { Breadcrumb, Button, Col, Row, Skeleton, Space } from 'antd';
import { EditOutlined, LineChartOutlined } from '@ant-design/icons';
import { toTestTime, type SyncMarks } from '@dialsheet/common';
import { paths } from '@/config/paths';
import { PageHeader } from '@/components/ui/page-header';
import { ErrorState } from '@/components/feedback/error-state';
import type { FrameInfo, FramePlayerHandle } from '@/components/video/frame-player';
import { useDocumentTitle } from '@/hooks/use-document-title';
import { isApiError } from '@/lib/api-client';
import { useCampaign } from '@/features/campaigns/api/get-campaign';
import { useRun } from '@/features/runs/api/get-run';
import { RunDetails } from '@/features/runs/components/run-details';
import { RunFormModal } from '@/features/runs/components/run-form-modal';
import { DeleteRunButton } from '@/features/runs/components/delete-run-button';
import { SyncPanel, type SyncFrame } from '@/features/runs/components/sync-panel';
import { useRecording } from '@/features/recordings/api/get-recording';
import { RecordingPanel } from '@/features/recordings/components/recording-panel';
import { RecordingFacts } from '@/features/recordings/components/recording-facts';
import { useChannels } from '@/features/channels/api/get-channels';
import { useRegionEditor } from '@/features/channels/hooks/use-region-editor';
import { RegionOverlay } from '@/features/channels/components/region-overlay';
import { DisplayRegionsCard } from '@/features/channels/components/display-regions-card';
import { useMembers } from '@/features/members/api/get-members';
import { RunSheetsCard } from '@/features/sheets/components/run-sheets-card';
import { mayPlanSheets } from '@/features/sheets/utils/sheet-access';

function safeTestTime(sync: SyncMarks, videoTime: number): number | null {
  try {
    return toTestTime(sync, videoTime);
  } catch {
    return null;
  }
}

export function RunRoute() {
  const { campaignId = '', runId = '' } = useParams();
  const navigate = useNavigate();
  const { data: campaign } = useCampaign({ campaignId });
  const run = useRun({ runId });
  const recording = useRecording({ runId });
  const [editing, setEditing] = useState(false);
  const playerRef = useRef<FramePlayerHandle>(null);
  const [frame, setFrame] = useState<SyncFrame | null>(null);
  const channels = useChannels({ campaignId });
  const regionEditor = useRegionEditor({ runId, channels: channels.data ?? [] });
  const members = useMembers({ campaignId });
  useDocumentTitle(run.data ? `${run.data.name} · Runs` : 'Run');

  const onFrameChange = useCallback((next: FrameInfo) => {
    // The sync panel needs the frame, not every repaint: keep the same object while it stays.
    setFrame((previous) => (previous && previous.index === next.index && previous.pts === next.pts ? previous : { index: next.index, pts: next.pts }));
  }, []);
  const showTime = useCallback((t: number) => playerRef.current?.showTime(t), []);

  if (!campaign) return null;
  if (run.isPending) return <Skeleton active paragraph={{ rows: 10 }} />;
  if (run.isError || run.data.campaignId !== campaign.id) {
    const missing = run.isError ? isApiError(run.error, 404) : true;
    return (
      <ErrorState
        error={run.error}
        title={missing ? 'Run not found' : undefined}
        description={missing ? 'It does not exist in this campaign, or it was deleted.' : undefined}
        onRetry={() => void run.refetch()}
        extra={
          <Link to={paths.campaignRuns.getHref(campaign.id)}>
            <Button>All runs</Button>
          </Link>
        }
      />
    );
  }

  const current = run.data;
  const canEdit = campaign.myRoles.includes('lead') || campaign.myRoles.includes('engineer');
  const ready = recording.data?.status === 'ready';
  const subtitle = [current.runDate, current.configuration].filter(Boolean).join(' · ');
  const proxy = recording.data?.proxy;
  const probe = recording.data?.probe;
  const frameSize = proxy
    ? { width: proxy.width, height: proxy.height }
    : probe
      ? { width: probe.displayWidth, height: probe.displayHeight }
      : null;
  // Sheet times are test times: a sheet needs the sync marks, and the recording's length (in test
  // time) bounds its end.
  const sheetBlocker = !current.sync
    ? 'Set the time sync first (in the panel above): sheet times are test times.'
    : !ready
      ? 'Wait until the recording is processed: its length limits where a sheet can end.'
      : null;
  const maxEndTime = current.sync && probe ? safeTestTime(current.sync, probe.durationSec) : null;
  const regionOverlay =
    channels.data && channels.data.length > 0 ? (
      <RegionOverlay
        channels={channels.data}
        regions={regionEditor.regions}
        frameSize={frameSize}
        activeChannelId={canEdit ? regionEditor.activeChannelId : null}
        onDraw={canEdit ? regionEditor.setRegion : undefined}
      />
    ) : null;

  return (
    <>
      <Breadcrumb
        className="page-breadcrumb"
        items={[{ title: <Link to={paths.campaignRuns.getHref(campaign.id)}>Runs</Link> }, { title: current.name }]}
      />
      <PageHeader
        title={current.name}
        subtitle={subtitle || undefined}
        actions={
          <Space size={8}>
            <Link to={paths.runAnalysis.getHref(campaign.id, current.id)}>
              <Button icon={<LineChartOutlined />}>Analysis</Button>
            </Link>
            {canEdit ? (
              <>
                <Button icon={<EditOutlined />} onClick={() => setEditing(true)}>
                  Edit
                </Button>
                <DeleteRunButton run={current} onDeleted={() => navigate(paths.campaignRuns.getHref(campaign.id), { replace: true })} />
              </>
            ) : null}
          </Space>
        }
      />
      <Row gutter={[16, 16]}>
        <Col xs={24} xl={16}>
          <RecordingPanel
            runId={current.id}
            campaignId={campaign.id}
            canEdit={canEdit}
            sync={current.sync}
            playerRef={playerRef}
            onFrameChange={onFrameChange}
            overlay={regionOverlay}
          />
        </Col>
        <Col xs={24} xl={8}>
          <Space orientation="vertical" size={16} className="full-width">
            <SyncPanel run={current} canEdit={canEdit} currentFrame={ready ? frame : null} onShowTime={ready ? showTime : undefined} />
            {canEdit && channels.data ? <DisplayRegionsCard editor={regionEditor} channels={channels.data} videoReady={ready} /> : null}
            {recording.data ? <RecordingFacts recording={recording.data} /> : null}
            <RunDetails run={current} />
          </Space>
        </Col>
        <Col xs={24}>
          <RunSheetsCard
            runId={current.id}
            channels={channels.data ?? []}
            members={members.data}
            canPlan={mayPlanSheets(campaign.myRoles) && campaign.status !== 'archived'}
            planBlocker={sheetBlocker}
            maxEndTime={maxEndTime}
          />
        </Col>
      </Row>
      {canEdit ? (
        <RunFormModal
          campaignId={campaign.id}
          run={current}
          open={editing}
          onClose={() => setEditing(false)}
          onSaved={() => setEditing(false)}
        />
      ) : null}
    </>
  );
}
