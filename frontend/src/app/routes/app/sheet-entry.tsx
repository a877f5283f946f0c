import { useEffect, useMemo, type ReactNode } from 'react';
import { Link, useParams } from 'react-router-dom';
import { Breadcrumb, Button, Result, Skeleton } from 'antd';
import { useQueryClient } from '@tanstack/react-query';
import type { ReadingPass } from '@dialsheet/common';
import { paths } from '@/config/paths';
import { PageHeader } from '@/components/ui/page-header';
import { ErrorState } from '@/components/feedback/error-state';
import { useDocumentTitle } from '@/hooks/use-document-title';
import { isApiError } from '@/lib/api-client';
import { useUser } from '@/lib/auth';
import { useCampaign } from '@/features/campaigns/api/get-campaign';
import { useChannels } from '@/features/channels/api/get-channels';
import { useDisplayRegions } from '@/features/channels/api/get-display-regions';
import { useRecording } from '@/features/recordings/api/get-recording';
import { useRecordingFrames } from '@/features/recordings/api/get-recording-frames';
import { useMediaUrls } from '@/features/recordings/api/get-media-urls';
import { useRun } from '@/features/runs/api/get-run';
import { useReadings } from '@/features/sheets/api/get-readings';
import { useSheet } from '@/features/sheets/api/get-sheet';
import { useSheetRows } from '@/features/sheets/api/get-sheet-rows';
import { EntryScreen } from '@/features/sheets/components/entry/entry-screen';
import { isPassFinished, ownPass } from '@/features/sheets/utils/sheet-access';
import { sheetChannels } from '@/features/sheets/utils/sheet-format';

/** Links that expire within this long count as the likely cause of a playback error. */
const NEAR_EXPIRY_MS = 60_000;

function BackToSheet({ campaignId, sheetId }: { campaignId: string; sheetId: string }) {
  return (
    <Link to={paths.sheet.getHref(campaignId, sheetId)}>
      <Button type="primary">Back to the sheet</Button>
    </Link>
  );
}

/**
 * Entry of one pass: the sheet's reader types pass 1, its checker pass 2 (blind: only the
 * checker's own entries are ever requested). Everyone else, and a finished or released pass, gets
 * a plain message and the way back to the sheet.
 */
export function SheetEntryRoute() {
  const { campaignId = '', sheetId = '' } = useParams();
  const queryClient = useQueryClient();
  const { data: campaign } = useCampaign({ campaignId });
  const user = useUser();
  const sheet = useSheet({ sheetId });
  const current = sheet.data;
  const pass: ReadingPass | null = current && user.data ? ownPass(current, { userId: user.data.id, roles: campaign?.myRoles ?? [] }) : null;
  const open = !!current && pass !== null && !isPassFinished(current, pass) && current.lock === null;
  const runId = current?.runId ?? '';

  const rows = useSheetRows({ sheetId, queryConfig: { enabled: open } });
  const run = useRun({ runId, queryConfig: { enabled: open && runId !== '' } });
  const recording = useRecording({ runId, queryConfig: { enabled: open && runId !== '' } });
  const recordingId = recording.data?.status === 'ready' ? recording.data.id : '';
  const frames = useRecordingFrames({ recordingId, queryConfig: { enabled: open && recordingId !== '' } });
  const media = useMediaUrls({ recordingId, queryConfig: { enabled: open && recordingId !== '' } });
  const channels = useChannels({ campaignId, queryConfig: { enabled: open } });
  const regions = useDisplayRegions({ runId, queryConfig: { enabled: open && runId !== '' } });
  // Only the person's own pass: the checker never asks for pass 1, the reader never for pass 2.
  const readings = useReadings({ sheetId, pass: pass ?? 1, queryConfig: { enabled: open && pass !== null, staleTime: 0 } });
  useDocumentTitle(current ? `${current.name} · Pass ${pass ?? ''} entry` : 'Sheet entry');

  // Leaving the screen: the sheet's progress and table reflect what was typed.
  useEffect(
    () => () => {
      void queryClient.invalidateQueries({ queryKey: ['sheets', 'detail', sheetId] });
      void queryClient.invalidateQueries({ queryKey: ['sheets', 'readings', sheetId] });
    },
    [queryClient, sheetId],
  );

  const ordered = useMemo(() => (current && channels.data ? sheetChannels(current.channelIds, channels.data) : []), [channels.data, current]);

  if (!campaign) return null;
  if (sheet.isPending || user.isPending) return <Skeleton active paragraph={{ rows: 10 }} />;
  if (sheet.isError || !current || current.campaignId !== campaign.id) {
    const missing = sheet.isError ? isApiError(sheet.error, 404) : true;
    return (
      <ErrorState
        error={sheet.error}
        title={missing ? 'Sheet not found' : undefined}
        description={missing ? 'It does not exist in this campaign, or it was deleted.' : undefined}
        onRetry={() => void sheet.refetch()}
        extra={
          <Link to={paths.campaignRuns.getHref(campaign.id)}>
            <Button>All runs</Button>
          </Link>
        }
      />
    );
  }

  const back = <BackToSheet campaignId={campaign.id} sheetId={current.id} />;
  const notice = (title: string, subTitle: ReactNode) => <Result status="info" title={title} subTitle={subTitle} extra={back} />;
  const breadcrumb = (
    <Breadcrumb
      className="page-breadcrumb"
      items={[
        { title: <Link to={paths.campaignRuns.getHref(campaign.id)}>Runs</Link> },
        { title: <Link to={paths.sheet.getHref(campaign.id, current.id)}>{current.name}</Link> },
        { title: pass ? `Pass ${pass} entry` : 'Entry' },
      ]}
    />
  );

  if (pass === null) {
    return (
      <>
        {breadcrumb}
        {notice(
          'This sheet is not yours to enter',
          'Only the sheet’s assigned reader (pass 1) and checker (pass 2) type entries here. Ask the lead to assign you if you should.',
        )}
      </>
    );
  }
  if (current.lock) {
    return (
      <>
        {breadcrumb}
        {notice('This sheet is released', `Its data is part of release ${current.lock.releaseNumber} and no longer changes; a change needs a new release version.`)}
      </>
    );
  }
  if (isPassFinished(current, pass)) {
    return (
      <>
        {breadcrumb}
        {notice(
          `Pass ${pass} is finished`,
          pass === 2
            ? 'Your entries are final. Mismatches against pass 1 are resolved on the sheet page, against the frame.'
            : 'Your entries are final; later corrections are recorded on the sheet page as resolutions with a reason.',
        )}
      </>
    );
  }

  const header = <PageHeader title={current.name} subtitle={run.data ? `${run.data.name} · pass ${pass} entry` : `Pass ${pass} entry`} />;
  // Entries are read fresh on arrival (a cached list from the sheet page may be behind), and only then
  // does the screen start: it works from that list and its own acknowledgements afterwards.
  const loading =
    [rows, run, recording, channels, regions].some((q) => q.isPending) ||
    !readings.isFetchedAfterMount ||
    (recordingId !== '' && (frames.isPending || media.isPending));
  const failed = rows.error ?? run.error ?? recording.error ?? channels.error ?? regions.error ?? readings.error ?? frames.error ?? media.error;
  if (failed) {
    return (
      <>
        {breadcrumb}
        <ErrorState
          error={failed}
          onRetry={() => {
            for (const query of [rows, run, recording, channels, regions, readings, frames, media]) if (query.isError) void query.refetch();
          }}
          extra={back}
        />
      </>
    );
  }
  if (loading) {
    return (
      <>
        {breadcrumb}
        {header}
        <Skeleton active paragraph={{ rows: 10 }} />
      </>
    );
  }
  if (!recording.data || recording.data.status !== 'ready' || !media.data?.proxyUrl || !frames.data) {
    return (
      <>
        {breadcrumb}
        {notice('The video is not ready for reading', 'Entry starts once the run’s recording is uploaded and its playback copy is made.')}
      </>
    );
  }
  if (!run.data?.sync) {
    return (
      <>
        {breadcrumb}
        {notice('The run has no time sync', 'Sheet rows are test times; an engineer marks the sync frame on the run page first.')}
      </>
    );
  }
  if (ordered.length === 0 || !rows.data || rows.data.length === 0) {
    return (
      <>
        {breadcrumb}
        {notice('Nothing to enter', 'The sheet has no rows or no channels. Ask the lead or an engineer to complete its plan.')}
      </>
    );
  }

  const rec = recording.data;
  const probe = rec.probe;
  const aspectRatio = rec.proxy ? rec.proxy.width / rec.proxy.height : probe ? probe.displayWidth / probe.displayHeight : undefined;
  const expiresAt = media.data.expiresAt;

  return (
    <>
      {breadcrumb}
      {header}
      <EntryScreen
        sheet={current}
        pass={pass}
        userId={user.data?.id ?? ''}
        rows={rows.data}
        channels={ordered}
        regions={regions.data ?? []}
        decimalComma={campaign.decimalComma}
        readings={readings.data ?? []}
        video={{
          src: media.data.proxyUrl,
          poster: media.data.posterUrl,
          frameTimes: frames.data.times,
          fallbackFrameDuration: probe && probe.nominalFps > 0 ? 1 / probe.nominalFps : undefined,
          aspectRatio,
          sync: run.data.sync,
        }}
        onMediaError={() => {
          // An expired link is the one failure new links fix; anything else would only loop.
          if (Date.parse(expiresAt) - Date.now() < NEAR_EXPIRY_MS) void media.refetch();
        }}
      />
    </>
  );
}
