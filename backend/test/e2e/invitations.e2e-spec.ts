import type { Campaign, CampaignMember, Invitation, InvitationPreview, LoginResponse } from '@dialsheet/common';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { UserEntity } from '../../src/modules/users/user.entity';
import {
  bearer,
  createUser,
  login,
  PASSWORD,
  startTestApp,
  TEST_APP_URL,
  tokenFromMail,
  uniqueEmail,
  waitForMail,
  type TestApp,
} from '../helpers/test-app';

describe('invitations', () => {
  let t: TestApp;
  let adminToken: string;
  let lead: UserEntity;
  let leadToken: string;
  let campaign: Campaign;

  beforeAll(async () => {
    t = await startTestApp();
    const admin = await createUser(t.dataSource, { isAdmin: true });
    adminToken = await login(t.http, admin.email);
    lead = await createUser(t.dataSource, { name: 'Lou Lead' });
    leadToken = await login(t.http, lead.email);
    campaign = (
      await t.http.post('/api/campaigns').set(bearer(leadToken)).send({ name: 'Cross-flow core <rig B>' })
    ).body as Campaign;
  });
  afterAll(() => t.close());

  const invite = (email: string, roles: string[] = ['reader']) =>
    t.http.post(`/api/campaigns/${campaign.id}/invitations`).set(bearer(leadToken)).send({ email, roles });

  it('e-mails a link for a new person; the link creates the account, joins, signs in, and works once', async () => {
    const email = uniqueEmail('newcomer');
    const created = await invite(email.toUpperCase(), ['checker', 'reader']);
    expect(created.status).toBe(201);
    const invitation = created.body as Invitation;
    expect(invitation).toMatchObject({
      campaignId: campaign.id,
      email,
      roles: ['reader', 'checker'],
      status: 'pending',
      invitedBy: lead.id,
    });
    const days = (Date.parse(invitation.expiresAt) - Date.parse(invitation.createdAt)) / 86_400_000;
    expect(days).toBeCloseTo(7, 2);

    const mail = await waitForMail(t.http, adminToken, email, /invited you/);
    expect(mail.subject).toBe('Lou Lead invited you to the campaign "Cross-flow core <rig B>"');
    expect(mail.text).toContain(`${TEST_APP_URL}/invitations/accept?token=`);
    expect(mail.html).toContain('Cross-flow core &#60;rig B&#62;');
    const token = tokenFromMail(mail, '/invitations/accept');

    const preview = await t.http.get(`/api/invitations/${token}`);
    expect(preview.status).toBe(200);
    expect(preview.body as InvitationPreview).toEqual({
      campaignId: campaign.id,
      campaignName: 'Cross-flow core <rig B>',
      email,
      roles: ['reader', 'checker'],
      invitedByName: 'Lou Lead',
      expiresAt: invitation.expiresAt,
      accountExists: false,
    });

    const missing = await t.http.post('/api/invitations/accept').send({ token });
    expect(missing.status).toBe(400);
    expect(missing.body.message).toEqual([
      'name is required to create your account',
      'password must be at least 10 characters long',
    ]);

    const accepted = await t.http
      .post('/api/invitations/accept')
      .send({ token, name: 'Nia Newcomer', password: 'newcomer-password' });
    expect(accepted.status).toBe(200);
    const session = accepted.body as LoginResponse;
    expect(session.user).toMatchObject({ email, name: 'Nia Newcomer', isAdmin: false });
    const mine = await t.http.get(`/api/campaigns/${campaign.id}`).set(bearer(session.accessToken));
    expect(mine.status).toBe(200);
    expect(mine.body.myRoles).toEqual(['reader', 'checker']);
    await login(t.http, email, 'newcomer-password');

    const again = await t.http.post('/api/invitations/accept').send({ token, name: 'Mallory', password: 'another-password' });
    expect(again.status).toBe(404);
    expect(again.body.message).toBe('This invitation is invalid or has expired');
    expect((await t.http.get(`/api/invitations/${token}`)).status).toBe(404);

    const list = await t.http.get(`/api/campaigns/${campaign.id}/invitations`).set(bearer(leadToken));
    expect((list.body as Invitation[]).find((i) => i.id === invitation.id)?.status).toBe('accepted');
  });

  it('an existing account accepts with its own password', async () => {
    const existing = await createUser(t.dataSource, { name: 'Ed Existing' });
    expect((await invite(existing.email, ['engineer'])).status).toBe(201);
    const token = tokenFromMail(await waitForMail(t.http, adminToken, existing.email, /invited you/), '/invitations/accept');
    expect((await t.http.get(`/api/invitations/${token}`)).body.accountExists).toBe(true);

    const wrong = await t.http.post('/api/invitations/accept').send({ token, password: 'not-my-password' });
    expect(wrong.status).toBe(401);
    const ok = await t.http.post('/api/invitations/accept').send({ token, password: PASSWORD });
    expect(ok.status).toBe(200);
    expect((ok.body as LoginResponse).user.id).toBe(existing.id);
    const members = await t.http.get(`/api/campaigns/${campaign.id}/members`).set(bearer(leadToken));
    expect((members.body as CampaignMember[]).find((m) => m.userId === existing.id)?.roles).toEqual(['engineer']);
  });

  it('a revoked invitation no longer works, and only pending ones can be revoked', async () => {
    const email = uniqueEmail('revoked');
    const { body } = await invite(email);
    const token = tokenFromMail(await waitForMail(t.http, adminToken, email, /invited you/), '/invitations/accept');
    const path = `/api/campaigns/${campaign.id}/invitations/${(body as Invitation).id}`;
    expect((await t.http.delete(path).set(bearer(leadToken))).status).toBe(204);
    expect((await t.http.get(`/api/invitations/${token}`)).status).toBe(404);
    const accept = await t.http.post('/api/invitations/accept').send({ token, name: 'Late', password: 'late-password' });
    expect(accept.status).toBe(404);
    const twice = await t.http.delete(path).set(bearer(leadToken));
    expect(twice.status).toBe(409);
    expect(twice.body.message).toBe('This invitation is already revoked');
    expect((await t.http.delete(`/api/campaigns/${campaign.id}/invitations/not-an-id`).set(bearer(leadToken))).status).toBe(404);
  });

  it('an expired invitation no longer works', async () => {
    const email = uniqueEmail('expired');
    const { body } = await invite(email);
    const token = tokenFromMail(await waitForMail(t.http, adminToken, email, /invited you/), '/invitations/accept');
    await t.dataSource.query(`UPDATE invitations SET expires_at = now() - interval '1 second' WHERE id = $1`, [
      (body as Invitation).id,
    ]);
    expect((await t.http.get(`/api/invitations/${token}`)).status).toBe(404);
    expect((await t.http.post('/api/invitations/accept').send({ token, name: 'X', password: 'x-password-1' })).status).toBe(404);
    const list = await t.http.get(`/api/campaigns/${campaign.id}/invitations`).set(bearer(leadToken));
    expect((list.body as Invitation[]).find((i) => i.id === (body as Invitation).id)?.status).toBe('expired');
  });

  it('refuses duplicates, existing members and bad bodies', async () => {
    const email = uniqueEmail('dup');
    expect((await invite(email)).status).toBe(201);
    const dup = await invite(email);
    expect(dup.status).toBe(409);
    expect(dup.body.message).toMatch(/pending invitation/);
    expect((await invite(lead.email)).status).toBe(409);

    const badEmail = await invite('not-an-address');
    expect(badEmail.status).toBe(400);
    expect(badEmail.body.message).toEqual(['email must be a valid e-mail address']);
    const badRole = await invite(uniqueEmail('x'), ['boss']);
    expect(badRole.status).toBe(400);
    expect(badRole.body.message).toEqual([
      'each value in roles must be one of the following values: reader, checker, engineer, lead',
    ]);
  });

  it('stores a hash of the token, never the token', async () => {
    const email = uniqueEmail('hashed');
    await invite(email);
    const token = tokenFromMail(await waitForMail(t.http, adminToken, email, /invited you/), '/invitations/accept');
    const rows: Array<Record<string, unknown>> = await t.dataSource.query('SELECT * FROM invitations WHERE email = $1', [email]);
    expect(rows).toHaveLength(1);
    expect(rows[0].token_hash).toMatch(/^[0-9a-f]{64}$/);
    expect(JSON.stringify(rows)).not.toContain(token);
  });

  it('unknown tokens get the same 404', async () => {
    const res = await t.http.get('/api/invitations/this-is-not-a-token');
    expect(res.status).toBe(404);
    expect(res.body).toEqual({ statusCode: 404, error: 'Not Found', message: 'This invitation is invalid or has expired' });
  });
});
