// The lead's part: a release is a numbered, immutable version of a campaign's dataset (chosen runs
// with their resolved readings, channels and calibrations, analyses and balance checks), with a
// note and a content hash. Its content is frozen as a snapshot when it is signed; its runs are
// locked until the lead opens a correction, which leads to the next version.

import type { CampaignRole } from './roles';

/** requested: an engineer asked for it and it waits for a lead; published: signed, immutable. */
export type ReleaseStatus = 'requested' | 'published' | 'declined';

export interface PersonRef {
  id: string;
  displayName: string;
}

export interface Release {
  id: string;
  campaignId: string;
  /** 1, 2, 3 … per campaign, given when the release is signed; null while requested/declined. */
  number: number | null;
  status: ReleaseStatus;
  title: string;
  note: string;
  runIds: string[];
  requestedBy: PersonRef;
  requestedAt: string;
  signedBy: PersonRef | null;
  signedAt: string | null;
  /** Why a request was declined. */
  declineReason: string | null;
  /** SHA-256 (hex) of the canonical snapshot; null until published. */
  contentHash: string | null;
  /** Readings (cells) in the snapshot. */
  readingCount: number | null;
  /** The release this one replaces for some of the same runs (a correction). */
  supersedesId: string | null;
  /** A later release replaced this one for some of its runs. */
  supersededById: string | null;
}

/** POST /api/campaigns/:campaignId/releases (Engineer: a request; Lead: may sign at once). */
export interface CreateReleaseRequest {
  title: string;
  note?: string;
  runIds: string[];
  /** Lead only: sign it in the same call. */
  sign?: boolean;
}

/** POST /api/releases/:releaseId/sign (Lead). */
export interface SignReleaseRequest {
  /** The note may be edited when signing. */
  note?: string;
}

/** POST /api/releases/:releaseId/decline (Lead). */
export interface DeclineReleaseRequest {
  reason: string;
}

/**
 * POST /api/runs/:runId/correction (Lead): lifts the lock of a released run so its data may be
 * corrected; the release itself stays as it was, and the next release holding the run is a new
 * version. The reason goes to the audit trail.
 */
export interface OpenCorrectionRequest {
  reason: string;
}

// ── Export ──────────────────────────────────────────────────────────────────────────────────

export type ExportFormat = 'csv-long' | 'csv-wide' | 'xlsx' | 'json';

export const EXPORT_FORMATS: readonly ExportFormat[] = ['csv-long', 'csv-wide', 'xlsx', 'json'];

/** Where every exported file says it came from. */
export interface ExportProvenance {
  /** 'release' for a published release, 'draft' for live data (marked so in every file). */
  kind: 'release' | 'draft';
  campaign: { id: string; name: string };
  release: { id: string; number: number; contentHash: string; signedBy: string; signedAt: string } | null;
  runs: Array<{
    id: string;
    name: string;
    recording: { fileName: string; sha256: string | null } | null;
    /** Test time 0 in video time, s, and the drift correction when a second mark exists. */
    sync: { videoTimeAtTestZero: number; rate: number } | null;
  }>;
  software: { name: 'Dialsheet'; version: string };
  exportedAt: string;
  exportedBy: string;
}

/** One row of the long CSV: one sheet cell (row × channel) with both passes and the outcome. */
export interface LongExportRow {
  run: string;
  sheet: string;
  channel: string;
  /** Test time, s. */
  testTime: number;
  /** Video time of the row's timestamp, s. */
  videoTime: number | null;
  /** Presentation time of the frame actually read (the final entry's), s. */
  framePts: number | null;
  /** The final entry's text exactly as typed (the agreed one or the resolution). */
  rawText: string | null;
  value: number | null;
  rawUnit: string;
  engineeringValue: number | null;
  engineeringUnit: string;
  /** blank | unreadable | ambiguous, or empty. */
  flag: string | null;
  /** agreed | resolved | unchecked (pass 1 only) | mismatch (open) | missing */
  status: 'agreed' | 'resolved' | 'unchecked' | 'mismatch' | 'missing';
  pass1Text: string | null;
  pass2Text: string | null;
  reader: string | null;
  checker: string | null;
  resolution: string | null;
  resolutionReason: string | null;
  resolvedBy: string | null;
}

// ── Dashboard ───────────────────────────────────────────────────────────────────────────────

export interface DashboardSheet {
  id: string;
  runId: string;
  name: string;
  rows: number;
  cells: number;
  pass1Entered: number;
  pass2Entered: number;
  pass1Finished: boolean;
  pass2Finished: boolean;
  openMismatches: number;
}

export interface DashboardRun {
  id: string;
  name: string;
  hasRecording: boolean;
  synced: boolean;
  sheets: DashboardSheet[];
  /** Release holding the run, if any. */
  lockedBy: { releaseId: string; number: number } | null;
  /** Every sheet has both passes finished and no open mismatch. */
  readyToRelease: boolean;
}

export interface DashboardReaderRate {
  userId: string;
  displayName: string;
  channelId: string;
  channelSymbol: string;
  compared: number;
  mismatches: number;
  rate: number | null;
}

export interface CampaignDashboard {
  campaignId: string;
  runs: DashboardRun[];
  analyses: { total: number; stale: number; failed: number };
  readerRates: DashboardReaderRate[];
  releases: Release[];
}

// ── Notifications ───────────────────────────────────────────────────────────────────────────

export type NotificationKind = 'sheet-assigned' | 'pass-finished' | 'mismatches-waiting' | 'release-published';

export const NOTIFICATION_KINDS: readonly NotificationKind[] = ['sheet-assigned', 'pass-finished', 'mismatches-waiting', 'release-published'];

export const NOTIFICATION_LABELS: Record<NotificationKind, string> = {
  'sheet-assigned': 'A sheet is assigned to me',
  'pass-finished': 'A pass of a sheet I oversee is finished',
  'mismatches-waiting': 'Mismatches wait for my resolution',
  'release-published': 'A release of my campaign is published',
};

/** Who gets each kind by default (a person may switch any kind off or on). */
export const NOTIFICATION_AUDIENCE: Record<NotificationKind, readonly CampaignRole[]> = {
  'sheet-assigned': ['reader', 'checker'],
  'pass-finished': ['lead', 'engineer'],
  'mismatches-waiting': ['checker', 'lead'],
  'release-published': ['reader', 'checker', 'engineer', 'lead'],
};

/** GET/PUT /api/users/me/notifications */
export type NotificationSettings = Record<NotificationKind, boolean>;
