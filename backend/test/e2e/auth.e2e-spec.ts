import type { AdminUser, LoginResponse, User } from '@dialsheet/common';
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

describe('auth and accounts', () => {
  let t: TestApp;
  let adminToken: string;
  let admin: UserEntity;

  beforeAll(async () => {
    t = await startTestApp();
    admin = await createUser(t.dataSource, { email: uniqueEmail('admin'), name: 'Ann Admin', isAdmin: true });
    adminToken = await login(t.http, admin.email);
  });
  afterAll(() => t.close());

  describe('POST /api/auth/login', () => {
    it('signs in with the right password, ignoring e-mail case', async () => {
      const user = await createUser(t.dataSource, { name: 'Sam Signer' });
      const res = await t.http.post('/api/auth/login').send({ email: user.email.toUpperCase(), password: PASSWORD });
      expect(res.status).toBe(200);
      const body = res.body as LoginResponse;
      expect(body.expiresIn).toBe(43200);
      expect(body.user).toEqual({
        id: user.id,
        email: user.email,
        name: 'Sam Signer',
        isAdmin: false,
        createdAt: user.createdAt.toISOString(),
      });
      expect(body.accessToken.split('.')).toHaveLength(3);
      expect(JSON.stringify(body)).not.toMatch(/passwordHash|\$2[aby]\$/);
    });

    it('answers 401 with the same message for a wrong password and an unknown e-mail', async () => {
      const user = await createUser(t.dataSource);
      const wrong = await t.http.post('/api/auth/login').send({ email: user.email, password: 'not-the-password' });
      const unknown = await t.http.post('/api/auth/login').send({ email: uniqueEmail('nobody'), password: PASSWORD });
      for (const res of [wrong, unknown]) {
        expect(res.status).toBe(401);
        expect(res.body).toEqual({ statusCode: 401, error: 'Unauthorized', message: 'E-mail or password is wrong' });
      }
    });

    it('answers 400 naming the missing and the unexpected fields', async () => {
      const res = await t.http.post('/api/auth/login').send({ email: 'x@example.test', role: 'admin' });
      expect(res.status).toBe(400);
      expect(res.body.error).toBe('Bad Request');
      expect(res.body.message).toEqual(
        expect.arrayContaining([expect.stringMatching(/^password /), 'property role should not exist']),
      );
    });

    it('answers 400 for a body that is not JSON', async () => {
      const res = await t.http.post('/api/auth/login').set('Content-Type', 'application/json').send('{"email": ');
      expect(res.status).toBe(400);
      expect(res.body).toEqual({ statusCode: 400, error: 'Bad Request', message: 'The request body is not valid JSON' });
    });
  });

  describe('bearer tokens', () => {
    it('refuses protected routes without a token, with a malformed one and with a forged one', async () => {
      const user = await createUser(t.dataSource);
      const token = await login(t.http, user.email);
      const [header, payload] = token.split('.');
      const forged = `${header}.${payload}.${Buffer.from('not the signature').toString('base64url')}`;
      for (const auth of [undefined, 'Bearer nonsense', `Bearer ${forged}`, `Basic ${token}`]) {
        const req = t.http.get('/api/auth/me');
        const res = await (auth ? req.set('Authorization', auth) : req);
        expect(res.status).toBe(401);
        expect(res.body).toMatchObject({ statusCode: 401, error: 'Unauthorized' });
      }
    });

    it('GET /api/auth/me returns the signed-in user', async () => {
      const user = await createUser(t.dataSource, { name: 'Mia Me' });
      const res = await t.http.get('/api/auth/me').set(bearer(await login(t.http, user.email)));
      expect(res.status).toBe(200);
      expect((res.body as User).email).toBe(user.email);
    });

    it('signing out revokes exactly that token', async () => {
      const user = await createUser(t.dataSource);
      const first = await login(t.http, user.email);
      const second = await login(t.http, user.email);
      expect((await t.http.post('/api/auth/logout').set(bearer(first))).status).toBe(204);
      const after = await t.http.get('/api/auth/me').set(bearer(first));
      expect(after.status).toBe(401);
      expect(after.body.message).toBe('Your session has ended. Sign in again.');
      expect((await t.http.get('/api/auth/me').set(bearer(second))).status).toBe(200);
      expect((await t.http.post('/api/auth/logout').set(bearer(first))).status).toBe(401);
    });
  });

  describe('profile and password', () => {
    it('PATCH /api/auth/me changes the name and validates it', async () => {
      const user = await createUser(t.dataSource, { name: 'Old Name' });
      const token = await login(t.http, user.email);
      const ok = await t.http.patch('/api/auth/me').set(bearer(token)).send({ name: '  New Name ' });
      expect(ok.status).toBe(200);
      expect(ok.body.name).toBe('New Name');
      const bad = await t.http.patch('/api/auth/me').set(bearer(token)).send({ name: '' });
      expect(bad.status).toBe(400);
      expect(bad.body.message).toEqual(['name should not be empty']);
      const stored = await t.dataSource.getRepository(UserEntity).findOneByOrFail({ id: user.id });
      expect(stored.name).toBe('New Name');
    });

    it('POST /api/auth/password checks the current password and ends older sessions', async () => {
      const user = await createUser(t.dataSource);
      const token = await login(t.http, user.email);
      const other = await login(t.http, user.email);

      const wrong = await t.http
        .post('/api/auth/password')
        .set(bearer(token))
        .send({ currentPassword: 'wrong-password', newPassword: 'a-brand-new-password' });
      expect(wrong.status).toBe(403);
      expect(wrong.body.message).toBe('The current password is wrong');

      const short = await t.http
        .post('/api/auth/password')
        .set(bearer(token))
        .send({ currentPassword: PASSWORD, newPassword: 'short' });
      expect(short.status).toBe(400);
      expect(short.body.message).toEqual(['newPassword must be at least 10 characters long']);

      const ok = await t.http
        .post('/api/auth/password')
        .set(bearer(token))
        .send({ currentPassword: PASSWORD, newPassword: 'a-brand-new-password' });
      expect(ok.status).toBe(204);
      expect((await t.http.get('/api/auth/me').set(bearer(token))).status).toBe(401);
      expect((await t.http.get('/api/auth/me').set(bearer(other))).status).toBe(401);
      expect((await t.http.post('/api/auth/login').send({ email: user.email, password: PASSWORD })).status).toBe(401);
      await login(t.http, user.email, 'a-brand-new-password');
    });
  });

  describe('password reset', () => {
    it('answers 202 for unknown addresses too, and sends nothing', async () => {
      const nobody = uniqueEmail('nobody');
      const res = await t.http.post('/api/auth/password-reset').send({ email: nobody });
      expect(res.status).toBe(202);
      await expect(waitForMail(t.http, adminToken, nobody, /password/, 500)).rejects.toThrow(/no mail/);
    });

    it('e-mails a link that works once; the old password and old sessions stop working', async () => {
      const user = await createUser(t.dataSource, { name: 'Rae Reset' });
      const oldToken = await login(t.http, user.email);
      expect((await t.http.post('/api/auth/password-reset').send({ email: user.email })).status).toBe(202);

      const mail = await waitForMail(t.http, adminToken, user.email, /new Dialsheet password/);
      expect(mail.text).toContain(`${TEST_APP_URL}/reset-password/confirm?token=`);
      expect(mail.html).toContain(`${TEST_APP_URL}/reset-password/confirm?token=`);
      const token = tokenFromMail(mail, '/reset-password/confirm');

      const short = await t.http.post('/api/auth/password-reset/confirm').send({ token, newPassword: 'short' });
      expect(short.status).toBe(400);
      expect(short.body.message).toEqual(['newPassword must be at least 10 characters long']);

      const ok = await t.http.post('/api/auth/password-reset/confirm').send({ token, newPassword: 'reset-password-ok' });
      expect(ok.status).toBe(204);

      const again = await t.http.post('/api/auth/password-reset/confirm').send({ token, newPassword: 'another-password' });
      expect(again.status).toBe(400);
      expect(again.body.message).toBe('This reset link is invalid or has expired');

      expect((await t.http.post('/api/auth/login').send({ email: user.email, password: PASSWORD })).status).toBe(401);
      expect((await t.http.get('/api/auth/me').set(bearer(oldToken))).status).toBe(401);
      await login(t.http, user.email, 'reset-password-ok');
    });

    it('refuses unknown and expired tokens', async () => {
      const unknown = await t.http
        .post('/api/auth/password-reset/confirm')
        .send({ token: 'made-up-token', newPassword: 'whatever-password' });
      expect(unknown.status).toBe(400);
      expect(unknown.body.message).toBe('This reset link is invalid or has expired');

      const user = await createUser(t.dataSource);
      await t.http.post('/api/auth/password-reset').send({ email: user.email });
      const mail = await waitForMail(t.http, adminToken, user.email, /password/);
      await t.dataSource.query(`UPDATE password_resets SET expires_at = now() - interval '1 minute' WHERE user_id = $1`, [
        user.id,
      ]);
      const expired = await t.http
        .post('/api/auth/password-reset/confirm')
        .send({ token: tokenFromMail(mail, '/reset-password/confirm'), newPassword: 'whatever-password' });
      expect(expired.status).toBe(400);
      await login(t.http, user.email);
    });

    it('stores only a hash of the reset token', async () => {
      const user = await createUser(t.dataSource);
      await t.http.post('/api/auth/password-reset').send({ email: user.email });
      const token = tokenFromMail(await waitForMail(t.http, adminToken, user.email, /password/), '/reset-password/confirm');
      const rows: Array<{ token_hash: string }> = await t.dataSource.query(
        'SELECT token_hash FROM password_resets WHERE user_id = $1',
        [user.id],
      );
      expect(rows).toHaveLength(1);
      expect(rows[0].token_hash).toMatch(/^[0-9a-f]{64}$/);
      expect(rows[0].token_hash).not.toContain(token);
    });
  });

  describe('account administration', () => {
    it('is refused to non-administrators', async () => {
      const user = await createUser(t.dataSource);
      const token = await login(t.http, user.email);
      const list = await t.http.get('/api/users').set(bearer(token));
      expect(list.status).toBe(403);
      expect(list.body.message).toBe('Only a platform administrator can do this');
      expect((await t.http.patch(`/api/users/${user.id}`).set(bearer(token)).send({ isAdmin: true })).status).toBe(403);
      expect((await t.http.get('/api/admin/mail').set(bearer(token))).status).toBe(403);
    });

    it('lists accounts with their disabled flag', async () => {
      const res = await t.http.get('/api/users').set(bearer(adminToken));
      expect(res.status).toBe(200);
      const me = (res.body as AdminUser[]).find((u) => u.id === admin.id);
      expect(me).toMatchObject({ email: admin.email, isAdmin: true, disabled: false });
    });

    it('disabling an account ends its sessions and blocks sign-in; enabling restores it', async () => {
      const user = await createUser(t.dataSource);
      const token = await login(t.http, user.email);
      const res = await t.http.patch(`/api/users/${user.id}`).set(bearer(adminToken)).send({ disabled: true });
      expect(res.status).toBe(200);
      expect(res.body).toMatchObject({ id: user.id, disabled: true });
      expect((await t.http.get('/api/auth/me').set(bearer(token))).status).toBe(401);
      const denied = await t.http.post('/api/auth/login').send({ email: user.email, password: PASSWORD });
      expect(denied.status).toBe(403);
      expect(denied.body.message).toBe('This account is disabled; ask a platform administrator');
      await t.http.patch(`/api/users/${user.id}`).set(bearer(adminToken)).send({ disabled: false });
      await login(t.http, user.email);
    });

    it('refuses to let administrators lock themselves out, and validates the body', async () => {
      for (const body of [{ disabled: true }, { isAdmin: false }]) {
        const res = await t.http.patch(`/api/users/${admin.id}`).set(bearer(adminToken)).send(body);
        expect(res.status).toBe(409);
      }
      const bad = await t.http.patch(`/api/users/${admin.id}`).set(bearer(adminToken)).send({ disabled: 'yes' });
      expect(bad.status).toBe(400);
      expect(bad.body.message).toEqual(['disabled must be a boolean value']);
      const missing = await t.http.patch('/api/users/not-a-uuid').set(bearer(adminToken)).send({ disabled: true });
      expect(missing.status).toBe(404);
    });
  });
});

describe('sign-in rate limit', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await startTestApp({ env: { THROTTLE_LOGIN_LIMIT: '3' } });
  });
  afterAll(() => t.close());

  it('answers 429 after too many attempts for one e-mail, and keeps others unaffected', async () => {
    const user = await createUser(t.dataSource);
    const statuses: number[] = [];
    for (let i = 0; i < 4; i += 1) {
      statuses.push((await t.http.post('/api/auth/login').send({ email: user.email, password: 'wrong-password' })).status);
    }
    expect(statuses).toEqual([401, 401, 401, 429]);
    const blocked = await t.http.post('/api/auth/login').send({ email: user.email, password: PASSWORD });
    expect(blocked.status).toBe(429);
    expect(blocked.body).toEqual({
      statusCode: 429,
      error: 'Too Many Requests',
      message: 'Too many attempts. Wait a minute and try again.',
    });
    const other = await createUser(t.dataSource);
    await login(t.http, other.email);
  });

  it('limits password-reset requests too', async () => {
    const email = uniqueEmail('flood');
    const statuses: number[] = [];
    for (let i = 0; i < 4; i += 1) {
      statuses.push((await t.http.post('/api/auth/password-reset').send({ email })).status);
    }
    expect(statuses).toEqual([202, 202, 202, 429]);
  });
});
