import type { CampaignRole } from '@dialsheet/common';
import { DataSource, EntityManager, type QueryDeepPartialEntity } from 'typeorm';
import { AuditEntryEntity } from '../../modules/audit/audit-entry.entity';
import type { AuditRecord } from '../../modules/audit/audit.service';
import { CampaignMemberEntity } from '../../modules/campaigns/campaign-member.entity';
import { CampaignEntity } from '../../modules/campaigns/campaign.entity';
import { campaignSnapshot } from '../../modules/campaigns/campaign.mapper';
import { channelProblems, type ChannelNumbers } from '../../modules/channels/channel-rules';
import { ChannelEntity } from '../../modules/channels/channel.entity';
import { channelSnapshot, normaliseAccuracy } from '../../modules/channels/channel.mapper';
import { RunEntity } from '../../modules/runs/run.entity';
import { runSnapshot } from '../../modules/runs/run.mapper';
import { PasswordHasher } from '../../modules/users/password-hasher.service';
import { UserEntity } from '../../modules/users/user.entity';
import { seedAnalysisSetup } from './demo-analysis';

export const DEMO_CAMPAIGN_NAME = 'Heat-recovery core bench test';

export const DEMO_CAMPAIGN_DESCRIPTION =
  'Bench test of an air-to-air heat-recovery core: a warm and a cool air stream, four temperature ' +
  'displays (warm in/out, cool in/out), one thermal mass-flow meter read as 0–5 V on a panel ' +
  'voltmeter and moved between the two streams from run to run, and one dial pressure gauge. ' +
  'Caution: hot air ducts and heater surfaces, and ducts under pressure (the gauge shows the warm ' +
  'stream’s static pressure): stop the fan and let the pressure fall before moving the flow meter or ' +
  'opening a fitting; follow local codes and let qualified people set up the rig.';

interface DemoAccount {
  email: string;
  name: string;
  isAdmin: boolean;
  role: CampaignRole | null;
}

/** The platform administrator is deliberately not a campaign member: admin rights are not campaign rights. */
export const DEMO_ACCOUNTS: readonly DemoAccount[] = [
  { email: 'admin@demo.test', name: 'Ada Admin', isAdmin: true, role: null },
  { email: 'lead@demo.test', name: 'Lena Lead', isAdmin: false, role: 'lead' },
  { email: 'engineer@demo.test', name: 'Evan Engineer', isAdmin: false, role: 'engineer' },
  { email: 'reader@demo.test', name: 'Rita Reader', isAdmin: false, role: 'reader' },
  { email: 'checker@demo.test', name: 'Chris Checker', isAdmin: false, role: 'checker' },
];

export interface DemoRun {
  /** Number of the generated video (run-<n>.mp4) that belongs to this run. */
  video: number;
  name: string;
  runDate: string;
  configuration: string;
  operator: string;
  notes: string;
}

/** The three runs of the demo bench test; the flow meter moves between the streams. */
export const DEMO_RUNS: readonly DemoRun[] = [
  {
    video: 1,
    name: 'Run 1 — meter on warm stream',
    runDate: '2025-03-14',
    configuration: 'Thermal mass-flow meter in the warm stream, downstream of the heater',
    operator: 'Evan Engineer',
    notes: 'Heater switched on at the start lamp. Panel filmed from the tripod at 30 fps.',
  },
  {
    video: 2,
    name: 'Run 2 — meter on cool stream',
    runDate: '2025-03-14',
    configuration: 'Thermal mass-flow meter moved to the cool stream inlet',
    operator: 'Evan Engineer',
    notes: 'Same fan settings as run 1; only the meter position changed.',
  },
  {
    video: 3,
    name: 'Run 3 — repeat, meter on warm stream',
    runDate: '2025-03-14',
    configuration: 'Thermal mass-flow meter back in the warm stream (repeat of run 1)',
    operator: 'Evan Engineer',
    notes: 'Repeat of run 1 to check reproducibility.',
  },
];

export interface DemoChannel extends ChannelNumbers {
  name: string;
  /** The display's key on the demo panel and in the truth files (T1–T4, V, P). */
  symbol: string;
  quantity: string;
  rawUnit: string;
}

/**
 * The six displays of the demo panel (scripts/demo/scenario.ts, DISPLAYS), in panel order, with
 * what such instruments commonly state on their data sheets (values from memory, typical of the
 * trade, not one maker's). Resolutions match what the generated video shows.
 * - T1–T4: a four-channel panel thermometer, −50…200 °C, ±(0.5 % of reading + 3 digits).
 * - V: a process panel meter on the 0–5 V output of a thermal mass-flow meter (0–5 V = 0–200
 *   standard L/min, as printed on the panel). The accuracy here is the panel meter's,
 *   ±(0.05 % of reading + 2 digits); the flow meter's own ±1.5 % of full scale belongs to the
 *   conversion to flow, not to reading the display.
 * - P: a dial gauge 0–10 kPa (the range printed on the panel), accuracy class 1.6, i.e. ±1.6 % of
 *   span (EN 837-1 accuracy classes), read to half a division.
 * Plausible limits are what this rig can show: air between a cool supply and a heater, the fans'
 * flows, the duct's few kPa.
 */
export const DEMO_CHANNELS: readonly DemoChannel[] = [
  ...(
    [
      ['T1', 'Warm stream inlet temperature'],
      ['T2', 'Warm stream outlet temperature'],
      ['T3', 'Cool stream inlet temperature'],
      ['T4', 'Cool stream outlet temperature'],
    ] as const
  ).map(([symbol, name]) => ({
    name,
    symbol,
    quantity: 'temperature',
    rawUnit: '°C',
    resolution: 0.1,
    rangeMin: -50,
    rangeMax: 200,
    fullScale: null,
    operatingMin: -50,
    operatingMax: 200,
    accuracy: { percentOfReading: 0.5, digits: 3 },
    plausibleMin: 5,
    plausibleMax: 60,
  })),
  {
    name: 'Flow meter signal',
    symbol: 'V',
    quantity: 'voltage',
    rawUnit: 'V',
    resolution: 0.001,
    rangeMin: 0,
    rangeMax: 5,
    fullScale: 5,
    // The flow meter's output span: outside it the meter is over range or its wiring is at fault.
    operatingMin: 0,
    operatingMax: 5,
    accuracy: { percentOfReading: 0.05, digits: 2 },
    // 40–180 standard L/min: the fans run at 110–130.
    plausibleMin: 1,
    plausibleMax: 4.5,
  },
  {
    name: 'Warm stream static pressure',
    symbol: 'P',
    quantity: 'pressure',
    rawUnit: 'kPa',
    resolution: 0.5,
    rangeMin: 0,
    rangeMax: 10,
    fullScale: 10,
    operatingMin: 0,
    operatingMax: 10,
    accuracy: { percentOfFullScale: 1.6 },
    plausibleMin: 2,
    plausibleMax: 9,
  },
];

export interface SeedResult {
  usersCreated: number;
  campaignCreated: boolean;
  membersAdded: number;
  runsCreated: number;
  channelsCreated: number;
  /** Calibration chains, stability rules and derived channels added (the engineer's set-up). */
  analysisSetupCreated: number;
}

/**
 * Creates the demo accounts and campaign if they are missing. Existing rows are left exactly as
 * they are (no password reset, no role change), so running it again changes nothing.
 */
export async function seedDemo(dataSource: DataSource, demoPassword: string): Promise<SeedResult> {
  const passwordHash = await new PasswordHasher().hash(demoPassword);
  return dataSource.transaction(async (manager) => {
    // Two seeds started at once would otherwise both see "missing" and race on the unique e-mail.
    await manager.query(`SELECT pg_advisory_xact_lock(hashtext('dialsheet-demo-seed'))`);
    const result: SeedResult = { usersCreated: 0, campaignCreated: false, membersAdded: 0, runsCreated: 0, channelsCreated: 0, analysisSetupCreated: 0 };
    const users = new Map<string, UserEntity>();
    for (const account of DEMO_ACCOUNTS) {
      let user = await manager.findOneBy(UserEntity, { email: account.email });
      if (!user) {
        user = await manager.save(
          manager.create(UserEntity, { email: account.email, name: account.name, isAdmin: account.isAdmin, passwordHash }),
        );
        result.usersCreated += 1;
      }
      users.set(account.email, user);
    }
    const lead = users.get('lead@demo.test') as UserEntity;
    let campaign = await manager.findOne(CampaignEntity, { where: { name: DEMO_CAMPAIGN_NAME }, order: { createdAt: 'ASC' } });
    if (!campaign) {
      campaign = await manager.save(
        manager.create(CampaignEntity, {
          name: DEMO_CAMPAIGN_NAME,
          description: DEMO_CAMPAIGN_DESCRIPTION,
          createdById: lead.id,
        }),
      );
      await demoAudit(manager, {
        campaignId: campaign.id,
        actorId: lead.id,
        entityType: 'campaign',
        entityId: campaign.id,
        action: 'create',
        after: campaignSnapshot(campaign),
      });
      result.campaignCreated = true;
    }
    for (const account of DEMO_ACCOUNTS) {
      if (!account.role) continue;
      const user = users.get(account.email) as UserEntity;
      const member = await manager.findOneBy(CampaignMemberEntity, { campaignId: campaign.id, userId: user.id });
      if (member) continue;
      await manager.save(manager.create(CampaignMemberEntity, { campaignId: campaign.id, userId: user.id, roles: [account.role] }));
      await demoAudit(manager, {
        campaignId: campaign.id,
        actorId: lead.id,
        entityType: 'member',
        entityId: user.id,
        action: 'join',
        after: { email: user.email, name: user.name, roles: [account.role] },
      });
      result.membersAdded += 1;
    }
    for (const demo of DEMO_RUNS) {
      const existing = await manager.findOneBy(RunEntity, { campaignId: campaign.id, name: demo.name });
      if (existing) continue;
      const run = await manager.save(
        manager.create(RunEntity, {
          campaignId: campaign.id,
          name: demo.name,
          runDate: demo.runDate,
          configuration: demo.configuration,
          operator: demo.operator,
          notes: demo.notes,
          sync: null,
          createdById: lead.id,
        }),
      );
      await demoAudit(manager, {
        campaignId: campaign.id,
        actorId: lead.id,
        entityType: 'run',
        entityId: run.id,
        action: 'create',
        after: runSnapshot(run),
      });
      result.runsCreated += 1;
    }
    result.channelsCreated = await seedChannels(manager, campaign, lead);
    const setup = await seedAnalysisSetup(manager, campaign, users.get('engineer@demo.test') as UserEntity);
    result.analysisSetupCreated = setup.calibrations + setup.rules + setup.derivedChannels;
    return result;
  });
}

/**
 * Adds the demo channels the campaign lacks (matched by name, as the campaign's unique index
 * does), after any channels already there, as ChannelsService.create would. An archived campaign
 * is read-only and gets none.
 */
async function seedChannels(manager: EntityManager, campaign: CampaignEntity, lead: UserEntity): Promise<number> {
  // The campaign row lock is the one channel writers take, so positions cannot race with the API.
  const locked = await manager.findOne(CampaignEntity, { where: { id: campaign.id }, lock: { mode: 'pessimistic_write' } });
  if (!locked || locked.status === 'archived') return 0;
  const existing = await manager.find(ChannelEntity, { where: { campaignId: campaign.id } });
  const names = new Set(existing.map((c) => c.name.toLowerCase()));
  let position = existing.reduce((next, c) => Math.max(next, c.position + 1), 0);
  let created = 0;
  for (const demo of DEMO_CHANNELS) {
    if (names.has(demo.name.toLowerCase())) continue;
    const problems = channelProblems(demo);
    if (problems.length > 0) throw new Error(`demo channel ${demo.symbol} is unsound: ${problems.join('; ')}`);
    const channel = await manager.save(
      manager.create(ChannelEntity, { campaignId: campaign.id, ...demo, accuracy: normaliseAccuracy(demo.accuracy), position }),
    );
    position += 1;
    await demoAudit(manager, {
      campaignId: campaign.id,
      actorId: lead.id,
      entityType: 'channel',
      entityId: channel.id,
      action: 'create',
      after: channelSnapshot(channel),
    });
    created += 1;
  }
  return created;
}

/** An audit row as AuditService.record writes it, with "Demo data" as the reason unless given. */
export async function demoAudit(manager: EntityManager, entry: AuditRecord): Promise<void> {
  const row = manager.create(AuditEntryEntity, {
    ...entry,
    before: entry.before ?? null,
    after: entry.after ?? null,
    reason: entry.reason ?? 'Demo data',
  });
  // TypeORM's partial type cannot express free-form jsonb values; the entity itself is complete.
  await manager.insert(AuditEntryEntity, row as QueryDeepPartialEntity<AuditEntryEntity>);
}
