import { Logger } from '@nestjs/common';
import { existsSync } from 'node:fs';
import { readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { DataSource } from 'typeorm';
import type { AuthUser } from '../../core/auth-user';
import { CampaignEntity } from '../../modules/campaigns/campaign.entity';
import { RecordingEntity } from '../../modules/recordings/recording.entity';
import { RecordingsService } from '../../modules/recordings/recordings.service';
import { RunEntity } from '../../modules/runs/run.entity';
import { RunsService } from '../../modules/runs/runs.service';
import { UserEntity } from '../../modules/users/user.entity';
import { DEMO_CAMPAIGN_NAME, DEMO_RUNS } from './demo-seed';

/** The part of scripts/demo/generate-videos.ts's truth file the seed needs. */
interface TruthFile {
  startMarkerVideoTime: number;
}

export interface DemoVideoResult {
  ingested: string[];
  skipped: string[];
}

export interface DemoVideoServices {
  dataSource: DataSource;
  recordings: RecordingsService;
  runs: RunsService;
}

/**
 * Gives each demo run its generated video (run-<n>.mp4 beside run-<n>.truth.json) through the
 * same path as a browser upload: hashed, type-checked, stored, queued for processing. The sync
 * mark is the start marker the truth file names (test time 0). Runs that already have a
 * recording are left alone, so this runs once per database.
 */
export async function ingestDemoVideos(dir: string, services: DemoVideoServices): Promise<DemoVideoResult> {
  const logger = new Logger('seed');
  const { dataSource, recordings, runs } = services;
  const result: DemoVideoResult = { ingested: [], skipped: [] };
  const campaign = await dataSource.getRepository(CampaignEntity).findOne({ where: { name: DEMO_CAMPAIGN_NAME }, order: { createdAt: 'ASC' } });
  const lead = await dataSource.getRepository(UserEntity).findOneBy({ email: 'lead@demo.test' });
  if (!campaign || !lead) throw new Error('seed the demo campaign before its videos');
  // The seed acts as the demo lead, with the lead's rights and name in the audit trail.
  const actor: AuthUser = { id: lead.id, email: lead.email, name: lead.name, isAdmin: lead.isAdmin, jti: 'demo-seed', exp: 0 };

  for (const demo of DEMO_RUNS) {
    const video = join(dir, `run-${demo.video}.mp4`);
    const truthPath = join(dir, `run-${demo.video}.truth.json`);
    const run = await dataSource.getRepository(RunEntity).findOneBy({ campaignId: campaign.id, name: demo.name });
    if (!run || !existsSync(video) || !existsSync(truthPath)) {
      result.skipped.push(demo.name);
      continue;
    }
    if (await dataSource.getRepository(RecordingEntity).existsBy({ runId: run.id })) {
      result.skipped.push(demo.name);
      continue;
    }
    const truth = JSON.parse(await readFile(truthPath, 'utf8')) as TruthFile;
    if (typeof truth.startMarkerVideoTime !== 'number' || !Number.isFinite(truth.startMarkerVideoTime)) {
      throw new Error(`${truthPath} has no startMarkerVideoTime`);
    }
    await recordings.ingestLocalFile(actor, run.id, video);
    await runs.setSync(actor, run.id, {
      first: { videoTime: truth.startMarkerVideoTime, testTime: 0 },
      reason: 'Start marker of the generated demo video',
    });
    logger.log(`${demo.name}: run-${demo.video}.mp4 stored and queued for processing`);
    result.ingested.push(demo.name);
  }
  return result;
}
