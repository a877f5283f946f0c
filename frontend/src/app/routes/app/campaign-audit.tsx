import { useMemo } from 'react';
import { useParams, useSearchParams } from 'react-router-dom';
import { Card } from 'antd';
import type { AuditAction, AuditQuery } from '@dialsheet/common';
import { PageHeader } from '@/components/ui/page-header';
import { ErrorState } from '@/components/feedback/error-state';
import { useDocumentTitle } from '@/hooks/use-document-title';
import { useCampaign } from '@/features/campaigns/api/get-campaign';
import { useMembers } from '@/features/members/api/get-members';
import { useAuditEntries } from '@/features/audit/api/get-audit-entries';
import { AuditFilters } from '@/features/audit/components/audit-filters';
import { AuditTable } from '@/features/audit/components/audit-table';

const DEFAULT_LIMIT = 50;

function readQuery(params: URLSearchParams): AuditQuery {
  const number = (key: string, fallback: number) => {
    const value = Number(params.get(key));
    return Number.isInteger(value) && value >= 0 ? value || fallback : fallback;
  };
  return {
    entityType: params.get('entityType') ?? undefined,
    action: (params.get('action') as AuditAction | null) ?? undefined,
    actorId: params.get('actorId') ?? undefined,
    from: params.get('from') ?? undefined,
    to: params.get('to') ?? undefined,
    limit: Math.min(number('limit', DEFAULT_LIMIT), 200),
    offset: number('offset', 0),
  };
}

function writeQuery(query: AuditQuery): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [key, value] of Object.entries(query)) {
    if (value === undefined || value === null || value === '') continue;
    if (key === 'limit' && value === DEFAULT_LIMIT) continue;
    if (key === 'offset' && value === 0) continue;
    out[key] = String(value);
  }
  return out;
}

export function CampaignAuditRoute() {
  const { campaignId = '' } = useParams();
  const { data: campaign } = useCampaign({ campaignId });
  // Filters live in the address so a filtered view can be shared and survives a reload.
  const [searchParams, setSearchParams] = useSearchParams();
  const query = useMemo(() => readQuery(searchParams), [searchParams]);
  const entries = useAuditEntries({ campaignId, query });
  const members = useMembers({ campaignId });
  useDocumentTitle(campaign ? `Audit trail · ${campaign.name}` : 'Audit trail');

  const actors = (members.data ?? []).map((m) => ({ id: m.userId, name: m.name }));
  const seenEntityTypes = [...new Set((entries.data?.items ?? []).map((e) => e.entityType))];

  return (
    <>
      <PageHeader
        title="Audit trail"
        subtitle={campaign ? `${campaign.name} — every change, who made it, when, and why. Entries are never edited.` : undefined}
      />
      <Card size="small" className="section-card">
        <AuditFilters
          value={query}
          onChange={(next) => setSearchParams(writeQuery(next))}
          actors={actors}
          seenEntityTypes={seenEntityTypes}
        />
        {entries.isError ? (
          <ErrorState error={entries.error} onRetry={() => void entries.refetch()} />
        ) : (
          <AuditTable
            page={entries.data}
            loading={entries.isFetching}
            onPageChange={(offset, limit) => setSearchParams(writeQuery({ ...query, offset, limit }))}
          />
        )}
      </Card>
    </>
  );
}
