import type { CampaignRole } from '@dialsheet/common';
import { ConflictException, Injectable, NotFoundException } from '@nestjs/common';
import { isUUID } from 'class-validator';
import type { EntityManager } from 'typeorm';
import type { AuthUser } from '../../core/auth-user';
import { CampaignAccessService, type CampaignAccess } from '../campaigns/campaign-access.service';
import { ARCHIVED_READ_ONLY } from '../campaigns/campaigns.service';

/** Who sets up calibrations, derived channels, rules and analyses: the engineer's part. */
export const ANALYSIS_WRITERS: readonly CampaignRole[] = ['engineer'];

export interface ChannelRow {
  id: string;
  campaign_id: string;
  name: string;
  symbol: string;
  raw_unit: string;
}

/**
 * Access checks for rows that hang off a campaign (a channel, a derived channel, a rule, an
 * analysis): the row is found first, then its campaign is checked through CampaignAccessService,
 * and a row in a campaign the caller does not belong to is "not found" like an unknown id.
 */
@Injectable()
export class AnalysisSetupAccess {
  constructor(private readonly access: CampaignAccessService) {}

  /** Every change: engineer role, campaign row locked (serialises writers), not archived. */
  async writable(user: AuthUser, campaignId: string, manager: EntityManager): Promise<CampaignAccess> {
    const access = await this.access.require(user, campaignId, ANALYSIS_WRITERS, { manager, lock: true });
    if (access.campaign.status === 'archived') throw new ConflictException(ARCHIVED_READ_ONLY);
    return access;
  }

  read(user: AuthUser, campaignId: string, roles: readonly CampaignRole[] = []): Promise<CampaignAccess> {
    return this.access.require(user, campaignId, roles);
  }

  /** Loads a row by id with `sql` (first parameter the id, a campaign_id column), then checks access. */
  async row<T extends { campaign_id: string }>(
    user: AuthUser,
    manager: EntityManager,
    id: string,
    sql: string,
    notFound: string,
    mode: 'read' | 'write',
    roles: readonly CampaignRole[] = [],
  ): Promise<{ row: T; access: CampaignAccess }> {
    if (!isUUID(id)) throw new NotFoundException(notFound);
    const [found] = (await manager.query(sql, [id])) as T[];
    if (!found) throw new NotFoundException(notFound);
    let access: CampaignAccess;
    try {
      access = mode === 'write' ? await this.writable(user, found.campaign_id, manager) : await this.access.require(user, found.campaign_id, roles, { manager });
    } catch (error) {
      if (error instanceof NotFoundException) throw new NotFoundException(notFound);
      throw error;
    }
    if (mode === 'read') return { row: found, access };
    // Read again under the campaign lock: a concurrent writer may have changed or removed it.
    const [again] = (await manager.query(sql, [id])) as T[];
    if (!again) throw new NotFoundException(notFound);
    return { row: again, access };
  }
}

export const CHANNEL_SQL = 'SELECT id, campaign_id, name, symbol, raw_unit FROM channels WHERE id = $1';
