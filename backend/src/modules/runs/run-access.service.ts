import { refuseIfLocked } from './run-lock';
import type { CampaignRole } from '@dialsheet/common';
import { ConflictException, Injectable, NotFoundException } from '@nestjs/common';
import { InjectRepository } from '@nestjs/typeorm';
import { isUUID } from 'class-validator';
import { EntityManager, Repository } from 'typeorm';
import type { AuthUser } from '../../core/auth-user';
import { CampaignAccessService, type CampaignAccess } from '../campaigns/campaign-access.service';
import { ARCHIVED_READ_ONLY } from '../campaigns/campaigns.service';
import { RunEntity } from './run.entity';

export const RUN_NOT_FOUND = 'Run not found';
/** Who may change runs, recordings and sync marks. */
export const RUN_WRITERS: readonly CampaignRole[] = ['lead', 'engineer'];

export interface RunAccess extends CampaignAccess {
  run: RunEntity;
}

export interface RunAccessOptions {
  manager?: EntityManager;
  /** Lock the run row until the transaction ends (needs `manager`). */
  lock?: boolean;
  /** Refuse when the campaign is archived (every change does). */
  writable?: boolean;
}

/**
 * Finds a run and checks the caller's role in its campaign through CampaignAccessService. A run
 * in a campaign the caller does not belong to is "not found", like an unknown id.
 */
@Injectable()
export class RunAccessService {
  constructor(
    @InjectRepository(RunEntity) private readonly runs: Repository<RunEntity>,
    private readonly access: CampaignAccessService,
  ) {}

  async require(user: AuthUser, runId: string, roles: readonly CampaignRole[] = [], options: RunAccessOptions = {}): Promise<RunAccess> {
    if (!isUUID(runId)) throw new NotFoundException(RUN_NOT_FOUND);
    const repo = options.manager?.getRepository(RunEntity) ?? this.runs;
    const found = await repo.findOneBy({ id: runId });
    if (!found) throw new NotFoundException(RUN_NOT_FOUND);
    let access: CampaignAccess;
    try {
      access = await this.access.require(user, found.campaignId, roles, { manager: options.manager });
    } catch (error) {
      if (error instanceof NotFoundException) throw new NotFoundException(RUN_NOT_FOUND);
      throw error;
    }
    if (options.writable && access.campaign.status === 'archived') throw new ConflictException(ARCHIVED_READ_ONLY);
    // Locked only after the role check, so a stranger cannot hold locks on other people's rows.
    const run =
      options.lock && options.manager
        ? await options.manager.getRepository(RunEntity).findOne({ where: { id: runId }, lock: { mode: 'pessimistic_write' } })
        : found;
    if (!run) throw new NotFoundException(RUN_NOT_FOUND);
    // Every change to a run, its recording, sync, regions or sheets asks for a writable run.
    if (options.writable) refuseIfLocked(run);
    return { ...access, run };
  }
}
