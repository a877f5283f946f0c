import 'reflect-metadata';
import { DataSource } from 'typeorm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildDataSourceOptions } from '../../src/database/data-source-options';
import { DEMO_ACCOUNTS, DEMO_CAMPAIGN_NAME, seedDemo } from '../../src/database/seed/demo-seed';
import { PasswordHasher } from '../../src/modules/users/password-hasher.service';
import { testDatabaseUrl } from '../helpers/test-app';

const DEMO_PASSWORD = 'dialsheet-demo';

async function counts(db: DataSource) {
  const [row] = await db.query(`
    SELECT (SELECT count(*) FROM users WHERE email LIKE '%@demo.test')::int AS users,
           (SELECT count(*) FROM campaigns WHERE name = $1)::int AS campaigns,
           (SELECT count(*) FROM campaign_members m JOIN campaigns c ON c.id = m.campaign_id WHERE c.name = $1)::int AS members,
           (SELECT count(*) FROM audit_entries a JOIN campaigns c ON c.id = a.campaign_id WHERE c.name = $1)::int AS audit`,
    [DEMO_CAMPAIGN_NAME]);
  return row as { users: number; campaigns: number; members: number; audit: number };
}

describe('demo seed', () => {
  let db: DataSource;
  beforeAll(async () => {
    db = await new DataSource(buildDataSourceOptions(testDatabaseUrl())).initialize();
  });
  afterAll(() => db.destroy());

  it('creates the five accounts and the campaign, and a second run changes nothing', async () => {
    const first = await seedDemo(db, DEMO_PASSWORD);
    expect(first).toEqual({ usersCreated: 5, campaignCreated: true, membersAdded: 4 });
    const after1 = await counts(db);
    expect(after1).toEqual({ users: 5, campaigns: 1, members: 4, audit: 5 });

    const hashes1 = await db.query(`SELECT email, password_hash, updated_at FROM users WHERE email LIKE '%@demo.test' ORDER BY email`);
    const second = await seedDemo(db, DEMO_PASSWORD);
    expect(second).toEqual({ usersCreated: 0, campaignCreated: false, membersAdded: 0 });
    expect(await counts(db)).toEqual(after1);
    expect(await db.query(`SELECT email, password_hash, updated_at FROM users WHERE email LIKE '%@demo.test' ORDER BY email`)).toEqual(hashes1);
  });

  it('gives each account its role; the administrator is not a member', async () => {
    const rows: Array<{ email: string; name: string; is_admin: boolean; roles: string[] | null; password_hash: string }> =
      await db.query(
        `SELECT u.email, u.name, u.is_admin, m.roles, u.password_hash
           FROM users u
           LEFT JOIN campaign_members m ON m.user_id = u.id
                AND m.campaign_id = (SELECT id FROM campaigns WHERE name = $1)
          WHERE u.email LIKE '%@demo.test'`,
        [DEMO_CAMPAIGN_NAME],
      );
    const byEmail = new Map(rows.map((r) => [r.email, r]));
    for (const account of DEMO_ACCOUNTS) {
      const row = byEmail.get(account.email);
      expect(row, account.email).toBeDefined();
      expect(row?.is_admin).toBe(account.isAdmin);
      expect(row?.roles).toEqual(account.role ? [account.role] : null);
      expect(await new PasswordHasher().verify(DEMO_PASSWORD, row?.password_hash ?? '')).toBe(true);
    }
    expect(byEmail.get('admin@demo.test')?.name).toBe('Ada Admin');
    const [campaign] = await db.query('SELECT description, status FROM campaigns WHERE name = $1', [DEMO_CAMPAIGN_NAME]);
    expect(campaign.status).toBe('active');
    expect(campaign.description).toMatch(/heat-recovery core/);
    expect(campaign.description).toMatch(/mass-flow meter/);
  });
});
