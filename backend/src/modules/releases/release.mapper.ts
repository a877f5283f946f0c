import type { Release, ReleaseStatus } from '@dialsheet/common';

/** One releases row with the names and the successor the mapper needs (see RELEASE_SELECT). */
export interface ReleaseRow {
  id: string;
  campaign_id: string;
  number: number | null;
  status: ReleaseStatus;
  title: string;
  note: string;
  run_ids: string[];
  requested_by: string;
  requested_by_name: string;
  requested_at: Date;
  signed_by: string | null;
  signed_by_name: string | null;
  signed_at: Date | null;
  decline_reason: string | null;
  content_hash: string | null;
  reading_count: number | null;
  snapshot_key: string | null;
  supersedes_id: string | null;
  superseded_by_id: string | null;
}

/**
 * Releases are read and written with plain SQL: the uuid[] of runs, the row locks and the
 * per-campaign numbering read more clearly as SQL than through an entity.
 */
export const RELEASE_SELECT = `
  SELECT r.id, r.campaign_id, r.number, r.status, r.title, r.note, r.run_ids,
         r.requested_by, rq.name AS requested_by_name, r.requested_at,
         r.signed_by, sg.name AS signed_by_name, r.signed_at, r.decline_reason,
         r.content_hash, r.reading_count, r.snapshot_key, r.supersedes_id,
         (SELECT n.id FROM releases n WHERE n.supersedes_id = r.id AND n.status = 'published' ORDER BY n.number LIMIT 1) AS superseded_by_id
    FROM releases r
    JOIN users rq ON rq.id = r.requested_by
    LEFT JOIN users sg ON sg.id = r.signed_by`;

export function toRelease(row: ReleaseRow): Release {
  return {
    id: row.id,
    campaignId: row.campaign_id,
    number: row.number,
    status: row.status,
    title: row.title,
    note: row.note,
    runIds: row.run_ids,
    requestedBy: { id: row.requested_by, displayName: row.requested_by_name },
    requestedAt: new Date(row.requested_at).toISOString(),
    signedBy: row.signed_by ? { id: row.signed_by, displayName: row.signed_by_name ?? '' } : null,
    signedAt: row.signed_at ? new Date(row.signed_at).toISOString() : null,
    declineReason: row.decline_reason,
    contentHash: row.content_hash,
    readingCount: row.reading_count,
    supersedesId: row.supersedes_id,
    supersededById: row.superseded_by_id,
  };
}
