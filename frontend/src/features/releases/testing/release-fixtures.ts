// Wire-shaped releases and dashboards for component tests; each test overrides what it is about.
import type { CampaignDashboard, DashboardReaderRate, DashboardRun, DashboardSheet, NotificationSettings, Release } from '@dialsheet/common';

const at = '2026-03-04T10:00:00.000Z';
export const RELEASE_CAMPAIGN_ID = '10000000-0000-4000-8000-000000000001';
export const RUN_A_ID = '30000000-0000-4000-8000-000000000001';
export const RUN_B_ID = '30000000-0000-4000-8000-000000000002';
export const RUN_C_ID = '30000000-0000-4000-8000-000000000003';
export const LEAD = { id: '00000000-0000-4000-8000-000000000001', displayName: 'Lena Lead' };
export const ENGINEER = { id: '00000000-0000-4000-8000-000000000004', displayName: 'Erik Engineer' };
export const HASH = '9f2c4be1d07a35e8c61b4f0a2d9e7c35b18a6f4e02d5c9b7a1e3f6d8c0b2a4e6';

export function makeRelease(overrides: Partial<Release> = {}): Release {
  return {
    id: '80000000-0000-4000-8000-000000000001',
    campaignId: RELEASE_CAMPAIGN_ID,
    number: 1,
    status: 'published',
    title: 'Baseline, meter on the warm stream',
    note: 'Both passes finished, all mismatches resolved.',
    runIds: [RUN_A_ID],
    requestedBy: LEAD,
    requestedAt: at,
    signedBy: LEAD,
    signedAt: '2026-03-04T10:05:00.000Z',
    declineReason: null,
    contentHash: HASH,
    readingCount: 1204,
    supersedesId: null,
    supersededById: null,
    ...overrides,
  };
}

export function makeDashboardSheet(overrides: Partial<DashboardSheet> = {}): DashboardSheet {
  return {
    id: '60000000-0000-4000-8000-000000000001',
    runId: RUN_A_ID,
    name: 'Warm-up, every 2 s',
    rows: 301,
    cells: 602,
    pass1Entered: 602,
    pass2Entered: 602,
    pass1Finished: true,
    pass2Finished: true,
    openMismatches: 0,
    ...overrides,
  };
}

export function makeDashboardRun(overrides: Partial<DashboardRun> = {}): DashboardRun {
  return {
    id: RUN_A_ID,
    name: 'Run 1, meter on warm stream',
    hasRecording: true,
    synced: true,
    sheets: [makeDashboardSheet()],
    lockedBy: null,
    readyToRelease: true,
    ...overrides,
  };
}

export function makeReaderRate(overrides: Partial<DashboardReaderRate> = {}): DashboardReaderRate {
  return {
    userId: '00000000-0000-4000-8000-000000000002',
    displayName: 'Rudi Reader',
    channelId: '50000000-0000-4000-8000-000000000001',
    channelSymbol: 'T1',
    compared: 120,
    mismatches: 3,
    rate: 0.025,
    ...overrides,
  };
}

export function makeDashboard(overrides: Partial<CampaignDashboard> = {}): CampaignDashboard {
  return {
    campaignId: RELEASE_CAMPAIGN_ID,
    runs: [makeDashboardRun()],
    analyses: { total: 0, stale: 0, failed: 0 },
    readerRates: [],
    releases: [],
    ...overrides,
  };
}

export function makeNotificationSettings(overrides: Partial<NotificationSettings> = {}): NotificationSettings {
  return {
    'sheet-assigned': true,
    'pass-finished': true,
    'mismatches-waiting': true,
    'release-published': true,
    ...overrides,
  };
}
