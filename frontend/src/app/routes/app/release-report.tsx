import { useMemo } from 'react';
import { Link, useParams } from 'react-router-dom';
import { Breadcrumb, Skeleton } from 'antd';
import { useQueries } from '@tanstack/react-query';
import { paths } from '@/config/paths';
import { ErrorState } from '@/components/feedback/error-state';
import { useDocumentTitle } from '@/hooks/use-document-title';
import { useCampaign } from '@/features/campaigns/api/get-campaign';
import { useChannels } from '@/features/channels/api/get-channels';
import { useMembers } from '@/features/members/api/get-members';
import { useRuns } from '@/features/runs/api/get-runs';
import { getSheetsQueryOptions } from '@/features/sheets/api/get-sheets';
import { useAnalyses } from '@/features/analysis/api/get-analyses';
import { useDerivedChannels } from '@/features/analysis/api/get-derived-channels';
import { useRelease } from '@/features/releases/api/get-release';
import { useReleaseAnalyses } from '@/features/releases/api/get-release-analyses';
import { ReleaseReport, type ReportSheet } from '@/features/releases/components/release-report';
import { mayOversee } from '@/features/releases/utils/release-access';

/** The printable report of one release: composed from the release, analyses, sheets and people. */
export function ReleaseReportRoute() {
  const { campaignId = '', releaseId = '' } = useParams();
  const { data: campaign } = useCampaign({ campaignId });
  const release = useRelease({ releaseId });
  // A published release reports the analyses it froze; a request not yet signed previews live ones.
  const published = release.data?.status === 'published';
  const frozenAnalyses = useReleaseAnalyses({ releaseId, queryConfig: { enabled: published } });
  const liveAnalyses = useAnalyses({ campaignId, queryConfig: { enabled: release.data !== undefined && !published } });
  const analyses = published ? frozenAnalyses : liveAnalyses;
  const runs = useRuns({ campaignId });
  const channels = useChannels({ campaignId });
  const derived = useDerivedChannels({ campaignId });
  const members = useMembers({ campaignId });
  const runIds = release.data?.runIds ?? [];
  const sheetLists = useQueries({ queries: runIds.map((runId) => getSheetsQueryOptions(runId)) });
  useDocumentTitle(release.data?.number ? `Release ${release.data.number} report` : 'Release report');

  const sheets = useMemo<ReportSheet[]>(() => {
    const name = (id: string | null) => (id ? (members.data?.find((m) => m.userId === id)?.name ?? 'former member') : null);
    return sheetLists.flatMap((q) =>
      (q.data ?? []).map((s) => ({
        id: s.id,
        runId: s.runId,
        name: s.name,
        reader: name(s.readerId),
        checker: name(s.checkerId),
        pass1FinishedAt: s.pass1FinishedAt,
        pass2FinishedAt: s.pass2FinishedAt,
      })),
    );
  }, [sheetLists, members.data]);

  // A run still holds the released data while the release's lock is on its sheets.
  const runsLockedByThis = useMemo(() => {
    const locked = new Set<string>();
    for (const q of sheetLists) {
      const list = q.data ?? [];
      if (list.length > 0 && list.every((s) => s.lock?.releaseId === releaseId)) locked.add(list[0].runId);
    }
    return locked;
  }, [sheetLists, releaseId]);

  if (!campaign) return null;
  if (release.isError) return <ErrorState error={release.error} onRetry={() => void release.refetch()} />;
  if (analyses.isError) return <ErrorState error={analyses.error} onRetry={() => void analyses.refetch()} />;
  if (release.isPending || analyses.isPending || sheetLists.some((q) => q.isPending)) return <Skeleton active paragraph={{ rows: 12 }} />;

  const runName = (id: string) => runs.data?.find((r) => r.id === id)?.name ?? 'run';
  const channelName = (id: string) =>
    channels.data?.find((c) => c.id === id)?.symbol ?? derived.data?.find((d) => d.id === id)?.symbol ?? 'channel';

  return (
    <>
      <Breadcrumb
        className="page-breadcrumb"
        items={[{ title: <Link to={paths.campaignReleases.getHref(campaign.id)}>Releases</Link> }, { title: 'Report' }]}
      />
      <ReleaseReport
        release={release.data}
        campaignName={campaign.name}
        runName={runName}
        channelName={channelName}
        analyses={analyses.data}
        analysesFrozen={published}
        sheets={sheets}
        runsLockedByThis={runsLockedByThis}
        canSeeReadings={mayOversee(campaign.myRoles)}
      />
    </>
  );
}
