import type { StabilityRule, StoredStabilityRule } from '@dialsheet/common';
import { validateStabilityRule } from '@dialsheet/common/dist/analysis';
import { BadRequestException, ConflictException, Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource, EntityManager } from 'typeorm';
import type { AuthUser } from '../../core/auth-user';
import { AuditService } from '../audit/audit.service';
import { asBadRequest, checkBaseVersion } from './analysis-input';
import { AnalysisSetupAccess } from './analysis-setup-access';
import { campaignStabilityRules, toStabilityRule, type StabilityRuleRow } from './calibration-records';
import { CreateStabilityRuleDto, UpdateStabilityRuleDto } from './dto/stability-rule.dto';

export const RULE_NOT_FOUND = 'Stability rule not found';
const RULE_SQL = 'SELECT * FROM stability_rules WHERE id = $1';

type RuleFields = StabilityRule & { channelId: string | null };

const FIELDS = ['name', 'windowSeconds', 'slopeLimitPerMinute', 'bandLimit', 'driftLimit', 'channelId'] as const;

@Injectable()
export class StabilityRulesService {
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly setup: AnalysisSetupAccess,
    private readonly audit: AuditService,
  ) {}

  async list(user: AuthUser, campaignId: string): Promise<StoredStabilityRule[]> {
    await this.setup.read(user, campaignId);
    return (await campaignStabilityRules(this.dataSource.manager, campaignId)).map(toStabilityRule);
  }

  async create(user: AuthUser, campaignId: string, dto: CreateStabilityRuleDto): Promise<StoredStabilityRule> {
    return this.dataSource.transaction(async (manager) => {
      await this.setup.writable(user, campaignId, manager);
      const fields: RuleFields = {
        name: dto.name,
        windowSeconds: dto.windowSeconds,
        slopeLimitPerMinute: dto.slopeLimitPerMinute ?? null,
        bandLimit: dto.bandLimit ?? null,
        driftLimit: dto.driftLimit ?? null,
        channelId: dto.channelId ?? null,
      };
      await this.check(manager, campaignId, fields, null);
      const [row] = (await manager.query(
        `INSERT INTO stability_rules (campaign_id, channel_id, name, window_seconds, slope_limit_per_minute, band_limit, drift_limit)
         VALUES ($1, $2, $3, $4, $5, $6, $7) RETURNING *`,
        [campaignId, fields.channelId, fields.name, fields.windowSeconds, fields.slopeLimitPerMinute, fields.bandLimit, fields.driftLimit],
      )) as StabilityRuleRow[];
      await this.audit.record(manager, {
        campaignId,
        actorId: user.id,
        entityType: 'stability-rule',
        entityId: row.id,
        action: 'create',
        after: { ...fields },
      });
      return toStabilityRule(row);
    });
  }

  async update(user: AuthUser, id: string, dto: UpdateStabilityRuleDto): Promise<StoredStabilityRule> {
    return this.dataSource.transaction(async (manager) => {
      const { row } = await this.setup.row<StabilityRuleRow>(user, manager, id, RULE_SQL, RULE_NOT_FOUND, 'write');
      const current = toStabilityRule(row);
      checkBaseVersion('stability rule', row, dto.baseVersion, current);
      const fields = {} as RuleFields;
      for (const key of FIELDS) (fields as unknown as Record<string, unknown>)[key] = dto[key] !== undefined ? dto[key] : current[key];
      await this.check(manager, row.campaign_id, fields, row);
      const before: Record<string, unknown> = {};
      const after: Record<string, unknown> = {};
      for (const key of FIELDS) {
        if (current[key] !== fields[key]) {
          before[key] = current[key];
          after[key] = fields[key];
        }
      }
      if (Object.keys(after).length === 0) return current;
      const [rows] = (await manager.query(
        `UPDATE stability_rules SET channel_id = $2, name = $3, window_seconds = $4, slope_limit_per_minute = $5, band_limit = $6,
                drift_limit = $7, version = version + 1, updated_at = now()
          WHERE id = $1 RETURNING *`,
        [row.id, fields.channelId, fields.name, fields.windowSeconds, fields.slopeLimitPerMinute ?? null, fields.bandLimit ?? null, fields.driftLimit ?? null],
      )) as [StabilityRuleRow[], number];
      await this.audit.record(manager, {
        campaignId: row.campaign_id,
        actorId: user.id,
        entityType: 'stability-rule',
        entityId: row.id,
        action: 'update',
        before,
        after,
        reason: dto.reason,
      });
      return toStabilityRule(rows[0]);
    });
  }

  async remove(user: AuthUser, id: string, baseVersion: number | undefined): Promise<void> {
    await this.dataSource.transaction(async (manager) => {
      const { row } = await this.setup.row<StabilityRuleRow>(user, manager, id, RULE_SQL, RULE_NOT_FOUND, 'write');
      if (baseVersion !== undefined) checkBaseVersion('stability rule', row, baseVersion, toStabilityRule(row));
      const [used] = (await manager.query('SELECT name FROM analyses WHERE rule_id = $1 ORDER BY created_at LIMIT 1', [row.id])) as Array<{ name: string }>;
      if (used) throw new ConflictException(`Analysis “${used.name}” is judged by this rule; choose another rule there or delete it first`);
      await manager.query('DELETE FROM stability_rules WHERE id = $1', [row.id]);
      await this.audit.record(manager, {
        campaignId: row.campaign_id,
        actorId: user.id,
        entityType: 'stability-rule',
        entityId: row.id,
        action: 'delete',
        before: toStabilityRule(row) as unknown as Record<string, unknown>,
      });
    });
  }

  private async check(manager: EntityManager, campaignId: string, fields: RuleFields, self: StabilityRuleRow | null): Promise<void> {
    asBadRequest(() => validateStabilityRule(fields));
    if (fields.channelId !== null) {
      const [channel] = (await manager.query('SELECT id FROM channels WHERE id = $1 AND campaign_id = $2', [fields.channelId, campaignId])) as unknown[];
      if (!channel) throw new BadRequestException('channelId must be a channel of this campaign (or null for any channel)');
    }
    const [clash] = (await manager.query('SELECT id FROM stability_rules WHERE campaign_id = $1 AND lower(name) = lower($2) AND id <> $3', [
      campaignId,
      fields.name,
      self?.id ?? '00000000-0000-0000-0000-000000000000',
    ])) as unknown[];
    if (clash) throw new ConflictException(`A stability rule named “${fields.name}” already exists in this campaign`);
  }
}
