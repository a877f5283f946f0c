import type { AuditAction, AuditEntry, Page } from '@dialsheet/common';
import { Injectable } from '@nestjs/common';
import { InjectRepository } from '@nestjs/typeorm';
import { EntityManager, Repository } from 'typeorm';
import type { AuthUser } from '../../core/auth-user';
import { CampaignAccessService } from '../campaigns/campaign-access.service';
import { AuditEntityType } from './audit-actions';
import { AuditEntryEntity } from './audit-entry.entity';
import { toAuditEntry } from './audit.mapper';
import { AuditQueryDto } from './dto/audit-query.dto';

export interface AuditRecord {
  campaignId: string | null;
  actorId: string | null;
  entityType: AuditEntityType;
  entityId: string;
  action: AuditAction;
  before?: Record<string, unknown> | null;
  after?: Record<string, unknown> | null;
  reason?: string | null;
}

@Injectable()
export class AuditService {
  constructor(
    @InjectRepository(AuditEntryEntity) private readonly entries: Repository<AuditEntryEntity>,
    private readonly access: CampaignAccessService,
  ) {}

  /**
   * Writes one row with the caller's transaction manager, so the change and its trail commit or
   * roll back together. There is deliberately no update or delete counterpart.
   */
  async record(manager: EntityManager, entry: AuditRecord): Promise<void> {
    await this.recordMany(manager, [entry]);
  }

  /** Several rows in one statement (a saved row of readings), in the order given. */
  async recordMany(manager: EntityManager, entries: readonly AuditRecord[]): Promise<void> {
    if (entries.length === 0) return;
    const insert = this.insertStatement(entries, 1);
    await manager.query(insert.sql, [insert.rows]);
  }

  /**
   * The INSERT of `entries` as SQL taking every row from the one jsonb parameter `$param`, so a
   * caller can put it in a WITH clause of its own statement and save a round trip (a saved row of
   * readings and its trail go to PostgreSQL as one statement). Rows get their seq in the given
   * order: the function scan yields the array's elements in order and the insert takes them as they
   * come (an ORDER BY would only add a sort node to every save).
   */
  insertStatement(entries: readonly AuditRecord[], param: number): { sql: string; rows: string } {
    const rows = entries.map((entry) => ({
      campaign_id: entry.campaignId,
      actor_id: entry.actorId,
      entity_type: entry.entityType,
      entity_id: entry.entityId,
      action: entry.action,
      before: entry.before ?? null,
      after: entry.after ?? null,
      reason: entry.reason?.trim() || null,
    }));
    return {
      sql: `INSERT INTO audit_entries (campaign_id, actor_id, entity_type, entity_id, action, before, after, reason)
            SELECT campaign_id, actor_id, entity_type, entity_id, action, before, after, reason
              FROM jsonb_to_recordset($${param}::jsonb)
                   AS x(campaign_id uuid, actor_id uuid, entity_type text, entity_id uuid, action text, before jsonb, after jsonb, reason text)`,
      rows: JSON.stringify(rows),
    };
  }

  async list(user: AuthUser, campaignId: string, query: AuditQueryDto): Promise<Page<AuditEntry>> {
    await this.access.require(user, campaignId);
    const limit = query.limit ?? 50;
    const offset = query.offset ?? 0;
    const qb = this.entries
      .createQueryBuilder('e')
      .leftJoinAndSelect('e.actor', 'actor')
      .where('e.campaign_id = :campaignId', { campaignId });
    if (query.entityType) qb.andWhere('e.entity_type = :entityType', { entityType: query.entityType });
    if (query.action) qb.andWhere('e.action = :action', { action: query.action });
    if (query.actorId) qb.andWhere('e.actor_id = :actorId', { actorId: query.actorId });
    if (query.from) qb.andWhere('e.created_at >= :from', { from: new Date(query.from) });
    if (query.to) qb.andWhere('e.created_at < :to', { to: new Date(query.to) });
    const [rows, total] = await qb.orderBy('e.seq', 'DESC').skip(offset).take(limit).getManyAndCount();
    return { items: rows.map(toAuditEntry), total, limit, offset };
  }
}
