import { useCallback, useMemo } from 'react';
import { Link, useParams, useSearchParams } from 'react-router-dom';
import { Breadcrumb, Button, Skeleton, Tabs } from 'antd';
import { toVideoTime, type Recording, type SyncMarks } from '@dialsheet/common';
import { paths } from '@/config/paths';
import { PageHeader } from '@/components/ui/page-header';
import { ErrorState } from '@/components/feedback/error-state';
import { usePageShortcuts, type PageShortcut } from '@/components/shortcuts/page-shortcuts';
import type { FramePlayerHandle } from '@/components/video/frame-player';
import { useDocumentTitle } from '@/hooks/use-document-title';
import { isApiError } from '@/lib/api-client';
import { useUser } from '@/lib/auth';
import { useCampaign } from '@/features/campaigns/api/get-campaign';
import { useChannels } from '@/features/channels/api/get-channels';
import { useMembers } from '@/features/members/api/get-members';
import { useRun } from '@/features/runs/api/get-run';
import { RecordingPlayer } from '@/features/recordings/components/recording-player';
import { useSheet } from '@/features/sheets/api/get-sheet';
import { EnterPassButton } from '@/features/sheets/components/enter-pass-button';
import type { FrameTarget } from '@/features/sheets/components/frame-target';
import { MismatchPanel } from '@/features/sheets/components/mismatch-panel';
import { MismatchRates } from '@/features/sheets/components/mismatch-rates';
import { SheetSummary } from '@/features/sheets/components/sheet-summary';
import { SheetTable } from '@/features/sheets/components/sheet-table';
import { mayReadMismatches, mayResolve, type SheetViewer } from '@/features/sheets/utils/sheet-access';
import { memberName, sheetChannels } from '@/features/sheets/utils/sheet-format';

type SheetTab = 'table' | 'mismatches' | 'rates';

const TAB_GROUP = 'Sheet';

/**
 * The run's video at one moment, for the mismatch drawer: the frame a pass was read from, or the
 * row's own time. The player is asked to show it once it exists and whenever the moment changes;
 * stepping from there (← →) stays with the player.
 */
function SheetFrame({ recording, sync, target }: { recording: Recording; sync: SyncMarks; target: FrameTarget }) {
  const videoTime = target.videoTime ?? toVideoTime(sync, target.testTime);
  const showOnAttach = useCallback(
    (handle: FramePlayerHandle | null) => {
      handle?.showTime(videoTime);
    },
    [videoTime],
  );
  return <RecordingPlayer recording={recording} sync={sync} playerRef={showOnAttach} />;
}

export function SheetRoute() {
  const { campaignId = '', sheetId = '' } = useParams();
  const [search, setSearch] = useSearchParams();
  const { data: campaign } = useCampaign({ campaignId });
  const user = useUser();
  const sheet = useSheet({ sheetId });
  const runId = sheet.data?.runId ?? '';
  const run = useRun({ runId, queryConfig: { enabled: runId !== '' } });
  const channels = useChannels({ campaignId });
  const members = useMembers({ campaignId });
  useDocumentTitle(sheet.data ? `${sheet.data.name} · Sheets` : 'Sheet');
  // The route's loader (app/route-data.ts) has already asked for the sheet, channels, members
  // and, when the page opens on the table, the table's grid.

  const current = sheet.data;
  const viewer = useMemo<SheetViewer | null>(
    () => (user.data && campaign ? { userId: user.data.id, roles: campaign.myRoles } : null),
    [campaign, user.data],
  );
  const seesMismatches = current && viewer ? mayReadMismatches(current, viewer) : false;
  const wanted = search.get('tab');
  const tab: SheetTab = (wanted === 'mismatches' || wanted === 'rates') && seesMismatches ? wanted : 'table';
  const setTab = useCallback(
    (next: SheetTab) =>
      setSearch(
        (previous) => {
          const params = new URLSearchParams(previous);
          if (next === 'table') params.delete('tab');
          else params.set('tab', next);
          return params;
        },
        { replace: true },
      ),
    [setSearch],
  );

  const shortcuts = useMemo<PageShortcut[]>(
    () => [
      { keys: ['t'], group: TAB_GROUP, description: 'Show the sheet table', run: () => setTab('table') },
      ...(seesMismatches
        ? [
            { keys: ['m'], group: TAB_GROUP, description: 'Show the mismatches', run: () => setTab('mismatches') },
            { keys: ['r'], group: TAB_GROUP, description: 'Show the mismatch rates', run: () => setTab('rates') },
          ]
        : []),
    ],
    [seesMismatches, setTab],
  );
  usePageShortcuts(shortcuts);

  const recording = run.data?.recording;
  const sync = run.data?.sync;
  const renderFrame = useMemo(
    () =>
      recording && recording.status === 'ready' && sync
        ? (target: FrameTarget) => <SheetFrame recording={recording} sync={sync} target={target} />
        : undefined,
    [recording, sync],
  );

  if (!campaign || !viewer) return null;
  if (sheet.isPending || channels.isPending || members.isPending) return <Skeleton active paragraph={{ rows: 10 }} />;
  const failed = sheet.error ?? channels.error ?? members.error;
  if (failed || !current || current.campaignId !== campaign.id) {
    const missing = sheet.isError ? isApiError(sheet.error, 404) : !failed;
    return (
      <ErrorState
        error={failed}
        title={missing ? 'Sheet not found' : undefined}
        description={missing ? 'It does not exist in this campaign, or it was deleted.' : undefined}
        onRetry={() => {
          void sheet.refetch();
          void channels.refetch();
          void members.refetch();
        }}
        extra={
          <Link to={paths.campaignRuns.getHref(campaign.id)}>
            <Button>All runs</Button>
          </Link>
        }
      />
    );
  }

  const memberList = members.data ?? [];
  const nameOf = (userId: string) => memberName(memberList, userId);
  const columns = sheetChannels(current.channelIds, channels.data ?? []);
  const items = [
    {
      key: 'table',
      label: 'Table',
      children: (
        <SheetTable
          sheet={current}
          channels={columns}
          viewer={viewer}
          decimalComma={campaign.decimalComma}
          withResolutions={seesMismatches}
          active={tab === 'table'}
        />
      ),
    },
    ...(seesMismatches
      ? [
          {
            key: 'mismatches',
            label: 'Mismatches',
            children: (
              <MismatchPanel
                sheet={current}
                channels={columns}
                decimalComma={campaign.decimalComma}
                canResolve={mayResolve(current, viewer)}
                nameOf={nameOf}
                renderFrame={renderFrame}
                active={tab === 'mismatches'}
              />
            ),
          },
          { key: 'rates', label: 'Rates', children: <MismatchRates sheetId={current.id} channels={columns} /> },
        ]
      : []),
  ];

  return (
    <>
      <Breadcrumb
        className="page-breadcrumb"
        items={[
          { title: <Link to={paths.campaignRuns.getHref(campaign.id)}>Runs</Link> },
          { title: <Link to={paths.run.getHref(campaign.id, current.runId)}>{run.data?.name ?? 'Run'}</Link> },
          { title: current.name },
        ]}
      />
      <PageHeader title={current.name} subtitle={run.data?.name} actions={<EnterPassButton sheet={current} viewer={viewer} />} />
      <SheetSummary sheet={current} members={memberList} viewer={viewer} />
      <Tabs activeKey={tab} onChange={(key) => setTab(key as SheetTab)} items={items} destroyOnHidden />
    </>
  );
}
