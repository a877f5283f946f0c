import type { AuditEntry, Campaign, Invitation, Page } from '@dialsheet/common';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { UserEntity } from '../../src/modules/users/user.entity';
import {
  addMember,
  bearer,
  createUser,
  login,
  startTestApp,
  tokenFromMail,
  uniqueEmail,
  waitForMail,
  type TestApp,
} from '../helpers/test-app';

describe('audit trail', () => {
  let t: TestApp;
  let lead: UserEntity;
  let leadToken: string;
  let readerToken: string;
  let campaign: Campaign;
  let joinerId: string;

  const audit = async (query = '') => {
    const res = await t.http.get(`/api/campaigns/${campaign.id}/audit${query}`).set(bearer(readerToken));
    expect(res.status).toBe(200);
    return res.body as Page<AuditEntry>;
  };

  beforeAll(async () => {
    t = await startTestApp();
    const admin = await createUser(t.dataSource, { isAdmin: true });
    const adminToken = await login(t.http, admin.email);
    lead = await createUser(t.dataSource, { name: 'Lia Lead' });
    leadToken = await login(t.http, lead.email);
    const reader = await createUser(t.dataSource, { name: 'Rob Reader' });
    readerToken = await login(t.http, reader.email);

    // A scripted history: every kind of audited change once.
    campaign = (await t.http.post('/api/campaigns').set(bearer(leadToken)).send({ name: 'Audit rig' })).body as Campaign;
    const at = (path: string) => `/api/campaigns/${campaign.id}${path}`;
    await addMember(t.dataSource, campaign.id, reader.id, ['reader']);
    await t.http.patch(at('')).set(bearer(leadToken)).send({ name: 'Audit rig 2', reason: 'typo in name' });
    await t.http.post(at('/archive')).set(bearer(leadToken)).send({ reason: 'paused' });
    await t.http.post(at('/restore')).set(bearer(leadToken)).send({});
    await t.http.put(at(`/members/${reader.id}`)).set(bearer(leadToken)).send({ roles: ['reader', 'checker'] });
    const joinerEmail = uniqueEmail('joiner');
    await t.http.post(at('/invitations')).set(bearer(leadToken)).send({ email: joinerEmail, roles: ['engineer'] });
    const token = tokenFromMail(await waitForMail(t.http, adminToken, joinerEmail, /invited/), '/invitations/accept');
    const accepted = await t.http.post('/api/invitations/accept').send({ token, name: 'Jo Joiner', password: 'joiner-password' });
    joinerId = accepted.body.user.id;
    const revokedEmail = uniqueEmail('revoked');
    const inv = await t.http.post(at('/invitations')).set(bearer(leadToken)).send({ email: revokedEmail, roles: ['reader'] });
    await t.http.delete(at(`/invitations/${(inv.body as Invitation).id}`)).set(bearer(leadToken));
    await t.http.delete(at(`/members/${joinerId}`)).set(bearer(leadToken));
  });
  afterAll(() => t.close());

  it('records every change, newest first, with actor, before/after and reason', async () => {
    const page = await audit();
    const summary = page.items.map((e) => `${e.entityType}:${e.action}`).reverse();
    expect(summary).toEqual([
      'campaign:create',
      'member:join',
      'campaign:update',
      'campaign:archive',
      'campaign:restore',
      'member:update',
      'invitation:invite',
      'member:join',
      'invitation:update',
      'invitation:invite',
      'invitation:revoke',
      'member:delete',
    ]);
    expect(page.total).toBe(12);
    const seqs = page.items.map((e) => e.seq);
    expect([...seqs].sort((a, b) => b - a)).toEqual(seqs);

    const rename = page.items.find((e) => e.action === 'update' && e.entityType === 'campaign');
    expect(rename).toMatchObject({
      campaignId: campaign.id,
      actorId: lead.id,
      actorName: 'Lia Lead',
      entityId: campaign.id,
      before: { name: 'Audit rig' },
      after: { name: 'Audit rig 2' },
      reason: 'typo in name',
    });
    const roles = page.items.find((e) => e.entityType === 'member' && e.action === 'update');
    expect(roles).toMatchObject({ before: { roles: ['reader'] }, after: { roles: ['reader', 'checker'] } });
    const joined = page.items.find((e) => e.entityType === 'member' && e.action === 'join' && e.entityId === joinerId);
    expect(joined).toMatchObject({ actorId: joinerId, actorName: 'Jo Joiner', after: { roles: ['engineer'] } });
    expect(page.items.find((e) => e.action === 'archive')).toMatchObject({
      before: { status: 'active' },
      after: { status: 'archived' },
      reason: 'paused',
    });
    const removed = page.items.find((e) => e.action === 'delete');
    expect(removed).toMatchObject({ entityId: joinerId, before: { roles: ['engineer'], name: 'Jo Joiner' }, after: null });
  });

  it('filters by entity type, action, actor and time, and pages', async () => {
    expect((await audit('?entityType=invitation')).items.map((e) => e.action)).toEqual(['revoke', 'invite', 'update', 'invite']);
    expect((await audit('?action=join')).total).toBe(2);
    expect((await audit(`?actorId=${joinerId}`)).items.map((e) => `${e.entityType}:${e.action}`)).toEqual([
      'invitation:update',
      'member:join',
    ]);
    const all = await audit();
    const page2 = await audit('?limit=5&offset=5');
    expect(page2).toMatchObject({ total: 12, limit: 5, offset: 5 });
    expect(page2.items.map((e) => e.id)).toEqual(all.items.slice(5, 10).map((e) => e.id));
    const future = new Date(Date.now() + 3600_000).toISOString();
    expect((await audit(`?from=${encodeURIComponent(future)}`)).total).toBe(0);
    expect((await audit(`?to=${encodeURIComponent(future)}`)).total).toBe(12);
  });

  it('answers 400 naming the query field', async () => {
    const cases: Array<[string, string]> = [
      ['?limit=500', 'limit must not be greater than 200'],
      ['?limit=abc', 'limit must be an integer number'],
      ['?offset=-1', 'offset must not be less than 0'],
      ['?action=erase', 'action must be one of the following values'],
      ['?actorId=bob', 'actorId must be a UUID'],
      ['?from=yesterday', 'from must be a valid ISO 8601 date string'],
    ];
    for (const [query, message] of cases) {
      const res = await t.http.get(`/api/campaigns/${campaign.id}/audit${query}`).set(bearer(readerToken));
      expect(res.status, query).toBe(400);
      expect((res.body.message as string[]).join('\n')).toContain(message);
    }
  });

  it('a refused change leaves no audit row', async () => {
    const before = (await audit()).total;
    const demote = await t.http.put(`/api/campaigns/${campaign.id}/members/${lead.id}`).set(bearer(leadToken)).send({ roles: ['reader'] });
    expect(demote.status).toBe(409);
    expect((await t.http.patch(`/api/campaigns/${campaign.id}`).set(bearer(readerToken)).send({ name: 'x' })).status).toBe(403);
    expect((await audit()).total).toBe(before);
  });

  it('has no route that changes or deletes audit rows', async () => {
    const newest = (await audit('?limit=1')).items[0];
    const entryPath = `/api/campaigns/${campaign.id}/audit/${newest.id}`;
    for (const method of ['put', 'patch', 'delete'] as const) {
      for (const path of [`/api/campaigns/${campaign.id}/audit`, entryPath]) {
        const res = await t.http[method](path).set(bearer(leadToken)).send({ reason: 'tamper' });
        expect(res.status, `${method} ${path}`).toBe(404);
      }
    }
    const doc = await t.http.get('/api/docs-json');
    const auditPaths = Object.entries(doc.body.paths as Record<string, Record<string, unknown>>).filter(([p]) => p.includes('audit'));
    expect(auditPaths.length).toBeGreaterThan(0);
    for (const [, ops] of auditPaths) expect(Object.keys(ops)).toEqual(['get']);
    expect((await audit()).total).toBe(12);
  });
});
