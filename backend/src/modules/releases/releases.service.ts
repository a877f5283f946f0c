import type { Release } from '@dialsheet/common';
import { BadRequestException, ConflictException, ForbiddenException, Injectable, NotFoundException } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { isUUID } from 'class-validator';
import { createHash } from 'node:crypto';
import { createWriteStream } from 'node:fs';
import { rm } from 'node:fs/promises';
import { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { DataSource, type EntityManager } from 'typeorm';
import type { AuthUser } from '../../core/auth-user';
import { StorageService } from '../../storage/storage.service';
import { AuditService } from '../audit/audit.service';
import { CampaignAccessService, type CampaignAccess } from '../campaigns/campaign-access.service';
import { ARCHIVED_READ_ONLY } from '../campaigns/campaigns.service';
import { MISMATCH_SQL, readSnapshot, snapshotLine } from '../exports/snapshot';
import { NotificationsService } from '../notifications/notifications.service';
import { RUN_NOT_FOUND, RunAccessService } from '../runs/run-access.service';
import { CreateReleaseDto, DeclineReleaseDto, OpenCorrectionDto, SignReleaseDto } from './dto/release.dto';
import { RELEASE_SELECT, toRelease, type ReleaseRow } from './release.mapper';

export const RELEASE_NOT_FOUND = 'Release not found';

export function snapshotKey(releaseId: string): string {
  return `releases/${releaseId.toLowerCase()}/snapshot.jsonl`;
}

interface RunState {
  id: string;
  name: string;
  sheets: number;
  unfinished: string[];
  open_mismatches: number;
}

/**
 * Releases: an engineer asks for one (or a lead creates and signs it at once); signing freezes
 * the chosen runs' data as a snapshot with its SHA-256, numbers the release and locks the runs,
 * all in one transaction. A lead may later open a correction on a run, which lifts its lock; the
 * next release holding the run is the new version and names the one it supersedes.
 */
@Injectable()
export class ReleasesService {
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly access: CampaignAccessService,
    private readonly runAccess: RunAccessService,
    private readonly audit: AuditService,
    private readonly storage: StorageService,
    private readonly notifications: NotificationsService,
  ) {}

  async list(user: AuthUser, campaignId: string): Promise<Release[]> {
    await this.access.require(user, campaignId);
    const rows = (await this.dataSource.query(
      `${RELEASE_SELECT} WHERE r.campaign_id = $1 ORDER BY r.number DESC NULLS FIRST, r.requested_at DESC, r.id`,
      [campaignId],
    )) as ReleaseRow[];
    return rows.map(toRelease);
  }

  async get(user: AuthUser, releaseId: string): Promise<Release> {
    const { row } = await this.requireRelease(user, releaseId);
    return toRelease(row);
  }

  /** The release row after the campaign role check; 404 alike for unknown ids and strangers. */
  async requireRelease(
    user: AuthUser,
    releaseId: string,
    roles: Parameters<CampaignAccessService['require']>[2] = [],
    manager: EntityManager = this.dataSource.manager,
    lock = false,
  ): Promise<{ row: ReleaseRow; access: CampaignAccess }> {
    if (!isUUID(releaseId)) throw new NotFoundException(RELEASE_NOT_FOUND);
    const [found] = (await manager.query('SELECT campaign_id FROM releases WHERE id = $1', [releaseId])) as Array<{ campaign_id: string }>;
    if (!found) throw new NotFoundException(RELEASE_NOT_FOUND);
    let access: CampaignAccess;
    try {
      access = await this.access.require(user, found.campaign_id, roles, { manager, lock });
    } catch (error) {
      if (error instanceof NotFoundException) throw new NotFoundException(RELEASE_NOT_FOUND);
      throw error;
    }
    if (lock) await manager.query('SELECT id FROM releases WHERE id = $1 FOR UPDATE', [releaseId]);
    const [row] = (await manager.query(`${RELEASE_SELECT} WHERE r.id = $1`, [releaseId])) as ReleaseRow[];
    return { row, access };
  }

  async create(user: AuthUser, campaignId: string, dto: CreateReleaseDto): Promise<Release> {
    const id = await this.dataSource.transaction(async (manager) => {
      // The campaign row lock serialises release numbering and signing within the campaign.
      const access = await this.access.require(user, campaignId, ['lead', 'engineer'], { manager, lock: true });
      if (access.campaign.status === 'archived') throw new ConflictException(ARCHIVED_READ_ONLY);
      const isLead = access.member.roles.includes('lead');
      if (dto.sign && !isLead) throw new ForbiddenException('Only a Lead signs a release; leave out "sign" to request one');
      const known = (await manager.query('SELECT id FROM runs WHERE campaign_id = $1 AND id = ANY($2::uuid[])', [campaignId, dto.runIds])) as Array<{
        id: string;
      }>;
      const knownIds = new Set(known.map((r) => r.id));
      const unknown = dto.runIds.filter((r) => !knownIds.has(r));
      if (unknown.length > 0) throw new BadRequestException([`runIds: ${unknown.join(', ')} ${unknown.length === 1 ? 'is not a run' : 'are not runs'} of this campaign`]);
      const [row] = (await manager.query(
        `INSERT INTO releases (campaign_id, title, note, run_ids, requested_by) VALUES ($1, $2, $3, $4::uuid[], $5) RETURNING id`,
        [campaignId, dto.title, dto.note?.trim() ?? '', dto.runIds, user.id],
      )) as Array<{ id: string }>;
      await this.audit.record(manager, {
        campaignId,
        actorId: user.id,
        entityType: 'release',
        entityId: row.id,
        action: 'create',
        after: { status: 'requested', title: dto.title, runIds: dto.runIds },
        reason: dto.sign ? 'Release created and signed by a Lead' : 'Release requested',
      });
      if (dto.sign) {
        const { row: release } = await this.requireRelease(user, row.id, ['lead'], manager, true);
        await this.publish(manager, user, release, dto.note);
      }
      return row.id;
    });
    if (dto.sign) await this.notifications.releasePublished(id);
    return this.get(user, id);
  }

  async sign(user: AuthUser, releaseId: string, dto: SignReleaseDto): Promise<Release> {
    await this.dataSource.transaction(async (manager) => {
      const { row, access } = await this.requireRelease(user, releaseId, ['lead'], manager, true);
      if (access.campaign.status === 'archived') throw new ConflictException(ARCHIVED_READ_ONLY);
      if (row.status === 'published') throw new ConflictException(`This release is already published as release ${row.number}`);
      if (row.status === 'declined') throw new ConflictException('This request was declined; create a new release to sign');
      await this.publish(manager, user, row, dto.note);
    });
    await this.notifications.releasePublished(releaseId);
    return this.get(user, releaseId);
  }

  async decline(user: AuthUser, releaseId: string, dto: DeclineReleaseDto): Promise<Release> {
    await this.dataSource.transaction(async (manager) => {
      const { row, access } = await this.requireRelease(user, releaseId, ['lead'], manager, true);
      if (access.campaign.status === 'archived') throw new ConflictException(ARCHIVED_READ_ONLY);
      if (row.status !== 'requested') throw new ConflictException(`Only a requested release can be declined; this one is ${row.status}`);
      await manager.query(
        `UPDATE releases SET status = 'declined', decline_reason = $2, declined_by = $3, updated_at = now() WHERE id = $1`,
        [releaseId, dto.reason, user.id],
      );
      await this.audit.record(manager, {
        campaignId: row.campaign_id,
        actorId: user.id,
        entityType: 'release',
        entityId: releaseId,
        action: 'update',
        before: { status: 'requested' },
        after: { status: 'declined' },
        reason: dto.reason,
      });
    });
    return this.get(user, releaseId);
  }

  /**
   * Lifts the release lock of one run so its data can be corrected. The release itself stays as
   * signed (its snapshot and hash do not change); the next release with this run supersedes it.
   */
  async openCorrection(user: AuthUser, runId: string, dto: OpenCorrectionDto): Promise<{ runId: string; releaseNumber: number }> {
    return this.dataSource.transaction(async (manager) => {
      const { run, campaign } = await this.runAccess.require(user, runId, ['lead'], { manager, lock: true });
      if (campaign.status === 'archived') throw new ConflictException(ARCHIVED_READ_ONLY);
      if (!run.lockedReleaseId || run.lockedReleaseNumber === null) {
        throw new ConflictException(`Run “${run.name}” is not locked by a release, so there is nothing to open`);
      }
      const number = run.lockedReleaseNumber;
      await manager.query('UPDATE runs SET locked_release_id = NULL, locked_release_number = NULL, updated_at = now() WHERE id = $1', [runId]);
      await this.audit.record(manager, {
        campaignId: run.campaignId,
        actorId: user.id,
        entityType: 'run',
        entityId: runId,
        action: 'update',
        before: { lockedReleaseId: run.lockedReleaseId, lockedReleaseNumber: number },
        after: { lockedReleaseId: null, lockedReleaseNumber: null },
        reason: `Correction opened on release ${number}: ${dto.reason}`,
      });
      return { runId, releaseNumber: number };
    });
  }

  /** Why each run cannot be released yet; [] when all can. */
  private async problems(manager: EntityManager, runIds: readonly string[]): Promise<string[]> {
    const states = (await manager.query(
      `SELECT ru.id, ru.name,
              (SELECT count(*)::int FROM sheets s WHERE s.run_id = ru.id) AS sheets,
              array(SELECT s.name || CASE WHEN s.pass1_finished_at IS NULL AND s.pass2_finished_at IS NULL THEN ' (passes 1 and 2 unfinished)'
                                          WHEN s.pass1_finished_at IS NULL THEN ' (pass 1 unfinished)' ELSE ' (pass 2 unfinished)' END
                      FROM sheets s WHERE s.run_id = ru.id AND (s.pass1_finished_at IS NULL OR s.pass2_finished_at IS NULL)
                     ORDER BY s.name) AS unfinished,
              (SELECT count(*)::int
                 FROM sheets s
                 JOIN readings r1 ON r1.sheet_id = s.id AND r1.pass = 1
                 JOIN sheet_channels sc ON sc.sheet_id = s.id AND sc.channel_id = r1.channel_id
                 JOIN readings r2 ON r2.sheet_id = s.id AND r2.row_index = r1.row_index AND r2.channel_id = r1.channel_id AND r2.pass = 2
                 LEFT JOIN resolutions res ON res.sheet_id = s.id AND res.row_index = r1.row_index AND res.channel_id = r1.channel_id
                WHERE s.run_id = ru.id AND res.id IS NULL AND ${MISMATCH_SQL}) AS open_mismatches
         FROM runs ru WHERE ru.id = ANY($1::uuid[]) ORDER BY ru.name, ru.id`,
      [runIds],
    )) as RunState[];
    const problems: string[] = [];
    for (const s of states) {
      const parts: string[] = [];
      if (s.sheets === 0) parts.push('it has no sheet, so there are no readings to release');
      if (s.unfinished.length > 0) parts.push(`sheet${s.unfinished.length === 1 ? '' : 's'} ${s.unfinished.join(', ')}`);
      if (s.open_mismatches > 0) parts.push(`${s.open_mismatches} open mismatch${s.open_mismatches === 1 ? '' : 'es'} to resolve`);
      if (parts.length > 0) problems.push(`run “${s.name}”: ${parts.join('; ')}`);
    }
    return problems;
  }

  /**
   * Signs `row` inside the caller's transaction (campaign and release rows already locked): locks
   * the runs, refuses unfinished data, writes the snapshot while hashing it, numbers the release,
   * moves the run locks to it and records every step in the audit trail.
   */
  private async publish(manager: EntityManager, user: AuthUser, row: ReleaseRow, note: string | undefined): Promise<void> {
    const runs = (await manager.query(
      'SELECT id, name, locked_release_id, locked_release_number FROM runs WHERE campaign_id = $1 AND id = ANY($2::uuid[]) ORDER BY id FOR UPDATE',
      [row.campaign_id, row.run_ids],
    )) as Array<{ id: string; name: string; locked_release_id: string | null; locked_release_number: number | null }>;
    if (runs.length !== row.run_ids.length) throw new ConflictException(`${RUN_NOT_FOUND}: a run of this request no longer exists; create a new release`);
    // Saves and resolutions lock their sheet row: holding every sheet of these runs until commit
    // means none lands between the snapshot and the lock (they then see the lock and are refused).
    await manager.query('SELECT id FROM sheets WHERE run_id = ANY($1::uuid[]) ORDER BY id FOR UPDATE', [row.run_ids]);
    const problems = await this.problems(manager, row.run_ids);
    if (problems.length > 0) {
      throw new ConflictException(`The release cannot be signed yet: ${problems.join('; ')}`);
    }

    const runner = manager.queryRunner;
    if (!runner) throw new Error('publish needs a transaction');
    const key = snapshotKey(row.id);
    const temp = this.storage.tempPath('release');
    const hash = createHash('sha256');
    let cells = 0;
    let bytes = 0;
    async function* lines(): AsyncGenerator<string> {
      for await (const item of readSnapshot(runner as NonNullable<typeof runner>, row.campaign_id, row.run_ids)) {
        // A batch of cells becomes one chunk of lines (the same bytes as line by line).
        const chunk = Array.isArray(item) ? item.map(snapshotLine).join('') : snapshotLine(item);
        if (Array.isArray(item)) cells += item.length;
        hash.update(chunk);
        bytes += Buffer.byteLength(chunk);
        yield chunk;
      }
    }
    let stored = false;
    try {
      await pipeline(Readable.from(lines()), createWriteStream(temp, { mode: 0o600 }));
      await this.storage.put(key, temp, { contentType: 'application/x-ndjson' });
      stored = true;
      const contentHash = hash.digest('hex');
      const [{ next }] = (await manager.query('SELECT coalesce(max(number), 0) + 1 AS next FROM releases WHERE campaign_id = $1', [row.campaign_id])) as Array<{
        next: number;
      }>;
      const [previous] = (await manager.query(
        `SELECT id, number FROM releases WHERE campaign_id = $1 AND status = 'published' AND run_ids && $2::uuid[] ORDER BY number DESC LIMIT 1`,
        [row.campaign_id, row.run_ids],
      )) as Array<{ id: string; number: number }>;
      const finalNote = note === undefined ? row.note : note.trim();
      await manager.query(
        `UPDATE releases SET status = 'published', number = $2, signed_by = $3, signed_at = now(), note = $4, content_hash = $5,
                reading_count = $6, snapshot_key = $7, snapshot_bytes = $8, supersedes_id = $9, updated_at = now()
          WHERE id = $1`,
        [row.id, next, user.id, finalNote, contentHash, cells, key, bytes, previous?.id ?? null],
      );
      await manager.query('UPDATE runs SET locked_release_id = $1, locked_release_number = $2, updated_at = now() WHERE id = ANY($3::uuid[])', [
        row.id,
        next,
        row.run_ids,
      ]);
      await this.audit.recordMany(manager, [
        {
          campaignId: row.campaign_id,
          actorId: user.id,
          entityType: 'release',
          entityId: row.id,
          action: 'update',
          before: { status: row.status, note: row.note },
          after: { status: 'published', number: next, note: finalNote, contentHash, readingCount: cells, supersedesId: previous?.id ?? null },
          reason: previous ? `Release ${next} signed; supersedes release ${previous.number}` : `Release ${next} signed`,
        },
        ...runs.map((r) => ({
          campaignId: row.campaign_id,
          actorId: user.id,
          entityType: 'run' as const,
          entityId: r.id,
          action: 'update' as const,
          before: { lockedReleaseId: r.locked_release_id, lockedReleaseNumber: r.locked_release_number },
          after: { lockedReleaseId: row.id, lockedReleaseNumber: next },
          reason: `Locked by release ${next}`,
        })),
      ]);
    } catch (error) {
      // A snapshot whose release did not commit would only mislead.
      if (stored) await this.storage.deleteQuietly([key]);
      throw error;
    } finally {
      await rm(temp, { force: true });
    }
  }
}
