import type { CampaignRole } from '@dialsheet/common';
import { DataSource, EntityManager, type QueryDeepPartialEntity } from 'typeorm';
import { AuditEntryEntity } from '../../modules/audit/audit-entry.entity';
import { CampaignMemberEntity } from '../../modules/campaigns/campaign-member.entity';
import { CampaignEntity } from '../../modules/campaigns/campaign.entity';
import { campaignSnapshot } from '../../modules/campaigns/campaign.mapper';
import { RunEntity } from '../../modules/runs/run.entity';
import { runSnapshot } from '../../modules/runs/run.mapper';
import { PasswordHasher } from '../../modules/users/password-hasher.service';
import { UserEntity } from '../../modules/users/user.entity';

export const DEMO_CAMPAIGN_NAME = 'Heat-recovery core bench test';

export const DEMO_CAMPAIGN_DESCRIPTION =
  'Bench test of an air-to-air heat-recovery core: a warm and a cool air stream, four temperature ' +
  'displays (warm in/out, cool in/out), one thermal mass-flow meter read as 0–5 V on a panel ' +
  'voltmeter and moved between the two streams from run to run, and one dial pressure gauge. ' +
  'Caution: hot air ducts and heater surfaces; follow local codes and let qualified people set up the rig.';

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

export interface SeedResult {
  usersCreated: number;
  campaignCreated: boolean;
  membersAdded: number;
  runsCreated: number;
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
    const result: SeedResult = { usersCreated: 0, campaignCreated: false, membersAdded: 0, runsCreated: 0 };
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
      await audit(manager, campaign.id, lead.id, 'campaign', campaign.id, 'create', campaignSnapshot(campaign));
      result.campaignCreated = true;
    }
    for (const account of DEMO_ACCOUNTS) {
      if (!account.role) continue;
      const user = users.get(account.email) as UserEntity;
      const member = await manager.findOneBy(CampaignMemberEntity, { campaignId: campaign.id, userId: user.id });
      if (member) continue;
      await manager.save(manager.create(CampaignMemberEntity, { campaignId: campaign.id, userId: user.id, roles: [account.role] }));
      await audit(manager, campaign.id, lead.id, 'member', user.id, 'join', {
        email: user.email,
        name: user.name,
        roles: [account.role],
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
      await audit(manager, campaign.id, lead.id, 'run', run.id, 'create', runSnapshot(run));
      result.runsCreated += 1;
    }
    return result;
  });
}

async function audit(
  manager: EntityManager,
  campaignId: string,
  actorId: string,
  entityType: string,
  entityId: string,
  action: 'create' | 'join',
  after: Record<string, unknown>,
): Promise<void> {
  const row = manager.create(AuditEntryEntity, {
    campaignId,
    actorId,
    entityType,
    entityId,
    action,
    before: null,
    after,
    reason: 'Demo data',
  });
  // TypeORM's partial type cannot express free-form jsonb values; the entity itself is complete.
  await manager.insert(AuditEntryEntity, row as QueryDeepPartialEntity<AuditEntryEntity>);
}
