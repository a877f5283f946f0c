import {
  compareRows,
  parseReading,
  type CampaignRole,
  type PassFinish,
  type Reading,
  type ReadingPass,
  type Resolution,
  type SaveRowResponse,
  type SheetMismatches,
} from '@dialsheet/common';
import { BadRequestException, ConflictException, ForbiddenException, Injectable, NotFoundException } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { isUUID } from 'class-validator';
import { randomUUID } from 'node:crypto';
import { DataSource, EntityManager, In, type EntityMetadata } from 'typeorm';
import type { ColumnMetadata } from 'typeorm/metadata/ColumnMetadata';
import type { AuthUser } from '../../core/auth-user';
import { queryPrepared } from '../../database/data-source-prepared';
import { AuditService, type AuditRecord } from '../audit/audit.service';
import type { CampaignAccess } from '../campaigns/campaign-access.service';
import { CampaignMemberEntity } from '../campaigns/campaign-member.entity';
import { CampaignEntity } from '../campaigns/campaign.entity';
import { ARCHIVED_READ_ONLY } from '../campaigns/campaigns.service';
import { ChannelEntity } from '../channels/channel.entity';
import { NotificationsService } from '../notifications/notifications.service';
import { refuseIfLocked } from '../runs/run-lock';
import { RunEntity } from '../runs/run.entity';
import { UserEntity } from '../users/user.entity';
import { sheetRowCount, sheetRows } from '../sheets/sheet-rules';
import { SheetEntity } from '../sheets/sheet.entity';
import { CampaignAccessService } from '../campaigns/campaign-access.service';
import { SHEET_NOT_FOUND } from '../sheets/sheets.service';
import { ResolveCellDto } from './dto/resolve-cell.dto';
import { SaveRowDto } from './dto/save-row.dto';
import { computeMismatches, sameEntry } from './mismatches';
import { decideSave, STALE_READING, type SaveDecision } from './reading-rules';
import { ReadingEntity } from './reading.entity';
import { toReading, toResolution } from './reading.mapper';
import { ResolutionEntity } from './resolution.entity';

/** Who sees every pass of every sheet in the campaign. */
const OVERSEERS: readonly CampaignRole[] = ['lead', 'engineer'];

const PASS_OWNER = { 1: 'reader', 2: 'checker' } as const;

interface SheetContext {
  sheet: SheetEntity;
  run: RunEntity;
  access: CampaignAccess;
  channels: ChannelEntity[];
  rowCount: number;
  /** For a save: the row's stored entries of that pass, on the sheet's channels. */
  stored: ReadingEntity[];
}

@Injectable()
export class ReadingsService {
  private statements?: LoadStatements;

  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly audit: AuditService,
    private readonly notifications: NotificationsService,
  ) {}

  /**
   * Saves one row of one pass in one transaction: either every reading of the row is stored (or
   * found already stored) or none is. The sheet row is locked so two saves of the same cell queue.
   */
  async saveRow(user: AuthUser, sheetId: string, rowIndex: number, dto: SaveRowDto): Promise<SaveRowResponse> {
    if (dto.rowIndex !== undefined && dto.rowIndex !== null && dto.rowIndex !== rowIndex) {
      throw new BadRequestException(`rowIndex in the body (${dto.rowIndex}) must equal the row in the path (${rowIndex})`);
    }
    return this.dataSource.transaction(async (manager) => {
      const ctx = await this.load(user, sheetId, manager, true, { rowIndex, pass: dto.pass });
      const { sheet, channels, rowCount } = ctx;
      if (ctx.access.campaign.status === 'archived') throw new ConflictException(ARCHIVED_READ_ONLY);
      refuseIfLocked(ctx.run);
      assertOwner(user, sheet, dto.pass);
      if (!Number.isInteger(rowIndex) || rowIndex < 0 || rowIndex >= rowCount) {
        throw new BadRequestException(`rowIndex must be a row of this sheet, from 0 to ${rowCount - 1}, got ${rowIndex}`);
      }
      const byId = new Map(channels.map((c) => [c.id, c]));
      const problems: string[] = [];
      const seen = new Set<string>();
      const parsed = dto.readings.map((input, i) => {
        const channel = byId.get(input.channelId);
        if (!channel) {
          problems.push(`readings.${i}.channelId is not a channel of this sheet`);
          return null;
        }
        if (seen.has(input.channelId)) problems.push(`readings.${i}.channelId: ${channel.symbol} is already in this row`);
        seen.add(input.channelId);
        const result = parseReading(input.rawText, { decimalComma: ctx.access.campaign.decimalComma });
        if (result.kind === 'error') problems.push(`readings.${i}.rawText (${channel.symbol}): ${result.message}`);
        return result;
      });
      if (problems.length > 0) throw new BadRequestException(problems);

      // Read by load() after the sheet row was locked; every write of a reading happens here under
      // that lock, so these are current and no other save of this sheet can change them before commit.
      const storedBy = new Map(ctx.stored.map((r) => [r.channelId, r]));
      const decisions: SaveDecision[] = dto.readings.map((input) => decideSave(storedBy.get(input.channelId) ?? null, input));
      // A finished pass is the record the other pass was compared with: a resend of what is
      // stored still succeeds (a retry whose answer was lost), but nothing in it changes now.
      const finishedAt = dto.pass === 1 ? sheet.pass1FinishedAt : sheet.pass2FinishedAt;
      if (finishedAt && decisions.some((d) => d.kind !== 'unchanged')) {
        throw new ConflictException(
          `Pass ${dto.pass} was finished on ${finishedAt.toISOString()} and no longer changes; a wrong value is corrected by resolving it as a mismatch`,
        );
      }
      const conflict = decisions.findIndex((d) => d.kind === 'conflict');
      if (conflict >= 0) {
        const current = storedBy.get(dto.readings[conflict].channelId);
        throw new ConflictException({
          message: STALE_READING,
          current: current ? toReading(current, byId.get(current.channelId)) : null,
        });
      }

      // First entries (the usual case) go in with their audit rows as one statement, so a row of
      // six readings costs one round trip rather than twelve; changes are rarer and go one by one.
      const out: (Reading | null)[] = dto.readings.map(() => null);
      const inserts: { index: number; entity: ReadingEntity }[] = [];
      const audits: AuditRecord[] = [];
      for (const [i, input] of dto.readings.entries()) {
        const decision = decisions[i];
        const result = parsed[i];
        const existing = storedBy.get(input.channelId);
        if (decision.kind === 'unchanged' && existing) {
          out[i] = toReading(existing, byId.get(input.channelId));
          continue;
        }
        if (!result || result.kind === 'error') continue;
        const fields = {
          rawText: input.rawText,
          value: result.kind === 'number' ? result.value : null,
          canonical: result.kind === 'number' ? result.canonical : null,
          flag: result.kind === 'flag' ? result.flag : null,
          frameTime: input.frameTime ?? null,
          enteredBy: user.id,
        };
        if (decision.kind === 'update' && existing) {
          const before = { rawText: existing.rawText, frameTime: existing.frameTime, version: existing.version };
          const saved = await manager.save(ReadingEntity, Object.assign(existing, fields, { version: decision.version }));
          audits.push(this.auditOf(user, sheet, saved, 'update', before));
          out[i] = toReading(saved, byId.get(input.channelId));
        } else {
          inserts.push({
            index: i,
            // The id is made here so the audit rows, written in the same statement, can name it.
            entity: manager.create(ReadingEntity, { id: randomUUID(), sheetId: sheet.id, rowIndex, channelId: input.channelId, pass: dto.pass, version: 1, ...fields }),
          });
        }
      }
      if (inserts.length > 0) {
        for (const { entity } of inserts) audits.push(this.auditOf(user, sheet, entity, 'create', null));
        const trail = this.audit.insertStatement(audits, 2);
        const rows = inserts.map(({ entity: e }) => ({
          id: e.id,
          sheet_id: e.sheetId,
          row_index: e.rowIndex,
          channel_id: e.channelId,
          pass: e.pass,
          raw_text: e.rawText,
          value: e.value,
          canonical: e.canonical,
          flag: e.flag,
          frame_time: e.frameTime,
          entered_by: e.enteredBy,
          version: e.version,
        }));
        // JSON numbers reach float8 exactly: JavaScript writes the shortest text that reads back
        // as the same double, and PostgreSQL reads it with the same round-to-nearest rule.
        const created = await queryPrepared<Array<{ id: string; created_at: Date; updated_at: Date }>>(
          manager,
          'readings-insert-row',
          `WITH trail AS (${trail.sql})
           INSERT INTO readings (id, sheet_id, row_index, channel_id, pass, raw_text, value, canonical, flag, frame_time, entered_by, version)
           SELECT * FROM jsonb_to_recordset($1::jsonb) AS x(id uuid, sheet_id uuid, row_index integer, channel_id uuid, pass smallint, raw_text text,
                  value float8, canonical text, flag text, frame_time float8, entered_by uuid, version integer)
           RETURNING id, created_at, updated_at`,
          [JSON.stringify(rows), trail.rows],
        );
        const times = new Map(created.map((r) => [r.id, r]));
        for (const { index, entity } of inserts) {
          const row = times.get(entity.id);
          if (!row) throw new Error(`reading ${entity.id} was inserted but not returned`);
          entity.createdAt = row.created_at;
          entity.updatedAt = row.updated_at;
          out[index] = toReading(entity, byId.get(entity.channelId));
        }
      } else {
        await this.audit.recordMany(manager, audits);
      }
      return { readings: out.filter((r): r is Reading => r !== null) };
    });
  }

  /** Every entry of one pass, by row then by the sheet's channel order, to those allowed to see it. */
  async list(user: AuthUser, sheetId: string, pass: ReadingPass): Promise<Reading[]> {
    const manager = this.dataSource.manager;
    const ctx = await this.load(user, sheetId, manager, false);
    assertMayRead(user, ctx, pass);
    const order = new Map(ctx.channels.map((c, i) => [c.id, i]));
    const byId = new Map(ctx.channels.map((c) => [c.id, c]));
    const rows = await manager.find(ReadingEntity, { where: { sheetId: ctx.sheet.id, pass }, order: { rowIndex: 'ASC' } });
    return rows
      .filter((r) => order.has(r.channelId) && r.rowIndex < ctx.rowCount)
      .sort((a, b) => a.rowIndex - b.rowIndex || (order.get(a.channelId) ?? 0) - (order.get(b.channelId) ?? 0))
      .map((r) => toReading(r, byId.get(r.channelId)));
  }

  /** A pass is finished once every cell has an entry (a blank or flag counts); finishing twice keeps the first time. */
  async finish(user: AuthUser, sheetId: string, pass: ReadingPass): Promise<PassFinish> {
    const finished = await this.dataSource.transaction(async (manager) => {
      const ctx = await this.load(user, sheetId, manager, true);
      const { sheet } = ctx;
      if (ctx.access.campaign.status === 'archived') throw new ConflictException(ARCHIVED_READ_ONLY);
      refuseIfLocked(ctx.run);
      assertOwner(user, sheet, pass);
      const field = pass === 1 ? 'pass1FinishedAt' : 'pass2FinishedAt';
      const already = sheet[field];
      if (already) return { sheetId: sheet.id, pass, finishedAt: already.toISOString() };
      const total = ctx.rowCount * ctx.channels.length;
      const [{ done }] = (await manager.query(
        `SELECT count(*)::int AS done FROM readings r
          JOIN sheet_channels sc ON sc.sheet_id = r.sheet_id AND sc.channel_id = r.channel_id
         WHERE r.sheet_id = $1 AND r.pass = $2 AND r.row_index < $3`,
        [sheet.id, pass, ctx.rowCount],
      )) as Array<{ done: number }>;
      if (done < total) {
        throw new ConflictException(
          `Pass ${pass} cannot be finished: ${total - done} of ${total} cells have no entry yet (type a value, or flag it blank, unreadable or ambiguous)`,
        );
      }
      const finishedAt = new Date();
      await manager.update(SheetEntity, { id: sheet.id }, { [field]: finishedAt });
      await this.audit.record(manager, {
        campaignId: sheet.campaignId,
        actorId: user.id,
        entityType: 'sheet',
        entityId: sheet.id,
        action: 'update',
        before: { [field]: null },
        after: { [field]: finishedAt.toISOString() },
        reason: `Pass ${pass} finished`,
      });
      return { sheetId: sheet.id, pass, finishedAt: finishedAt.toISOString() };
    });
    // After the commit; it never throws (a mail failure must not undo a finished pass).
    await this.notifications.passFinished(finished, user);
    return finished;
  }

  /**
   * The cells where the passes differ or either is flagged, each with its resolution, and the
   * mismatch rates per channel and per person. Shown to Leads and Engineers at any time, and to
   * the sheet's checker and reader once pass 2 is finished (before that it would reveal pass 1).
   */
  async mismatches(user: AuthUser, sheetId: string): Promise<SheetMismatches> {
    const manager = this.dataSource.manager;
    const ctx = await this.load(user, sheetId, manager, false);
    assertMayReadMismatches(user, ctx);
    return this.computeFor(manager, ctx);
  }

  /**
   * Records the agreed value of a mismatched cell. The checker resolves once pass 2 is finished;
   * a Lead may resolve at any time. The two passes stay as typed; the reason is required.
   */
  async resolve(user: AuthUser, sheetId: string, rowIndex: number, channelId: string, dto: ResolveCellDto): Promise<Resolution> {
    return this.dataSource.transaction(async (manager) => {
      const ctx = await this.load(user, sheetId, manager, true);
      const { sheet, access } = ctx;
      if (access.campaign.status === 'archived') throw new ConflictException(ARCHIVED_READ_ONLY);
      refuseIfLocked(ctx.run);
      const isLead = access.member.roles.includes('lead');
      const isChecker = sheet.checkerId === user.id;
      if (!isLead && !isChecker) throw new ForbiddenException('Mismatches are resolved by the sheet’s checker or a Lead');
      // Even a Lead who is this sheet's checker or reader waits: resolving would reveal pass 1.
      const blind = isChecker || sheet.readerId === user.id;
      if ((blind || !isLead) && !sheet.pass2FinishedAt) {
        throw new ConflictException('Finish pass 2 first: the mismatches are resolved after the blind entry');
      }
      if (!Number.isInteger(rowIndex) || rowIndex < 0 || rowIndex >= ctx.rowCount) {
        throw new BadRequestException(`rowIndex must be a row of this sheet, from 0 to ${ctx.rowCount - 1}, got ${rowIndex}`);
      }
      const channel = ctx.channels.find((c) => c.id === channelId);
      if (!channel) throw new BadRequestException('channelId is not a channel of this sheet');
      const parsed = parseReading(dto.rawText, { decimalComma: access.campaign.decimalComma });
      if (parsed.kind === 'error') throw new BadRequestException([`rawText (${channel.symbol}): ${parsed.message}`]);
      const reason = dto.reason.trim();

      const entries = await manager.find(ReadingEntity, { where: { sheetId: sheet.id, rowIndex, channelId } });
      const pass1 = entries.find((r) => r.pass === 1);
      const pass2 = entries.find((r) => r.pass === 2);
      if (!pass1 || !pass2) throw new ConflictException('This cell does not hold both passes yet, so there is nothing to resolve');
      const parse = { decimalComma: access.campaign.decimalComma, channelIds: [channelId] };
      const cell = compareRows({ [channelId]: pass1.rawText }, { [channelId]: pass2.rawText }, parse)[channelId];
      if (cell.status !== 'mismatch') throw new ConflictException('The two passes agree on this cell, so there is nothing to resolve');

      const existing = await manager.findOne(ResolutionEntity, {
        where: { sheetId: sheet.id, rowIndex, channelId },
        lock: { mode: 'pessimistic_write' },
      });
      const base = dto.baseVersion ?? null;
      const fields = {
        rawText: dto.rawText,
        value: parsed.kind === 'number' ? parsed.value : null,
        canonical: parsed.kind === 'number' ? parsed.canonical : null,
        flag: parsed.kind === 'flag' ? parsed.flag : null,
        reason,
        resolvedBy: user.id,
      };
      if (existing && existing.rawText === dto.rawText && existing.reason === reason) return toResolution(existing);
      if ((existing && base !== existing.version) || (!existing && base !== null)) {
        throw new ConflictException({
          message: 'This cell was resolved by someone else since you loaded it; reload to see their value and reason before changing it',
          current: existing ? toResolution(existing) : null,
        });
      }
      const before = existing ? { rawText: existing.rawText, reason: existing.reason, version: existing.version } : null;
      const saved = existing
        ? await manager.save(ResolutionEntity, Object.assign(existing, fields, { version: existing.version + 1 }))
        : await manager.save(ResolutionEntity, manager.create(ResolutionEntity, { sheetId: sheet.id, rowIndex, channelId, version: 1, ...fields }));
      await this.audit.record(manager, {
        campaignId: sheet.campaignId,
        actorId: user.id,
        entityType: 'resolution',
        entityId: saved.id,
        action: existing ? 'update' : 'create',
        before: before ? { sheetId: sheet.id, rowIndex, channelId, ...before } : null,
        after: {
          sheetId: sheet.id,
          rowIndex,
          channelId,
          pass1: pass1.rawText,
          pass2: pass2.rawText,
          rawText: saved.rawText,
          agreesWith: [sameEntry(saved, pass1) ? 1 : null, sameEntry(saved, pass2) ? 2 : null].filter((p) => p !== null),
          version: saved.version,
        },
        reason,
      });
      return toResolution(saved);
    });
  }

  private async computeFor(manager: EntityManager, ctx: SheetContext): Promise<SheetMismatches> {
    const { sheet, channels } = ctx;
    const byId = new Map(channels.map((c) => [c.id, c]));
    const readings = await manager.find(ReadingEntity, { where: { sheetId: sheet.id } });
    const resolutions = await manager.find(ResolutionEntity, { where: { sheetId: sheet.id } });
    const people = [...new Set(readings.map((r) => r.enteredBy))];
    const users = people.length > 0 ? await manager.find(UserEntity, { where: { id: In(people) }, select: { id: true, name: true } }) : [];
    return computeMismatches({
      sheetId: sheet.id,
      channelIds: channels.map((c) => c.id),
      rowTimes: sheetRows(sheet.startTime, sheet.endTime, sheet.interval).map((r) => r.testTime),
      pass1: readings.filter((r) => r.pass === 1).map((r) => toReading(r, byId.get(r.channelId))),
      pass2: readings.filter((r) => r.pass === 2).map((r) => toReading(r, byId.get(r.channelId))),
      resolutions: resolutions.map(toResolution),
      names: new Map(users.map((u) => [u.id, u.name])),
      complete: sheet.pass1FinishedAt !== null && sheet.pass2FinishedAt !== null,
      parse: { decimalComma: ctx.access.campaign.decimalComma },
    });
  }

  private auditOf(
    user: AuthUser,
    sheet: SheetEntity,
    reading: ReadingEntity,
    action: 'create' | 'update',
    before: Record<string, unknown> | null,
  ): AuditRecord {
    return {
      campaignId: sheet.campaignId,
      actorId: user.id,
      entityType: 'reading',
      entityId: reading.id,
      action,
      before: before ? { sheetId: sheet.id, rowIndex: reading.rowIndex, channelId: reading.channelId, pass: reading.pass, ...before } : null,
      after: {
        sheetId: sheet.id,
        rowIndex: reading.rowIndex,
        channelId: reading.channelId,
        pass: reading.pass,
        rawText: reading.rawText,
        frameTime: reading.frameTime,
        version: reading.version,
      },
    };
  }

  /**
   * A sheet outside the caller's campaigns is "not found", like an unknown id. For saves the sheet
   * row is locked (not the campaign) so entry on different sheets never queues behind each other.
   *
   * Two statements, whatever the sheet: the sheet (locked first when asked), then its run,
   * campaign, the caller's membership, the channels in entry order and, for a save, the stored
   * entries of that row. The second statement starts after the lock is held, so under READ
   * COMMITTED it sees everything committed by the save that held the lock before (one statement
   * that waited for the lock would read the other tables as they were before the wait).
   */
  private async load(user: AuthUser, sheetId: string, manager: EntityManager, lock: boolean, cell?: { rowIndex: number; pass: ReadingPass }): Promise<SheetContext> {
    if (!isUUID(sheetId)) throw new NotFoundException(SHEET_NOT_FOUND);
    const sql = this.sql();
    const [sheetRow] = lock
      ? await queryPrepared<RawRow[]>(manager, 'readings-load-sheet-for-update', sql.sheetForUpdate, [sheetId])
      : await queryPrepared<RawRow[]>(manager, 'readings-load-sheet', sql.sheet, [sheetId]);
    const sheet = sheetRow ? sql.sheetColumns.from(sheetRow) : null;
    if (!sheet) throw new NotFoundException(SHEET_NOT_FOUND);
    const rows = cell
      ? await queryPrepared<RawRow[]>(manager, 'readings-load-context-with-cell', sql.contextWithCell, [
          sheet.runId,
          sheet.campaignId,
          user.id,
          sheet.id,
          cell.rowIndex,
          cell.pass,
        ])
      : await queryPrepared<RawRow[]>(manager, 'readings-load-context', sql.context, [sheet.runId, sheet.campaignId, user.id, sheet.id]);
    // Entry order is sorted here: six rows, where an ORDER BY would cost PostgreSQL a sort node.
    rows.sort((a, b) => ((a.sc_position as number | null) ?? 0) - ((b.sc_position as number | null) ?? 0));
    const run = rows.length > 0 ? sql.runColumns.from(rows[0]) : null;
    if (!run) throw new NotFoundException(SHEET_NOT_FOUND);
    const campaign = sql.campaignColumns.from(rows[0]);
    const member = sql.memberColumns.from(rows[0]);
    // The access service's own decision, on the membership read here in the same statement as the
    // rest (never cached across requests: a second API process would not see a removal): any
    // member; a non-member, like an unknown campaign, learns nothing and gets the sheet's "not found".
    const access = CampaignAccessService.decide(campaign, member, [], SHEET_NOT_FOUND);
    const channels: ChannelEntity[] = [];
    const stored: ReadingEntity[] = [];
    for (const row of rows) {
      const channel = sql.channelColumns.from(row);
      if (channel) channels.push(channel);
      const reading = cell ? sql.readingColumns.from(row) : null;
      if (reading) stored.push(reading);
    }
    return { sheet, run, access, channels, rowCount: sheetRowCount(sheet.startTime, sheet.endTime, sheet.interval), stored };
  }

  /** The statements of `load`, written once per process from the entities' column metadata. */
  private sql(): LoadStatements {
    if (this.statements) return this.statements;
    const ds = this.dataSource;
    const sheetColumns = new RawColumns(ds, SheetEntity, 's');
    const runColumns = new RawColumns(ds, RunEntity, 'r');
    const campaignColumns = new RawColumns(ds, CampaignEntity, 'c');
    const memberColumns = new RawColumns(ds, CampaignMemberEntity, 'm');
    const channelColumns = new RawColumns(ds, ChannelEntity, 'ch');
    const readingColumns = new RawColumns(ds, ReadingEntity, 'rd');
    const sheet = `SELECT ${sheetColumns.select} FROM sheets s WHERE s.id = $1`;
    const context = (withCell: boolean) =>
      `SELECT ${[runColumns, campaignColumns, memberColumns, channelColumns, ...(withCell ? [readingColumns] : [])].map((c) => c.select).join(', ')}, sc.position AS sc_position
         FROM runs r
         JOIN campaigns c ON c.id = $2
         LEFT JOIN campaign_members m ON m.campaign_id = c.id AND m.user_id = $3
         LEFT JOIN sheet_channels sc ON sc.sheet_id = $4
         LEFT JOIN channels ch ON ch.id = sc.channel_id
         ${withCell ? 'LEFT JOIN readings rd ON rd.sheet_id = sc.sheet_id AND rd.channel_id = sc.channel_id AND rd.row_index = $5 AND rd.pass = $6' : ''}
        WHERE r.id = $1`;
    this.statements = {
      sheet,
      sheetForUpdate: `${sheet} FOR UPDATE`,
      context: context(false),
      contextWithCell: context(true),
      sheetColumns,
      runColumns,
      campaignColumns,
      memberColumns,
      channelColumns,
      readingColumns,
    };
    return this.statements;
  }
}

type RawRow = Record<string, unknown>;

interface LoadStatements {
  sheet: string;
  sheetForUpdate: string;
  context: string;
  contextWithCell: string;
  sheetColumns: RawColumns<SheetEntity>;
  runColumns: RawColumns<RunEntity>;
  campaignColumns: RawColumns<CampaignEntity>;
  memberColumns: RawColumns<CampaignMemberEntity>;
  channelColumns: RawColumns<ChannelEntity>;
  readingColumns: RawColumns<ReadingEntity>;
}

/**
 * One entity's columns in hand-written SQL (`alias.column AS "alias_column"`) and the way back to
 * an entity, converting each value as TypeORM's own find() does. Hand-written because the save
 * path joins five tables in one statement, and building and hydrating it through the query
 * builder cost more CPU than the database spent on it.
 */
class RawColumns<T extends object> {
  readonly select: string;
  private readonly metadata: EntityMetadata;
  private readonly keys: Array<{ column: ColumnMetadata; key: string }>;
  /** Null in this column means the outer join found no row. */
  private readonly presence: string;

  constructor(
    private readonly dataSource: DataSource,
    target: new () => T,
    alias: string,
  ) {
    this.metadata = dataSource.getMetadata(target);
    this.keys = this.metadata.columns.map((column) => ({ column, key: `${alias}_${column.databaseName}` }));
    this.select = this.keys.map(({ column, key }) => `${alias}."${column.databaseName}" AS "${key}"`).join(', ');
    this.presence = `${alias}_${this.metadata.primaryColumns[0].databaseName}`;
  }

  from(row: RawRow): T | null {
    if (row[this.presence] === null || row[this.presence] === undefined) return null;
    const entity = this.metadata.create(undefined, { fromDeserializer: true }) as Record<string, unknown>;
    for (const { column, key } of this.keys) entity[column.propertyName] = this.dataSource.driver.prepareHydratedValue(row[key], column);
    return entity as T;
  }
}

/** Only the person assigned to a pass types into it, whatever other roles they hold. */
function assertOwner(user: AuthUser, sheet: SheetEntity, pass: ReadingPass): void {
  const owner = pass === 1 ? sheet.readerId : sheet.checkerId;
  if (owner !== user.id) {
    throw new ForbiddenException(`Only the sheet’s assigned ${PASS_OWNER[pass]} may enter or finish pass ${pass}`);
  }
}

/**
 * The second pass is blind: its checker never sees pass 1 before finishing, even when they also
 * hold an overseeing role. The reader sees pass 2 only once it is finished, for the same reason.
 */
function assertMayRead(user: AuthUser, ctx: SheetContext, pass: ReadingPass): void {
  const { sheet, access } = ctx;
  if (pass === 1) {
    if (sheet.checkerId === user.id && !sheet.pass2FinishedAt) throw new ForbiddenException('Pass 1 is hidden until you finish pass 2');
    if (sheet.readerId === user.id || sheet.checkerId === user.id) return;
  } else {
    if (sheet.readerId === user.id && !sheet.pass2FinishedAt) throw new ForbiddenException('Pass 2 is hidden until the checker finishes it');
    if (sheet.checkerId === user.id || sheet.readerId === user.id) return;
  }
  if (OVERSEERS.some((r) => access.member.roles.includes(r))) return;
  throw new ForbiddenException(`Pass ${pass} is shown to its ${PASS_OWNER[pass]}, the Lead and Engineers only`);
}

/** The mismatch list shows both passes side by side, so it follows the stricter of the two rules. */
function assertMayReadMismatches(user: AuthUser, ctx: SheetContext): void {
  const { sheet, access } = ctx;
  // Checked before the overseeing roles: a Lead who is also this sheet's checker stays blind.
  if (sheet.readerId === user.id || sheet.checkerId === user.id) {
    if (sheet.pass2FinishedAt) return;
    throw new ForbiddenException('The mismatch list opens once pass 2 is finished');
  }
  if (OVERSEERS.some((r) => access.member.roles.includes(r))) return;
  throw new ForbiddenException('The mismatch list is shown to the sheet’s reader and checker, the Lead and Engineers only');
}
