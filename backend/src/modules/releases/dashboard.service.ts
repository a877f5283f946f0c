import type { CampaignDashboard, DashboardReaderRate, DashboardRun, DashboardSheet } from '@dialsheet/common';
import { Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource } from 'typeorm';
import type { AuthUser } from '../../core/auth-user';
import { AnalysesService } from '../analyses/analyses.service';
import { CampaignAccessService } from '../campaigns/campaign-access.service';
import { MISMATCH_SQL } from '../exports/snapshot';
import { sheetRowCount } from '../sheets/sheet-rules';
import { ReleasesService } from './releases.service';

/**
 * The lead's overview of a campaign, from SQL aggregates. Only Leads and Engineers may see it
 * (403 for others): the open-mismatch counts and each person's mismatch rate would tell a
 * checker how pass 1 compares with what they are typing blind, and readers do not oversee.
 */
@Injectable()
export class DashboardService {
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly access: CampaignAccessService,
    private readonly analyses: AnalysesService,
    private readonly releases: ReleasesService,
  ) {}

  async dashboard(user: AuthUser, campaignId: string): Promise<CampaignDashboard> {
    await this.access.require(user, campaignId, ['lead', 'engineer']);
    const q = this.dataSource.manager;
    const runRows = (await q.query(
      `SELECT r.id, r.name, rec.id IS NOT NULL AS has_recording, r.sync IS NOT NULL AS synced, r.locked_release_id, r.locked_release_number
         FROM runs r LEFT JOIN recordings rec ON rec.run_id = r.id
        WHERE r.campaign_id = $1 ORDER BY r.created_at, r.id`,
      [campaignId],
    )) as Array<{ id: string; name: string; has_recording: boolean; synced: boolean; locked_release_id: string | null; locked_release_number: number | null }>;
    const sheetRows = (await q.query(
      `SELECT s.id, s.run_id, s.name, s.start_time, s.end_time, s.interval,
              s.pass1_finished_at IS NOT NULL AS p1, s.pass2_finished_at IS NOT NULL AS p2,
              (SELECT count(*)::int FROM sheet_channels sc WHERE sc.sheet_id = s.id) AS channels
         FROM sheets s WHERE s.campaign_id = $1 ORDER BY s.start_time, s.name, s.id`,
      [campaignId],
    )) as Array<{ id: string; run_id: string; name: string; start_time: number; end_time: number; interval: number; p1: boolean; p2: boolean; channels: number }>;
    const rowsOf = new Map(sheetRows.map((s) => [s.id, sheetRowCount(s.start_time, s.end_time, s.interval)]));
    const ids = sheetRows.map((s) => s.id);
    // Entries inside the plan only (a sheet shortened later keeps its old rows in the table).
    const counts = (await q.query(
      `SELECT p.sheet_id,
              count(*) FILTER (WHERE r.pass = 1)::int AS pass1,
              count(*) FILTER (WHERE r.pass = 2)::int AS pass2
         FROM unnest($1::uuid[], $2::int[]) AS p(sheet_id, row_count)
         JOIN readings r ON r.sheet_id = p.sheet_id AND r.row_index < p.row_count
         JOIN sheet_channels sc ON sc.sheet_id = r.sheet_id AND sc.channel_id = r.channel_id
        GROUP BY p.sheet_id`,
      [ids, ids.map((id) => rowsOf.get(id) ?? 0)],
    )) as Array<{ sheet_id: string; pass1: number; pass2: number }>;
    const entered = new Map(counts.map((c) => [c.sheet_id, c]));
    const open = (await q.query(
      `SELECT r1.sheet_id, count(*)::int AS n
         FROM readings r1
         JOIN sheets s ON s.id = r1.sheet_id AND s.campaign_id = $1
         JOIN sheet_channels sc ON sc.sheet_id = r1.sheet_id AND sc.channel_id = r1.channel_id
         JOIN readings r2 ON r2.sheet_id = r1.sheet_id AND r2.row_index = r1.row_index AND r2.channel_id = r1.channel_id AND r2.pass = 2
         LEFT JOIN resolutions res ON res.sheet_id = r1.sheet_id AND res.row_index = r1.row_index AND res.channel_id = r1.channel_id
        WHERE r1.pass = 1 AND res.id IS NULL AND ${MISMATCH_SQL}
        GROUP BY r1.sheet_id`,
      [campaignId],
    )) as Array<{ sheet_id: string; n: number }>;
    const openOf = new Map(open.map((o) => [o.sheet_id, o.n]));

    const sheetsOf = new Map<string, DashboardSheet[]>();
    for (const s of sheetRows) {
      const rows = rowsOf.get(s.id) ?? 0;
      const sheet: DashboardSheet = {
        id: s.id,
        runId: s.run_id,
        name: s.name,
        rows,
        cells: rows * s.channels,
        pass1Entered: entered.get(s.id)?.pass1 ?? 0,
        pass2Entered: entered.get(s.id)?.pass2 ?? 0,
        pass1Finished: s.p1,
        pass2Finished: s.p2,
        openMismatches: openOf.get(s.id) ?? 0,
      };
      sheetsOf.set(s.run_id, [...(sheetsOf.get(s.run_id) ?? []), sheet]);
    }
    const runs: DashboardRun[] = runRows.map((r) => {
      const sheets = sheetsOf.get(r.id) ?? [];
      return {
        id: r.id,
        name: r.name,
        hasRecording: r.has_recording,
        synced: r.synced,
        sheets,
        lockedBy: r.locked_release_id && r.locked_release_number !== null ? { releaseId: r.locked_release_id, number: r.locked_release_number } : null,
        // The same rule signing applies: sheets there, both passes finished, nothing left open.
        readyToRelease: sheets.length > 0 && sheets.every((s) => s.pass1Finished && s.pass2Finished && s.openMismatches === 0),
      };
    });

    // Each person's rate per channel over the cells both passes reached; a differing cell
    // counts against both of its typists (as the sheet's mismatch list does per person).
    const rates = (await q.query(
      `WITH cells AS (
         SELECT r1.channel_id, r1.entered_by AS u1, r2.entered_by AS u2, ${MISMATCH_SQL} AS mismatch
           FROM readings r1
           JOIN sheets s ON s.id = r1.sheet_id AND s.campaign_id = $1
           JOIN sheet_channels sc ON sc.sheet_id = r1.sheet_id AND sc.channel_id = r1.channel_id
           JOIN readings r2 ON r2.sheet_id = r1.sheet_id AND r2.row_index = r1.row_index AND r2.channel_id = r1.channel_id AND r2.pass = 2
          WHERE r1.pass = 1)
       SELECT p.user_id, u.name, c.id AS channel_id, c.symbol, count(*)::int AS compared, count(*) FILTER (WHERE p.mismatch)::int AS mismatches
         FROM (SELECT channel_id, u1 AS user_id, mismatch FROM cells UNION ALL SELECT channel_id, u2, mismatch FROM cells) p
         JOIN users u ON u.id = p.user_id
         JOIN channels c ON c.id = p.channel_id
        GROUP BY p.user_id, u.name, c.id, c.symbol, c.position
        ORDER BY u.name, p.user_id, c.position`,
      [campaignId],
    )) as Array<{ user_id: string; name: string; channel_id: string; symbol: string; compared: number; mismatches: number }>;
    const readerRates: DashboardReaderRate[] = rates.map((r) => ({
      userId: r.user_id,
      displayName: r.name,
      channelId: r.channel_id,
      channelSymbol: r.symbol,
      compared: r.compared,
      mismatches: r.mismatches,
      rate: r.compared === 0 ? null : r.mismatches / r.compared,
    }));

    const analyses = await this.analyses.list(user, campaignId, {});
    return {
      campaignId,
      runs,
      analyses: {
        total: analyses.length,
        stale: analyses.filter((a) => a.status === 'stale').length,
        failed: analyses.filter((a) => a.status === 'failed').length,
      },
      readerRates,
      releases: await this.releases.list(user, campaignId),
    };
  }
}
