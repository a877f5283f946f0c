import type { CampaignRole, ChannelLimits, ReadingPass, SheetGridWire } from '@dialsheet/common';
import { ForbiddenException, Injectable, NotFoundException } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { isUUID } from 'class-validator';
import { LRUCache } from 'lru-cache';
import { DataSource, In, LessThan } from 'typeorm';
import type { AuthUser } from '../../core/auth-user';
import { CampaignAccessService } from '../campaigns/campaign-access.service';
import { ChannelEntity } from '../channels/channel.entity';
import { sheetRows } from '../sheets/sheet-rules';
import { SheetChannelEntity } from '../sheets/sheet-channel.entity';
import { SheetEntity } from '../sheets/sheet.entity';
import { SHEET_NOT_FOUND } from '../sheets/sheets.service';
import { toResolution } from './reading.mapper';
import { ResolutionEntity } from './resolution.entity';

// The sheet table's read. The readings route sends one `Reading` object per cell, built from an
// entity each: for 10 000 rows × 6 channels that is ~18 MB of JSON per pass and most of a page
// load. Here PostgreSQL writes each pass as a few JSON arrays (one per column, with each entry's
// cell index beside it) and the text goes out as it came: Node neither parses nor re-serialises
// the 120 000 entries (that cost more than the query). The browser puts them cell by cell with
// common/'s layOutSheetGrid, which also words the few limit warnings.
// The blind rules are the readings and mismatch routes' own (readings.service.ts), restated as
// "may see" answers rather than refusals, because one answer here carries all three.

/** Who sees every pass of every sheet in the campaign (as in readings.service.ts). */
const OVERSEERS: readonly CampaignRole[] = ['lead', 'engineer'];

export const GRID_HIDDEN = 'The sheet’s entries are shown to its reader and checker, the Lead and Engineers only';

interface GridSheet {
  readerId: string | null;
  checkerId: string | null;
  pass2FinishedAt: Date | null;
}

/**
 * Whether the readings route would send this pass to the user. The checker never sees pass 1
 * before finishing pass 2, nor the reader pass 2, whatever other roles they hold.
 */
export function mayReadPass(userId: string, roles: readonly CampaignRole[], sheet: GridSheet, pass: ReadingPass): boolean {
  const reader = sheet.readerId === userId;
  const checker = sheet.checkerId === userId;
  if (pass === 1) {
    if (checker && !sheet.pass2FinishedAt) return false;
    if (reader || checker) return true;
  } else {
    if (reader && !sheet.pass2FinishedAt) return false;
    if (checker || reader) return true;
  }
  return OVERSEERS.some((r) => roles.includes(r));
}

/** Whether the mismatch route would answer the user (it shows both passes side by side). */
export function mayReadMismatches(userId: string, roles: readonly CampaignRole[], sheet: GridSheet): boolean {
  // Checked before the overseeing roles: a Lead who is also this sheet's checker stays blind.
  if (sheet.readerId === userId || sheet.checkerId === userId) return sheet.pass2FinishedAt !== null;
  return OVERSEERS.some((r) => roles.includes(r));
}

/** Only the owner of a pass changes its entries, and only until they mark it finished. */
export function mayEditPass(userId: string, sheet: GridSheet & { pass1FinishedAt: Date | null }, pass: ReadingPass): boolean {
  return pass === 1 ? sheet.readerId === userId && !sheet.pass1FinishedAt : sheet.checkerId === userId && !sheet.pass2FinishedAt;
}

const CELL = 'r.row_index * $2::int + ch.pos - 1';

/**
 * One pass of a sheet as the JSON text of a SheetGridWirePass. $1 sheet, $2 channels per row,
 * $3 channel ids in order, $4 rows, $5 whether the viewer may change the pass, $6–$9 each
 * channel's plausible and operating limits, $10 the pass.
 */
const PASS_SQL = `SELECT '{"cell":[' || COALESCE(string_agg((${CELL})::text, ','), '') || ']'
     || ',"rawText":' || COALESCE(json_agg(r.raw_text)::text, '[]')
     || ',"flagged":' || COALESCE((json_agg(json_build_array(${CELL}, r.flag)) FILTER (WHERE r.flag IS NOT NULL))::text, 'null')
     || ',"version":' || COALESCE((json_agg(r.version) FILTER (WHERE $5::boolean))::text, CASE WHEN $5::boolean THEN '[]' ELSE 'null' END)
     || ',"frameTime":' || COALESCE((json_agg(r.frame_time) FILTER (WHERE $5::boolean))::text, CASE WHEN $5::boolean THEN '[]' ELSE 'null' END)
     || ',"outside":' || COALESCE((json_agg(json_build_array(${CELL}, r.value))
          FILTER (WHERE r.value < ch.plausible_min OR r.value > ch.plausible_max OR r.value < ch.operating_min OR r.value > ch.operating_max))::text, 'null')
     || '}' AS columns
   FROM readings r
   JOIN unnest($3::uuid[], $6::float8[], $7::float8[], $8::float8[], $9::float8[])
        WITH ORDINALITY AS ch(id, plausible_min, plausible_max, operating_min, operating_max, pos)
     ON ch.id = r.channel_id
  WHERE r.sheet_id = $1 AND r.pass = $10::int AND r.row_index < $4::int`;

/** Room for the entries of finished passes kept by one API process (about 40 passes of 60 000 cells). */
export const FINISHED_PASS_CACHE_BYTES = 64 * 1024 * 1024;

@Injectable()
export class SheetGridService {
  /**
   * The text of finished passes, by everything that shaped it. A finished pass never changes (the
   * save route refuses any change to it, and nothing clears a finish), so a copy keyed by its
   * finish time and the plan it was read through (rows, channels, limits) stays true in every API
   * process, with nothing to invalidate: a changed plan or limit is another key. Reviewing a
   * checked sheet, the usual reason to open a large table, then skips the database's aggregation.
   */
  private readonly finishedPasses = new LRUCache<string, string>({
    maxSize: FINISHED_PASS_CACHE_BYTES,
    // JavaScript strings hold UTF-16: two bytes per code unit.
    sizeCalculation: (text) => Math.max(1, text.length * 2),
  });

  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly access: CampaignAccessService,
  ) {}

  /** The grid route's answer (a `SheetGridWire`) as JSON text, ready to send. */
  async grid(user: AuthUser, sheetId: string): Promise<string> {
    const manager = this.dataSource.manager;
    // As the readings routes: a sheet outside the caller's campaigns is "not found", like an unknown id.
    if (!isUUID(sheetId)) throw new NotFoundException(SHEET_NOT_FOUND);
    const sheet = await manager.findOne(SheetEntity, { where: { id: sheetId } });
    if (!sheet) throw new NotFoundException(SHEET_NOT_FOUND);
    let roles: readonly CampaignRole[];
    try {
      roles = (await this.access.require(user, sheet.campaignId, [], { manager })).member.roles;
    } catch (error) {
      if (error instanceof NotFoundException) throw new NotFoundException(SHEET_NOT_FOUND);
      throw error;
    }
    const see1 = mayReadPass(user.id, roles, sheet, 1);
    const see2 = mayReadPass(user.id, roles, sheet, 2);
    // Both readings routes would refuse: so does this one, rather than answer with nothing in it.
    if (!see1 && !see2) throw new ForbiddenException(GRID_HIDDEN);

    const links = await manager.find(SheetChannelEntity, { where: { sheetId: sheet.id }, order: { position: 'ASC' } });
    const found = await manager.find(ChannelEntity, { where: { id: In(links.map((l) => l.channelId)) } });
    const byId = new Map(found.map((c) => [c.id, c]));
    const channels = links.flatMap((l) => (byId.has(l.channelId) ? [byId.get(l.channelId) as ChannelEntity] : []));
    const channelIds = channels.map((c) => c.id);
    const testTimes = sheetRows(sheet.startTime, sheet.endTime, sheet.interval).map((r) => r.testTime);
    const passes = ([1, 2] as const).filter((p) => (p === 1 ? see1 : see2));

    const editable = passes.filter((p) => mayEditPass(user.id, sheet, p));
    const limits: ChannelLimits[] = channels.map((c) => ({
      plausibleMin: c.plausibleMin ?? null,
      plausibleMax: c.plausibleMax ?? null,
      operatingMin: c.operatingMin ?? null,
      operatingMax: c.operatingMax ?? null,
    }));
    const limit = (key: keyof ChannelLimits) => limits.map((l) => l[key] ?? null);

    // Each visible pass's entries on the plan's rows and channels (entries off the plan, from a
    // sheet shortened later, are left out as the readings route leaves them out), written by
    // PostgreSQL as the JSON text of a SheetGridWirePass. Serialising each value costs the most
    // here, so only what the viewer needs is written: versions and frames for a pass they may
    // change, flags and values only where there is a flag or a value outside a limit (a comparison
    // with an absent limit is null, so it picks nothing). The arrays are not sorted (ordering
    // costs a sort apiece); each entry carries its cell index instead. The aggregates of one
    // query step through its rows together, so element k of every array is the same entry
    // (PostgreSQL's executor; common practice). The passes are read side by side, one
    // connection each.
    const passText = async (pass: ReadingPass): Promise<string> => {
      if (!passes.includes(pass)) return 'null';
      const finishedAt = pass === 1 ? sheet.pass1FinishedAt : sheet.pass2FinishedAt;
      // A finished pass is nobody's to change, so the key needs no viewer.
      const key = finishedAt ? JSON.stringify([sheet.id, pass, finishedAt.toISOString(), testTimes.length, channelIds, limits]) : null;
      const kept = key ? this.finishedPasses.get(key) : undefined;
      if (kept !== undefined) return kept;
      const [row] = (await manager.query(PASS_SQL, [
        sheet.id,
        channelIds.length,
        channelIds,
        testTimes.length,
        editable.includes(pass),
        limit('plausibleMin'),
        limit('plausibleMax'),
        limit('operatingMin'),
        limit('operatingMax'),
        pass,
      ])) as Array<{ columns: string }>;
      if (key) this.finishedPasses.set(key, row.columns);
      return row.columns;
    };
    const resolutionsOf = async (): Promise<SheetGridWire['resolutions']> => {
      if (!mayReadMismatches(user.id, roles, sheet)) return null;
      const order = new Map(channelIds.map((id, i) => [id, i]));
      const stored = await manager.find(ResolutionEntity, {
        where: { sheetId: sheet.id, rowIndex: LessThan(testTimes.length), channelId: In(channelIds) },
      });
      return stored
        .sort((a, b) => a.rowIndex - b.rowIndex || (order.get(a.channelId) ?? 0) - (order.get(b.channelId) ?? 0))
        .map(toResolution);
    };
    const [pass1, pass2, resolutions] = await Promise.all([passText(1), passText(2), resolutionsOf()]);

    // The small parts serialised here, the passes spliced in as PostgreSQL wrote them; the keys
    // are those of SheetGridWire.
    const head: Omit<SheetGridWire, 'pass1' | 'pass2' | 'resolutions'> = { sheetId: sheet.id, testTimes, channelIds, limits };
    return `${JSON.stringify(head).slice(0, -1)},"pass1":${pass1},"pass2":${pass2},"resolutions":${JSON.stringify(resolutions)}}`;
  }
}
