import type { CampaignRole, Sheet, SheetRow } from '@dialsheet/common';
import { BadRequestException, ConflictException, Injectable, Logger, NotFoundException } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { isUUID } from 'class-validator';
import { DataSource, EntityManager, In } from 'typeorm';
import type { AuthUser } from '../../core/auth-user';
import { AuditService } from '../audit/audit.service';
import { CampaignAccessService, type CampaignAccess } from '../campaigns/campaign-access.service';
import { CampaignMemberEntity } from '../campaigns/campaign-member.entity';
import { ARCHIVED_READ_ONLY } from '../campaigns/campaigns.service';
import { ChannelEntity } from '../channels/channel.entity';
import { MailService } from '../mail/mail.service';
import { NotificationPreferences } from '../mail/notification-preferences.service';
import { RecordingEntity } from '../recordings/recording.entity';
import { RUN_NOT_FOUND, RunAccessService } from '../runs/run-access.service';
import { RunEntity } from '../runs/run.entity';
import { UserEntity } from '../users/user.entity';
import { AssignSheetDto } from './dto/assign-sheet.dto';
import { CreateSheetDto } from './dto/create-sheet.dto';
import { UpdateSheetDto } from './dto/update-sheet.dto';
import { runLimitProblem, sheetProblems, sheetRowCount, sheetRows, type SheetPlan } from './sheet-rules';
import { SheetChannelEntity } from './sheet-channel.entity';
import { SheetEntity } from './sheet.entity';
import { refuseIfLocked, runLock } from '../runs/run-lock';
import { SHEET_FIELDS, sheetSnapshot, toSheet, type SheetDone } from './sheet.mapper';

export const SHEET_NOT_FOUND = 'Sheet not found';
/** Who may plan sheets and assign people to them. */
export const SHEET_WRITERS: readonly CampaignRole[] = ['lead', 'engineer'];

const sameValue = (a: unknown, b: unknown) => JSON.stringify(a) === JSON.stringify(b);

interface Assignment {
  pass: 'reader' | 'checker';
  user: UserEntity;
}

@Injectable()
export class SheetsService {
  private readonly logger = new Logger(SheetsService.name);

  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly access: CampaignAccessService,
    private readonly runAccess: RunAccessService,
    private readonly audit: AuditService,
    private readonly mail: MailService,
    private readonly preferences: NotificationPreferences,
  ) {}

  async list(user: AuthUser, runId: string): Promise<Sheet[]> {
    const { run } = await this.runAccess.require(user, runId);
    const manager = this.dataSource.manager;
    const sheets = await manager.find(SheetEntity, { where: { runId }, order: { createdAt: 'ASC', id: 'ASC' } });
    const channels = await this.channelsOf(manager, sheets.map((s) => s.id));
    const done = await this.doneOf(manager, sheets);
    const lock = runLock(run);
    return sheets.map((s) => toSheet(s, channels.get(s.id) ?? [], done.get(s.id), lock));
  }

  async get(user: AuthUser, sheetId: string): Promise<Sheet> {
    const sheet = await this.requireSheet(user, sheetId, [], this.dataSource.manager, false);
    return this.present(this.dataSource.manager, sheet);
  }

  /** Computed from the plan on every call rather than stored: the plan alone fixes them exactly. */
  async rows(user: AuthUser, sheetId: string): Promise<SheetRow[]> {
    const sheet = await this.requireSheet(user, sheetId, [], this.dataSource.manager, false);
    return sheetRows(sheet.startTime, sheet.endTime, sheet.interval);
  }

  async create(user: AuthUser, runId: string, dto: CreateSheetDto): Promise<Sheet> {
    const plan: SheetPlan = { startTime: dto.startTime, endTime: dto.endTime, interval: dto.interval, channelIds: dto.channelIds };
    assertSound(plan);
    return this.dataSource.transaction(async (manager) => {
      const found = await this.runAccess.require(user, runId, SHEET_WRITERS, { manager, writable: true });
      // Campaign first, then run, as in update: the campaign lock keeps channels from vanishing meanwhile.
      await this.access.require(user, found.run.campaignId, SHEET_WRITERS, { manager, lock: true });
      const run = await this.lockRun(manager, runId);
      refuseIfLocked(run);
      await this.assertFitsRun(manager, run, plan);
      const sheet = await manager.save(
        manager.create(SheetEntity, {
          campaignId: run.campaignId,
          runId: run.id,
          name: dto.name,
          startTime: plan.startTime,
          endTime: plan.endTime,
          interval: plan.interval,
          readerId: null,
          checkerId: null,
        }),
      );
      await this.saveChannels(manager, sheet.id, plan.channelIds);
      await this.audit.record(manager, {
        campaignId: run.campaignId,
        actorId: user.id,
        entityType: 'sheet',
        entityId: sheet.id,
        action: 'create',
        after: { ...sheetSnapshot(sheet, plan.channelIds), runId: run.id },
      });
      return toSheet(sheet, plan.channelIds);
    });
  }

  async update(user: AuthUser, sheetId: string, dto: UpdateSheetDto): Promise<Sheet> {
    return this.dataSource.transaction(async (manager) => {
      const sheet = await this.requireSheet(user, sheetId, SHEET_WRITERS, manager, true);
      const channelIds = (await this.channelsOf(manager, [sheet.id])).get(sheet.id) ?? [];
      const merged = {
        name: dto.name ?? sheet.name,
        startTime: dto.startTime ?? sheet.startTime,
        endTime: dto.endTime ?? sheet.endTime,
        interval: dto.interval ?? sheet.interval,
        channelIds: dto.channelIds ?? channelIds,
      };
      assertSound(merged);
      const snapshot = sheetSnapshot(sheet, channelIds);
      const next = sheetSnapshot(merged, merged.channelIds);
      const before: Record<string, unknown> = {};
      const after: Record<string, unknown> = {};
      for (const key of SHEET_FIELDS) {
        if (!sameValue(snapshot[key], next[key])) {
          before[key] = snapshot[key];
          after[key] = next[key];
        }
      }
      if (Object.keys(after).length === 0) return toSheet(sheet, channelIds, (await this.doneOf(manager, [sheet])).get(sheet.id));
      await this.assertFitsRun(manager, await this.lockRun(manager, sheet.runId), merged);
      sheet.name = merged.name;
      sheet.startTime = merged.startTime;
      sheet.endTime = merged.endTime;
      sheet.interval = merged.interval;
      const saved = await manager.save(SheetEntity, sheet);
      if ('channelIds' in after) {
        await manager.delete(SheetChannelEntity, { sheetId: sheet.id });
        await this.saveChannels(manager, sheet.id, merged.channelIds);
      }
      await this.audit.record(manager, {
        campaignId: sheet.campaignId,
        actorId: user.id,
        entityType: 'sheet',
        entityId: sheet.id,
        action: 'update',
        before,
        after,
        reason: dto.reason,
      });
      return toSheet(saved, merged.channelIds, (await this.doneOf(manager, [saved])).get(saved.id));
    });
  }

  async remove(user: AuthUser, sheetId: string): Promise<void> {
    await this.dataSource.transaction(async (manager) => {
      const sheet = await this.requireSheet(user, sheetId, SHEET_WRITERS, manager, true);
      // Readings are the record: the foreign key would cascade them away with the sheet, so a
      // sheet that holds any reading is kept.
      const [{ readings }] = (await manager.query('SELECT count(*)::int AS readings FROM readings WHERE sheet_id = $1', [sheet.id])) as Array<{
        readings: number;
      }>;
      if (readings > 0) {
        throw new ConflictException(`This sheet holds ${readings} reading${readings === 1 ? '' : 's'}; readings are never deleted, so neither is the sheet`);
      }
      const channelIds = (await this.channelsOf(manager, [sheet.id])).get(sheet.id) ?? [];
      await manager.delete(SheetEntity, { id: sheet.id });
      await this.audit.record(manager, {
        campaignId: sheet.campaignId,
        actorId: user.id,
        entityType: 'sheet',
        entityId: sheet.id,
        action: 'delete',
        before: { ...sheetSnapshot(sheet, channelIds), runId: sheet.runId, readerId: sheet.readerId, checkerId: sheet.checkerId },
      });
    });
  }

  /**
   * Blind double entry needs two people: the reader must hold the reader role, the checker the
   * checker role, and they must differ. Each newly assigned person is told by e-mail once the
   * change is committed; a failed mail does not undo the assignment.
   */
  async assign(user: AuthUser, sheetId: string, dto: AssignSheetDto): Promise<Sheet> {
    const { sheet, channelIds, notify, context } = await this.dataSource.transaction(async (manager) => {
      const sheet = await this.requireSheet(user, sheetId, SHEET_WRITERS, manager, true);
      const readerId = dto.readerId === undefined ? sheet.readerId : dto.readerId;
      const checkerId = dto.checkerId === undefined ? sheet.checkerId : dto.checkerId;
      if (readerId && checkerId && readerId === checkerId) {
        throw new BadRequestException(
          'readerId and checkerId must be different people: the blind second pass only catches misreadings when someone else types it',
        );
      }
      const problems: string[] = [];
      const people = new Map<string, UserEntity>();
      for (const [field, id, role] of [
        ['readerId', readerId, 'reader'],
        ['checkerId', checkerId, 'checker'],
      ] as const) {
        if (!id) continue;
        const member = await manager.findOneBy(CampaignMemberEntity, { campaignId: sheet.campaignId, userId: id });
        const person = member ? await manager.findOneBy(UserEntity, { id }) : null;
        if (!member || !person) problems.push(`${field} must be a member of this campaign`);
        else if (!member.roles.includes(role)) problems.push(`${field} must be a member with the ${role} role in this campaign`);
        else people.set(id, person);
      }
      if (problems.length > 0) throw new BadRequestException(problems);

      const before = { readerId: sheet.readerId, checkerId: sheet.checkerId };
      const after = { readerId, checkerId };
      const channelIds = (await this.channelsOf(manager, [sheet.id])).get(sheet.id) ?? [];
      if (sameValue(before, after)) return { sheet, channelIds, notify: [] as Assignment[], context: null };
      const notify: Assignment[] = [];
      if (readerId && readerId !== sheet.readerId) notify.push({ pass: 'reader', user: people.get(readerId) as UserEntity });
      if (checkerId && checkerId !== sheet.checkerId) notify.push({ pass: 'checker', user: people.get(checkerId) as UserEntity });
      sheet.readerId = readerId;
      sheet.checkerId = checkerId;
      const saved = await manager.save(SheetEntity, sheet);
      await this.audit.record(manager, {
        campaignId: sheet.campaignId,
        actorId: user.id,
        entityType: 'sheet',
        entityId: sheet.id,
        action: 'update',
        before,
        after,
        reason: 'Sheet assignment',
      });
      const [names] = (await manager.query(
        'SELECT r.name AS "runName", c.name AS "campaignName" FROM runs r JOIN campaigns c ON c.id = r.campaign_id WHERE r.id = $1',
        [sheet.runId],
      )) as Array<{ runName: string; campaignName: string }>;
      return { sheet: saved, channelIds, notify, context: names };
    });
    const result = toSheet(sheet, channelIds, (await this.doneOf(this.dataSource.manager, [sheet])).get(sheet.id));
    // Only those who have not switched sheet-assignment mails off.
    const wanting = await this.preferences.wanting('sheet-assigned', notify.map((n) => n.user.id));
    for (const { pass, user: person } of notify) {
      if (!wanting.has(person.id)) continue;
      try {
        await this.mail.sendSheetAssignment(person.email, {
          campaignId: sheet.campaignId,
          sheetId: sheet.id,
          pass,
          name: person.name,
          assignerName: user.name,
          sheetName: sheet.name,
          runName: context?.runName ?? '',
          campaignName: context?.campaignName ?? '',
          rowCount: result.rowCount,
          channelCount: channelIds.length,
        });
      } catch (error) {
        // The assignment stands; the sheet list shows it and the mail can be sent again by re-assigning.
        this.logger.error(`Sheet assignment mail to ${person.email} failed: ${String(error)}`);
      }
    }
    return result;
  }

  /** Sheet times are test times, so the run needs sync marks and a processed recording to check against. */
  private async assertFitsRun(manager: EntityManager, run: RunEntity, plan: SheetPlan): Promise<void> {
    if (!run.sync) throw new BadRequestException("Set the run's time sync before making a sheet: sheet times are test times");
    const recording = await manager.findOneBy(RecordingEntity, { runId: run.id });
    const duration = recording?.probe?.durationSec;
    if (duration === undefined) {
      throw new ConflictException('Wait until the run’s recording is processed: its length limits the sheet’s end time');
    }
    const problem = runLimitProblem(run.sync, duration, plan.endTime);
    if (problem) throw new BadRequestException(problem);
    const found = await manager.find(ChannelEntity, { where: { id: In(plan.channelIds), campaignId: run.campaignId } });
    const ours = new Set(found.map((c) => c.id));
    const foreign = plan.channelIds.flatMap((id, i) => (ours.has(id) ? [] : [`channelIds.${i} is not a channel of this run’s campaign`]));
    if (foreign.length > 0) throw new BadRequestException(foreign);
  }

  private async lockRun(manager: EntityManager, runId: string): Promise<RunEntity> {
    const run = await manager.findOne(RunEntity, { where: { id: runId }, lock: { mode: 'pessimistic_write' } });
    if (!run) throw new NotFoundException(RUN_NOT_FOUND);
    return run;
  }

  private async saveChannels(manager: EntityManager, sheetId: string, channelIds: string[]): Promise<void> {
    await manager.insert(
      SheetChannelEntity,
      channelIds.map((channelId, position) => ({ sheetId, channelId, position })),
    );
  }

  private async channelsOf(manager: EntityManager, sheetIds: string[]): Promise<Map<string, string[]>> {
    const out = new Map<string, string[]>();
    if (sheetIds.length === 0) return out;
    const rows = await manager.find(SheetChannelEntity, { where: { sheetId: In(sheetIds) }, order: { sheetId: 'ASC', position: 'ASC' } });
    for (const row of rows) {
      const list = out.get(row.sheetId) ?? [];
      list.push(row.channelId);
      out.set(row.sheetId, list);
    }
    return out;
  }

  private async present(manager: EntityManager, sheet: SheetEntity): Promise<Sheet> {
    const run = await manager.findOneBy(RunEntity, { id: sheet.runId });
    return toSheet(
      sheet,
      (await this.channelsOf(manager, [sheet.id])).get(sheet.id) ?? [],
      (await this.doneOf(manager, [sheet])).get(sheet.id),
      run ? runLock(run) : null,
    );
  }

  /**
   * Entries per pass that fall on the sheet's current rows and channels: a plan shortened or a
   * channel dropped after entry keeps those readings but no longer counts them.
   */
  private async doneOf(manager: EntityManager, sheets: SheetEntity[]): Promise<Map<string, SheetDone>> {
    const out = new Map<string, SheetDone>();
    if (sheets.length === 0) return out;
    // Counted per sheet from the readings' cell index alone (sheet, row, channel, pass): an
    // index-only scan, about four times quicker on a 10 000-row sheet than joining each reading
    // to the sheet's channels.
    const rows = (await manager.query(
      `SELECT s.id AS "sheetId", c.pass, c.done
         FROM unnest($1::uuid[], $2::int[]) AS s(id, row_count)
        CROSS JOIN LATERAL (
              SELECT r.pass, count(*)::int AS done
                FROM readings r
               WHERE r.sheet_id = s.id AND r.row_index < s.row_count
                 AND r.channel_id = ANY (ARRAY(SELECT sc.channel_id FROM sheet_channels sc WHERE sc.sheet_id = s.id))
               GROUP BY r.pass) AS c`,
      [sheets.map((s) => s.id), sheets.map((s) => sheetRowCount(s.startTime, s.endTime, s.interval))],
    )) as Array<{ sheetId: string; pass: number; done: number }>;
    for (const row of rows) {
      const entry = out.get(row.sheetId) ?? { pass1: 0, pass2: 0 };
      if (row.pass === 1) entry.pass1 = row.done;
      else entry.pass2 = row.done;
      out.set(row.sheetId, entry);
    }
    return out;
  }

  /**
   * A sheet in a campaign the caller does not belong to is "not found", like an unknown id. For
   * changes (`write`) the campaign row is locked, which serialises writers of the campaign, and an
   * archived campaign refuses with 409.
   */
  private async requireSheet(
    user: AuthUser,
    sheetId: string,
    roles: readonly CampaignRole[],
    manager: EntityManager,
    write: boolean,
  ): Promise<SheetEntity> {
    if (!isUUID(sheetId)) throw new NotFoundException(SHEET_NOT_FOUND);
    const found = await manager.findOneBy(SheetEntity, { id: sheetId });
    if (!found) throw new NotFoundException(SHEET_NOT_FOUND);
    let access: CampaignAccess;
    try {
      access = await this.access.require(user, found.campaignId, roles, { manager, lock: write });
    } catch (error) {
      if (error instanceof NotFoundException) throw new NotFoundException(SHEET_NOT_FOUND);
      throw error;
    }
    if (write && access.campaign.status === 'archived') throw new ConflictException(ARCHIVED_READ_ONLY);
    if (!write) return found;
    // Read again under the lock: a concurrent writer may have changed or removed it.
    const sheet = await manager.findOneBy(SheetEntity, { id: sheetId });
    if (!sheet) throw new NotFoundException(SHEET_NOT_FOUND);
    const run = await manager.findOneBy(RunEntity, { id: sheet.runId });
    if (run) refuseIfLocked(run);
    return sheet;
  }
}

function assertSound(plan: SheetPlan): void {
  const problems = sheetProblems(plan);
  if (problems.length > 0) throw new BadRequestException(problems);
}
