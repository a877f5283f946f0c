import type { AuditAction, AuditEntry, Page } from '@dialsheet/common';
import { Injectable } from '@nestjs/common';
import { InjectRepository } from '@nestjs/typeorm';
import { EntityManager, Repository, type QueryDeepPartialEntity } from 'typeorm';
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
    const rows = entries.map((entry) =>
      manager.create(AuditEntryEntity, {
        ...entry,
        before: entry.before ?? null,
        after: entry.after ?? null,
        reason: entry.reason?.trim() || null,
      }),
    );
    // TypeORM's partial type cannot express free-form jsonb values; the entity itself is complete.
    await manager.insert(AuditEntryEntity, rows as QueryDeepPartialEntity<AuditEntryEntity>[]);
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
