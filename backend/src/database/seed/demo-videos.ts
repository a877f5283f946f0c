import { toTestTime } from '@dialsheet/common';
import { Logger } from '@nestjs/common';
import { existsSync } from 'node:fs';
import { readFile } from 'node:fs/promises';
import { basename, join } from 'node:path';
import { DataSource, EntityManager } from 'typeorm';
import type { AuthUser } from '../../core/auth-user';
import { CampaignMemberEntity } from '../../modules/campaigns/campaign-member.entity';
import { CampaignEntity } from '../../modules/campaigns/campaign.entity';
import { regionProblems } from '../../modules/channels/channel-rules';
import { ChannelEntity } from '../../modules/channels/channel.entity';
import { DisplayRegionEntity } from '../../modules/channels/display-region.entity';
import { RecordingEntity } from '../../modules/recordings/recording.entity';
import { RecordingsService } from '../../modules/recordings/recordings.service';
import { runLock } from '../../modules/runs/run-lock';
import { RunEntity } from '../../modules/runs/run.entity';
import { RunsService } from '../../modules/runs/runs.service';
import { runLimitProblem, sheetProblems, type SheetPlan } from '../../modules/sheets/sheet-rules';
import { SheetChannelEntity } from '../../modules/sheets/sheet-channel.entity';
import { SheetEntity } from '../../modules/sheets/sheet.entity';
import { sheetSnapshot } from '../../modules/sheets/sheet.mapper';
import { UserEntity } from '../../modules/users/user.entity';
import { DEMO_CAMPAIGN_NAME, DEMO_CHANNELS, DEMO_RUNS, demoAudit } from './demo-seed';

/** A box as fractions (0–1) of the frame, as the truth file writes it. */
interface TruthRegion {
  x: number;
  y: number;
  w: number;
  h: number;
}

/** The part of scripts/demo/generate-videos.ts's truth file the seed needs. */
interface TruthFile {
  startMarkerVideoTime: number;
  /** Length of the video, seconds. */
  durationSec: number;
  /** Panel order; `region` (the display's digit window) since generator version 2. */
  displays?: Array<{ key: string; region?: TruthRegion }>;
}

/** The sheet each demo run gets, ready for the demo reader and checker to type. */
export const DEMO_SHEET = {
  name: 'Every 5 s, whole run',
  interval: 5,
  readerEmail: 'reader@demo.test',
  checkerEmail: 'checker@demo.test',
} as const;

export interface DemoVideoResult {
  /** Runs that got their video now. */
  ingested: string[];
  /** Runs that already had a recording, or whose files are not there. */
  skipped: string[];
  /** Runs whose display regions were set now. */
  regionsSet: string[];
  /** Runs that got the demo sheet now. */
  sheetsCreated: string[];
}

export interface DemoVideoServices {
  dataSource: DataSource;
  recordings: RecordingsService;
  runs: RunsService;
}

const logger = new Logger('seed');

/**
 * Gives each demo run its generated video (run-<n>.mp4 beside run-<n>.truth.json) through the
 * same path as a browser upload: hashed, type-checked, stored, queued for processing. The sync
 * mark is the start marker the truth file names (test time 0). Then, from the same truth file,
 * the run's display regions (the panel's digit windows) and one sheet assigned to the demo
 * reader and checker, so reading can start at once. Each step is skipped when already done (a
 * run with a recording, with any region, with the demo sheet), so this changes nothing the
 * second time.
 */
export async function ingestDemoVideos(dir: string, services: DemoVideoServices): Promise<DemoVideoResult> {
  const { dataSource, recordings, runs } = services;
  const result: DemoVideoResult = { ingested: [], skipped: [], regionsSet: [], sheetsCreated: [] };
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
    const truth = await readTruth(truthPath);
    if (await dataSource.getRepository(RecordingEntity).existsBy({ runId: run.id })) {
      result.skipped.push(demo.name);
    } else {
      await recordings.ingestLocalFile(actor, run.id, video);
      await runs.setSync(actor, run.id, {
        first: { videoTime: truth.startMarkerVideoTime, testTime: 0 },
        reason: 'Start marker of the generated demo video',
      });
      logger.log(`${demo.name}: run-${demo.video}.mp4 stored and queued for processing`);
      result.ingested.push(demo.name);
    }
    if (await setDemoRegions(dataSource, run.id, truth, truthPath, lead.id)) result.regionsSet.push(demo.name);
    if (await createDemoSheet(dataSource, run.id, truth, lead.id)) result.sheetsCreated.push(demo.name);
  }
  return result;
}

async function readTruth(truthPath: string): Promise<TruthFile> {
  const truth = JSON.parse(await readFile(truthPath, 'utf8')) as Partial<TruthFile>;
  if (typeof truth.startMarkerVideoTime !== 'number' || !Number.isFinite(truth.startMarkerVideoTime)) {
    throw new Error(`${truthPath} has no startMarkerVideoTime`);
  }
  if (typeof truth.durationSec !== 'number' || !(truth.durationSec > 0) || !Number.isFinite(truth.durationSec)) {
    throw new Error(`${truthPath} has no durationSec`);
  }
  return truth as TruthFile;
}

/**
 * Locks the run as the API's writers do and says why the seed must leave it alone, or null: a
 * run inside a release and an archived campaign are read-only.
 */
async function lockWritableRun(manager: EntityManager, runId: string): Promise<{ run: RunEntity; refusal: string | null }> {
  // Two seeds at once would both see "nothing there yet".
  await manager.query(`SELECT pg_advisory_xact_lock(hashtext('dialsheet-demo-seed'))`);
  const run = await manager.findOneOrFail(RunEntity, { where: { id: runId }, lock: { mode: 'pessimistic_write' } });
  const campaign = await manager.findOneByOrFail(CampaignEntity, { id: run.campaignId });
  if (campaign.status === 'archived') return { run, refusal: 'its campaign is archived' };
  const lock = runLock(run);
  if (lock) return { run, refusal: `it is locked by release ${lock.releaseNumber}` };
  return { run, refusal: null };
}

/** The demo channels by symbol (the panel's display keys), as the campaign holds them now. */
async function demoChannelsBySymbol(manager: EntityManager, campaignId: string): Promise<Map<string, ChannelEntity>> {
  const rows = await manager.find(ChannelEntity, { where: { campaignId } });
  const byName = new Map(rows.map((c) => [c.name.toLowerCase(), c]));
  const out = new Map<string, ChannelEntity>();
  for (const demo of DEMO_CHANNELS) {
    const channel = byName.get(demo.name.toLowerCase());
    if (channel) out.set(demo.symbol, channel);
  }
  return out;
}

/**
 * Gives a run without any display region one region per demo channel: the digit windows the
 * truth file lists. Written as DisplayRegionsService.replace does, audit entry included.
 */
async function setDemoRegions(dataSource: DataSource, runId: string, truth: TruthFile, truthPath: string, actorId: string): Promise<boolean> {
  const listed = (truth.displays ?? []).filter((d) => d.region);
  if (listed.length === 0) {
    logger.warn(`${basename(truthPath)} lists no display regions (made by an older generator); run scripts/demo/generate-videos.ts again to add them`);
    return false;
  }
  const problems = listed.flatMap((d) => {
    const r = d.region as TruthRegion;
    return regionProblems({ x: r.x, y: r.y, width: r.w, height: r.h }, `displays.${d.key}.region`);
  });
  if (problems.length > 0) throw new Error(`${truthPath}: ${problems.join('; ')}`);

  return dataSource.transaction(async (manager) => {
    const { run, refusal } = await lockWritableRun(manager, runId);
    if (refusal) {
      logger.warn(`${run.name}: display regions not set, ${refusal}`);
      return false;
    }
    if (await manager.existsBy(DisplayRegionEntity, { runId })) return false;
    const channels = await demoChannelsBySymbol(manager, run.campaignId);
    const rows = listed.flatMap((d) => {
      const channel = channels.get(d.key);
      if (!channel) return [];
      const r = d.region as TruthRegion;
      return [{ channel, box: { channelId: channel.id, x: r.x, y: r.y, width: r.w, height: r.h } }];
    });
    if (rows.length === 0) {
      logger.warn(`${run.name}: display regions not set, the campaign has none of the demo channels`);
      return false;
    }
    rows.sort((a, b) => a.channel.position - b.channel.position || a.channel.id.localeCompare(b.channel.id));
    await manager.insert(
      DisplayRegionEntity,
      rows.map((r) => ({ runId, ...r.box })),
    );
    await demoAudit(manager, {
      campaignId: run.campaignId,
      actorId,
      entityType: 'display-region',
      entityId: runId,
      action: 'update',
      before: { regions: [] },
      after: { regions: rows.map((r) => r.box) },
      reason: 'Demo data: the digit windows of the generated panel',
    });
    return true;
  });
}

/**
 * The demo sheet's end: the last whole interval strictly before the recording ends in test time,
 * by more than the microsecond frame times are kept to, so the last row falls on a frame the video has.
 */
export function demoSheetEnd(lastTestTime: number, interval: number): number {
  return Math.floor((lastTestTime - 1e-6) / interval) * interval;
}

/**
 * Plans the demo sheet on a run that lacks it: every 5 s from test time 0 to the end of the
 * recording, the demo channels in panel order, assigned to the demo reader and checker. The
 * recording may still be waiting for processing, so the run's length comes from the truth file;
 * the plan passes the same rules as POST /runs/:id/sheets, and the audit trail gets the entries
 * the create and assignment routes write. No e-mail is sent: the demo people know where to look.
 */
async function createDemoSheet(dataSource: DataSource, runId: string, truth: TruthFile, actorId: string): Promise<boolean> {
  return dataSource.transaction(async (manager) => {
    const { run, refusal } = await lockWritableRun(manager, runId);
    if (refusal) {
      logger.warn(`${run.name}: demo sheet not planned, ${refusal}`);
      return false;
    }
    if (await manager.existsBy(SheetEntity, { runId, name: DEMO_SHEET.name })) return false;
    if (!run.sync) {
      logger.warn(`${run.name}: demo sheet not planned, the run has no time sync`);
      return false;
    }
    const channels = await demoChannelsBySymbol(manager, run.campaignId);
    const missing = DEMO_CHANNELS.filter((c) => !channels.has(c.symbol)).map((c) => c.symbol);
    if (missing.length > 0) {
      logger.warn(`${run.name}: demo sheet not planned, the campaign lacks channel(s) ${missing.join(', ')}`);
      return false;
    }
    const plan: SheetPlan = {
      startTime: 0,
      endTime: demoSheetEnd(toTestTime(run.sync, truth.durationSec), DEMO_SHEET.interval),
      interval: DEMO_SHEET.interval,
      channelIds: DEMO_CHANNELS.map((c) => (channels.get(c.symbol) as ChannelEntity).id),
    };
    const problems = sheetProblems(plan);
    const limit = runLimitProblem(run.sync, truth.durationSec, plan.endTime);
    if (limit) problems.push(limit);
    if (problems.length > 0) {
      logger.warn(`${run.name}: demo sheet not planned: ${problems.join('; ')}`);
      return false;
    }
    const readerId = await memberWithRole(manager, run.campaignId, DEMO_SHEET.readerEmail, 'reader');
    const checkerId = await memberWithRole(manager, run.campaignId, DEMO_SHEET.checkerEmail, 'checker');

    const sheet = await manager.save(
      manager.create(SheetEntity, {
        campaignId: run.campaignId,
        runId: run.id,
        name: DEMO_SHEET.name,
        startTime: plan.startTime,
        endTime: plan.endTime,
        interval: plan.interval,
        readerId,
        checkerId,
      }),
    );
    await manager.insert(
      SheetChannelEntity,
      plan.channelIds.map((channelId, position) => ({ sheetId: sheet.id, channelId, position })),
    );
    await demoAudit(manager, {
      campaignId: run.campaignId,
      actorId,
      entityType: 'sheet',
      entityId: sheet.id,
      action: 'create',
      after: { ...sheetSnapshot(sheet, plan.channelIds), runId: run.id },
    });
    if (readerId || checkerId) {
      await demoAudit(manager, {
        campaignId: run.campaignId,
        actorId,
        entityType: 'sheet',
        entityId: sheet.id,
        action: 'update',
        before: { readerId: null, checkerId: null },
        after: { readerId, checkerId },
        reason: 'Demo data: sheet assignment',
      });
    }
    return true;
  });
}

/** The user's id when they hold the role in the campaign (the rule the assignment route applies), else null. */
async function memberWithRole(manager: EntityManager, campaignId: string, email: string, role: 'reader' | 'checker'): Promise<string | null> {
  const user = await manager.findOneBy(UserEntity, { email });
  const member = user ? await manager.findOneBy(CampaignMemberEntity, { campaignId, userId: user.id }) : null;
  if (user && member?.roles.includes(role)) return user.id;
  logger.warn(`${email} is not a ${role} of the demo campaign; the demo sheet is left without one`);
  return null;
}
