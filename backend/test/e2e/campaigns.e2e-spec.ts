import type { Campaign, CampaignMember, CampaignRole } from '@dialsheet/common';
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { UserEntity } from '../../src/modules/users/user.entity';
import { addMember, bearer, createUser, login, startTestApp, type Http, type TestApp } from '../helpers/test-app';

type Actor = 'lead' | 'engineer' | 'reader' | 'checker' | 'outsider' | 'admin';
const MEMBERS: Array<Exclude<Actor, 'outsider' | 'admin'>> = ['lead', 'engineer', 'reader', 'checker'];
const NON_LEADS = ['engineer', 'reader', 'checker'] as const;
const STRANGERS = ['outsider', 'admin'] as const;

interface Fixture {
  campaign: Campaign;
  users: Record<Actor, UserEntity>;
  tokens: Record<Actor, string>;
}

/** A campaign with one member per role, a signed-in non-member and a platform admin (not a member). */
async function fixture(t: TestApp): Promise<Fixture> {
  const users = {} as Record<Actor, UserEntity>;
  const tokens = {} as Record<Actor, string>;
  for (const actor of [...MEMBERS, ...STRANGERS]) {
    users[actor] = await createUser(t.dataSource, { name: `Pat ${actor}`, isAdmin: actor === 'admin' });
    tokens[actor] = await login(t.http, users[actor].email);
  }
  const res = await t.http
    .post('/api/campaigns')
    .set(bearer(tokens.lead))
    .send({ name: 'Plate exchanger soak test', description: 'Two streams, four thermometers' });
  expect(res.status).toBe(201);
  const campaign = res.body as Campaign;
  for (const role of NON_LEADS) await addMember(t.dataSource, campaign.id, users[role].id, [role]);
  return { campaign, users, tokens };
}

function call(http: Http, method: 'get' | 'patch' | 'post' | 'put' | 'delete', path: string, token?: string) {
  const req = http[method](path);
  return token ? req.set(bearer(token)) : req;
}

describe('campaigns', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await startTestApp();
  });
  afterAll(() => t.close());

  describe('create and list', () => {
    it('creates a campaign with the creator as its only lead', async () => {
      const user = await createUser(t.dataSource);
      const token = await login(t.http, user.email);
      const res = await t.http
        .post('/api/campaigns')
        .set(bearer(token))
        .send({ name: '  Counterflow core  ', decimalComma: true });
      expect(res.status).toBe(201);
      expect(res.body).toMatchObject({
        name: 'Counterflow core',
        description: '',
        decimalComma: true,
        status: 'active',
        myRoles: ['lead'],
        memberCount: 1,
      });
      const members = await t.http.get(`/api/campaigns/${res.body.id}/members`).set(bearer(token));
      expect(members.body).toEqual([
        { userId: user.id, email: user.email, name: user.name, roles: ['lead'], joinedAt: expect.any(String) },
      ]);
    });

    it('answers 400 naming the field for a bad body and saves nothing', async () => {
      const user = await createUser(t.dataSource);
      const token = await login(t.http, user.email);
      const cases: Array<[Record<string, unknown>, string]> = [
        [{}, 'name should not be empty'],
        [{ name: '   ' }, 'name should not be empty'],
        [{ name: 'x'.repeat(201) }, 'name must be shorter than or equal to 200 characters'],
        [{ name: 'ok', decimalComma: 'yes' }, 'decimalComma must be a boolean value'],
        [{ name: 'ok', owner: 'me' }, 'property owner should not exist'],
      ];
      for (const [body, message] of cases) {
        const res = await t.http.post('/api/campaigns').set(bearer(token)).send(body);
        expect(res.status, JSON.stringify(body)).toBe(400);
        expect(res.body.message).toContain(message);
      }
      expect((await t.http.get('/api/campaigns').set(bearer(token))).body).toEqual([]);
    });

    it('lists only the campaigns the caller belongs to, active by default', async () => {
      const f = await fixture(t);
      for (const actor of MEMBERS) {
        const res = await t.http.get('/api/campaigns').set(bearer(f.tokens[actor]));
        expect(res.status).toBe(200);
        expect((res.body as Campaign[]).map((c) => c.id)).toEqual([f.campaign.id]);
        expect((res.body as Campaign[])[0]).toMatchObject({ myRoles: [actor], memberCount: 4 });
      }
      for (const actor of STRANGERS) {
        expect((await t.http.get('/api/campaigns').set(bearer(f.tokens[actor]))).body).toEqual([]);
      }
      const bad = await t.http.get('/api/campaigns?status=deleted').set(bearer(f.tokens.lead));
      expect(bad.status).toBe(400);
      expect(bad.body.message).toEqual(['status must be one of the following values: active, archived']);
    });

    it('needs a token', async () => {
      expect((await t.http.get('/api/campaigns')).status).toBe(401);
      expect((await t.http.post('/api/campaigns').send({ name: 'x' })).status).toBe(401);
    });
  });

  describe('who may do what', () => {
    let f: Fixture;
    beforeEach(async () => {
      f = await fixture(t);
    });

    it('GET a campaign: every member; 404 for non-members and unknown ids; 401 without a token', async () => {
      const path = `/api/campaigns/${f.campaign.id}`;
      for (const actor of MEMBERS) {
        const res = await call(t.http, 'get', path, f.tokens[actor]);
        expect(res.status, actor).toBe(200);
        expect(res.body.myRoles).toEqual([actor]);
      }
      for (const actor of STRANGERS) {
        const res = await call(t.http, 'get', path, f.tokens[actor]);
        expect(res.status, actor).toBe(404);
        expect(res.body).toEqual({ statusCode: 404, error: 'Not Found', message: 'Campaign not found' });
      }
      for (const id of [randomUUID(), 'not-a-uuid']) {
        expect((await call(t.http, 'get', `/api/campaigns/${id}`, f.tokens.lead)).body.message).toBe('Campaign not found');
      }
      expect((await call(t.http, 'get', path)).status).toBe(401);
    });

    it('PATCH a campaign: lead only (403 other roles, 404 strangers)', async () => {
      const path = `/api/campaigns/${f.campaign.id}`;
      for (const actor of NON_LEADS) {
        const res = await call(t.http, 'patch', path, f.tokens[actor]).send({ name: 'Hijacked' });
        expect(res.status, actor).toBe(403);
        expect(res.body.message).toBe('This needs the Lead role in this campaign');
      }
      for (const actor of STRANGERS) {
        expect((await call(t.http, 'patch', path, f.tokens[actor]).send({ name: 'Hijacked' })).status).toBe(404);
      }
      expect((await call(t.http, 'patch', path).send({ name: 'Hijacked' })).status).toBe(401);
      const ok = await call(t.http, 'patch', path, f.tokens.lead).send({ name: 'Renamed', reason: 'clearer' });
      expect(ok.status).toBe(200);
      expect(ok.body).toMatchObject({ name: 'Renamed', memberCount: 4, myRoles: ['lead'] });
      const bad = await call(t.http, 'patch', path, f.tokens.lead).send({ name: '' });
      expect(bad.status).toBe(400);
      expect(bad.body.message).toEqual(['name should not be empty']);
      expect((await call(t.http, 'get', path, f.tokens.reader)).body.name).toBe('Renamed');
    });

    it('archive and restore: lead only; an archived campaign is read-only', async () => {
      const base = `/api/campaigns/${f.campaign.id}`;
      for (const action of ['archive', 'restore']) {
        for (const actor of NON_LEADS) {
          expect((await call(t.http, 'post', `${base}/${action}`, f.tokens[actor]).send({})).status).toBe(403);
        }
        for (const actor of STRANGERS) {
          expect((await call(t.http, 'post', `${base}/${action}`, f.tokens[actor]).send({})).status).toBe(404);
        }
      }
      const archived = await call(t.http, 'post', `${base}/archive`, f.tokens.lead).send({ reason: 'finished' });
      expect(archived.status).toBe(200);
      expect(archived.body.status).toBe('archived');
      expect((await call(t.http, 'post', `${base}/archive`, f.tokens.lead).send({})).status).toBe(409);
      const edit = await call(t.http, 'patch', base, f.tokens.lead).send({ name: 'Too late' });
      expect(edit.status).toBe(409);
      expect(edit.body.message).toBe('This campaign is archived and read-only; restore it first');
      expect((await call(t.http, 'put', `${base}/members/${f.users.reader.id}`, f.tokens.lead).send({ roles: ['checker'] })).status).toBe(409);

      const active = await call(t.http, 'get', '/api/campaigns', f.tokens.reader);
      expect((active.body as Campaign[]).map((c) => c.id)).not.toContain(f.campaign.id);
      const list = await call(t.http, 'get', '/api/campaigns?status=archived', f.tokens.reader);
      expect((list.body as Campaign[]).map((c) => c.id)).toContain(f.campaign.id);
      expect((await call(t.http, 'get', base, f.tokens.reader)).status).toBe(200);

      const restored = await call(t.http, 'post', `${base}/restore`, f.tokens.lead).send({});
      expect(restored.status).toBe(200);
      expect(restored.body.status).toBe('active');
      expect((await call(t.http, 'patch', base, f.tokens.lead).send({ name: 'Back again' })).status).toBe(200);
    });

    it('GET members: every member; 404 strangers', async () => {
      const path = `/api/campaigns/${f.campaign.id}/members`;
      for (const actor of MEMBERS) {
        const res = await call(t.http, 'get', path, f.tokens[actor]);
        expect(res.status).toBe(200);
        const byId = new Map((res.body as CampaignMember[]).map((m) => [m.userId, m.roles]));
        for (const role of MEMBERS) expect(byId.get(f.users[role].id)).toEqual([role]);
        expect(byId.has(f.users.admin.id)).toBe(false);
      }
      for (const actor of STRANGERS) expect((await call(t.http, 'get', path, f.tokens[actor])).status).toBe(404);
      expect((await call(t.http, 'get', path)).status).toBe(401);
    });

    it('PUT member roles: lead only, roles validated by name', async () => {
      const path = `/api/campaigns/${f.campaign.id}/members/${f.users.reader.id}`;
      for (const actor of NON_LEADS) {
        expect((await call(t.http, 'put', path, f.tokens[actor]).send({ roles: ['lead'] })).status).toBe(403);
      }
      for (const actor of STRANGERS) {
        expect((await call(t.http, 'put', path, f.tokens[actor]).send({ roles: ['lead'] })).status).toBe(404);
      }
      const bad: Array<[unknown, string]> = [
        [{ roles: [] }, 'roles should not be empty'],
        [{ roles: ['owner'] }, 'each value in roles must be one of the following values: reader, checker, engineer, lead'],
        [{ roles: ['reader', 'reader'] }, "All roles's elements must be unique"],
        [{}, 'roles must be an array'],
      ];
      for (const [body, message] of bad) {
        const res = await call(t.http, 'put', path, f.tokens.lead).send(body as object);
        expect(res.status).toBe(400);
        expect(res.body.message).toContain(message);
      }
      const ok = await call(t.http, 'put', path, f.tokens.lead).send({ roles: ['checker', 'reader'], reason: 'second pass' });
      expect(ok.status).toBe(200);
      expect(ok.body).toMatchObject({ userId: f.users.reader.id, roles: ['reader', 'checker'] });
      const unknown = await call(t.http, 'put', `/api/campaigns/${f.campaign.id}/members/${f.users.outsider.id}`, f.tokens.lead).send({
        roles: ['reader'],
      });
      expect(unknown.status).toBe(404);
    });

    it('a campaign always keeps a lead (409)', async () => {
      const leadPath = `/api/campaigns/${f.campaign.id}/members/${f.users.lead.id}`;
      const demote = await call(t.http, 'put', leadPath, f.tokens.lead).send({ roles: ['engineer'] });
      expect(demote.status).toBe(409);
      expect(demote.body.message).toMatch(/at least one lead/);
      expect((await call(t.http, 'delete', leadPath, f.tokens.lead)).status).toBe(409);

      const promote = `/api/campaigns/${f.campaign.id}/members/${f.users.engineer.id}`;
      expect((await call(t.http, 'put', promote, f.tokens.lead).send({ roles: ['engineer', 'lead'] })).status).toBe(200);
      expect((await call(t.http, 'put', leadPath, f.tokens.lead).send({ roles: ['reader'] })).status).toBe(200);
      expect((await call(t.http, 'get', `/api/campaigns/${f.campaign.id}`, f.tokens.lead)).body.myRoles).toEqual(['reader']);
      expect((await call(t.http, 'patch', `/api/campaigns/${f.campaign.id}`, f.tokens.lead).send({ name: 'x' })).status).toBe(403);
    });

    it('DELETE a member: lead only; the removed person loses access', async () => {
      const path = `/api/campaigns/${f.campaign.id}/members/${f.users.checker.id}`;
      for (const actor of NON_LEADS) expect((await call(t.http, 'delete', path, f.tokens[actor])).status).toBe(403);
      for (const actor of STRANGERS) expect((await call(t.http, 'delete', path, f.tokens[actor])).status).toBe(404);
      expect((await call(t.http, 'delete', path)).status).toBe(401);
      expect((await call(t.http, 'delete', path, f.tokens.lead)).status).toBe(204);
      expect((await call(t.http, 'get', `/api/campaigns/${f.campaign.id}`, f.tokens.checker)).status).toBe(404);
      expect((await call(t.http, 'delete', path, f.tokens.lead)).status).toBe(404);
    });

    it('invitations list and create: lead only', async () => {
      const path = `/api/campaigns/${f.campaign.id}/invitations`;
      for (const actor of NON_LEADS) {
        expect((await call(t.http, 'get', path, f.tokens[actor])).status).toBe(403);
        expect((await call(t.http, 'post', path, f.tokens[actor]).send({ email: 'a@b.test', roles: ['reader'] })).status).toBe(403);
      }
      for (const actor of STRANGERS) {
        expect((await call(t.http, 'get', path, f.tokens[actor])).status).toBe(404);
        expect((await call(t.http, 'post', path, f.tokens[actor]).send({ email: 'a@b.test', roles: ['reader'] })).status).toBe(404);
      }
      expect((await call(t.http, 'get', path, f.tokens.lead)).status).toBe(200);
    });

    it('audit trail: every member reads it; strangers get 404', async () => {
      const path = `/api/campaigns/${f.campaign.id}/audit`;
      for (const actor of MEMBERS) expect((await call(t.http, 'get', path, f.tokens[actor])).status).toBe(200);
      for (const actor of STRANGERS) expect((await call(t.http, 'get', path, f.tokens[actor])).status).toBe(404);
      expect((await call(t.http, 'get', path)).status).toBe(401);
    });
  });

  it('several roles in one campaign count together', async () => {
    const f = await fixture(t);
    const both = await createUser(t.dataSource);
    await addMember(t.dataSource, f.campaign.id, both.id, ['reader', 'lead'] as CampaignRole[]);
    const token = await login(t.http, both.email);
    const res = await t.http.patch(`/api/campaigns/${f.campaign.id}`).set(bearer(token)).send({ description: 'by a reader-lead' });
    expect(res.status).toBe(200);
    expect(res.body.myRoles).toEqual(['reader', 'lead']);
  });
});
