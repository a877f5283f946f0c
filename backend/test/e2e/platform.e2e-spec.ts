import type { CapturedMail } from '@dialsheet/common';
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DATABASE_UNAVAILABLE, RETRY_AFTER_SECONDS } from '../../src/core/filters/all-exceptions.filter';
import {
  bearer,
  createUser,
  login,
  scratchDir,
  startTestApp,
  testDatabaseUrl,
  uniqueEmail,
  waitForMail,
  type TestApp,
} from '../helpers/test-app';
import { TcpProxy } from '../helpers/tcp-proxy';

describe('platform behaviour', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await startTestApp();
  });
  afterAll(() => t.close());

  it('GET /api/health answers 200 without a token', async () => {
    const res = await t.http.get('/api/health');
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ status: 'ok', database: 'ok' });
  });

  it('unknown /api routes get a JSON 404, whatever the method', async () => {
    for (const [method, path] of [
      ['get', '/api/no-such-thing'],
      ['post', '/api/campaigns/x/y/z'],
      ['get', '/api'],
    ] as const) {
      const res = await t.http[method](path);
      expect(res.status, path).toBe(404);
      expect(res.headers['content-type']).toMatch(/application\/json/);
      expect(res.body).toEqual({ statusCode: 404, error: 'Not Found', message: `Cannot ${method.toUpperCase()} ${path}` });
    }
  });

  it('sends security headers with a CSP that allows only our own scripts', async () => {
    const res = await t.http.get('/api/health');
    const csp = res.headers['content-security-policy'] as string;
    expect(csp).toContain("default-src 'self'");
    expect(csp).toContain("script-src 'self'");
    expect(csp).not.toMatch(/script-src[^;]*unsafe-inline/);
    expect(csp).toContain("style-src 'self' 'unsafe-inline'");
    expect(csp).toContain("font-src 'self' data:");
    expect(csp).toContain("media-src 'self' blob:");
    expect(csp).toContain("frame-ancestors 'none'");
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    expect(res.headers['x-powered-by']).toBeUndefined();
  });

  it('serves the API description: Swagger UI and an OpenAPI document with every route tagged', async () => {
    const ui = await t.http.get('/api/docs').redirects(1);
    expect(ui.status).toBe(200);
    expect(ui.text).toContain('swagger-ui');
    const doc = await t.http.get('/api/docs-json');
    expect(doc.status).toBe(200);
    expect(doc.body.components.securitySchemes.bearer).toMatchObject({ type: 'http', scheme: 'bearer' });
    const paths = doc.body.paths as Record<string, Record<string, { tags?: string[]; security?: unknown[] }>>;
    const operations = Object.entries(paths).flatMap(([path, ops]) =>
      Object.entries(ops).map(([method, op]) => ({ route: `${method.toUpperCase()} ${path}`, op })),
    );
    const routes = operations.map((o) => o.route);
    for (const expected of [
      'GET /api/health',
      'POST /api/auth/login',
      'POST /api/auth/logout',
      'GET /api/auth/me',
      'PATCH /api/auth/me',
      'POST /api/auth/password',
      'POST /api/auth/password-reset',
      'POST /api/auth/password-reset/confirm',
      'GET /api/users',
      'PATCH /api/users/{id}',
      'GET /api/campaigns',
      'POST /api/campaigns',
      'GET /api/campaigns/{campaignId}',
      'PATCH /api/campaigns/{campaignId}',
      'POST /api/campaigns/{campaignId}/archive',
      'POST /api/campaigns/{campaignId}/restore',
      'GET /api/campaigns/{campaignId}/members',
      'PUT /api/campaigns/{campaignId}/members/{userId}',
      'DELETE /api/campaigns/{campaignId}/members/{userId}',
      'GET /api/campaigns/{campaignId}/invitations',
      'POST /api/campaigns/{campaignId}/invitations',
      'DELETE /api/campaigns/{campaignId}/invitations/{invitationId}',
      'GET /api/invitations/{token}',
      'POST /api/invitations/accept',
      'GET /api/campaigns/{campaignId}/audit',
      'GET /api/admin/mail',
      'GET /api/admin/mail/{id}',
    ]) {
      expect(routes).toContain(expected);
    }
    for (const { route, op } of operations) expect(op.tags?.length, route).toBeGreaterThan(0);
    const secured = operations.filter((o) => o.op.security?.length).map((o) => o.route);
    expect(secured).toContain('GET /api/campaigns');
    expect(secured).not.toContain('POST /api/auth/login');
  });

  it('every route needs a token except the few public ones', async () => {
    const PUBLIC = new Set([
      'GET /api/health',
      'POST /api/auth/login',
      'POST /api/auth/password-reset',
      'POST /api/auth/password-reset/confirm',
      'GET /api/invitations/{token}',
      'POST /api/invitations/accept',
      // Media for <video>/<img>: the signed query string is the authorisation (403 without it).
      'GET /api/media/{recordingId}/{kind}',
      'HEAD /api/media/{recordingId}/{kind}',
    ]);
    const doc = await t.http.get('/api/docs-json');
    const paths = doc.body.paths as Record<string, Record<string, unknown>>;
    let checked = 0;
    for (const [path, ops] of Object.entries(paths)) {
      for (const method of Object.keys(ops) as Array<'get' | 'head' | 'post' | 'put' | 'patch' | 'delete'>) {
        const route = `${method.toUpperCase()} ${path}`;
        const url = path.replace(/\{[^}]+\}/g, '00000000-0000-4000-8000-000000000000');
        const res = method === 'head' ? await t.http.head(url) : await t.http[method](url).send({});
        if (PUBLIC.has(route)) expect(res.status, route).not.toBe(401);
        else expect(res.status, route).toBe(401);
        checked += 1;
      }
    }
    expect(checked).toBeGreaterThanOrEqual(27);
  });

  describe('captured mail for administrators', () => {
    it('lists messages newest first and opens one by id', async () => {
      const admin = await createUser(t.dataSource, { isAdmin: true });
      const adminToken = await login(t.http, admin.email);
      const user = await createUser(t.dataSource);
      await t.http.post('/api/auth/password-reset').send({ email: user.email });
      const mail = await waitForMail(t.http, adminToken, user.email, /password/);
      expect(mail).toMatchObject({ to: [user.email], from: 'Dialsheet <no-reply@dialsheet.test>', html: expect.stringContaining('<html') });
      expect(Date.parse(mail.receivedAt)).not.toBeNaN();

      const one = await t.http.get(`/api/admin/mail/${mail.id}`).set(bearer(adminToken));
      expect(one.status).toBe(200);
      expect(one.body).toEqual(mail);
      const list = (await t.http.get('/api/admin/mail').set(bearer(adminToken))).body as CapturedMail[];
      const times = list.map((m) => m.receivedAt);
      expect([...times].sort().reverse()).toEqual(times);

      for (const id of ['00000000-0000-4000-8000-000000000000', '..%2F..%2Fjwt-secret']) {
        const res = await t.http.get(`/api/admin/mail/${id}`).set(bearer(adminToken));
        expect(res.status).toBe(404);
        expect(res.body.message).toBe('No captured message with this id');
      }
    });
  });
});

describe('an empty mailbox', () => {
  it('is an empty list when the catcher directory does not exist', async () => {
    const dir = scratchDir('no-mail');
    const t = await startTestApp({ overrides: { mailCatcherDir: join(dir, 'missing') } });
    try {
      const admin = await createUser(t.dataSource, { isAdmin: true, email: uniqueEmail('mailless') });
      const res = await t.http.get('/api/admin/mail').set(bearer(await login(t.http, admin.email)));
      expect(res.status).toBe(200);
      expect(res.body).toEqual([]);
    } finally {
      await t.close();
    }
  });
});

describe('when the database goes away', () => {
  let proxy: TcpProxy;
  let t: TestApp;

  beforeAll(async () => {
    const url = new URL(testDatabaseUrl());
    proxy = new TcpProxy(url.hostname, Number(url.port || 5432));
    const port = await proxy.start();
    url.hostname = '127.0.0.1';
    url.port = String(port);
    t = await startTestApp({ env: { DATABASE_URL: url.toString() } });
  });
  afterAll(async () => {
    await proxy.restore().catch(() => undefined);
    await t.close();
    await proxy.cut();
  });

  it('health and other routes answer 503 (with Retry-After, without details), and both recover', async () => {
    const user = await createUser(t.dataSource);
    const token = await login(t.http, user.email);
    expect((await t.http.get('/api/health')).status).toBe(200);

    await proxy.cut();
    const started = Date.now();
    const health = await t.http.get('/api/health');
    expect(health.status).toBe(503);
    expect(health.body).toEqual({ status: 'degraded', database: 'unreachable' });
    expect(Date.now() - started).toBeLessThan(4000);

    const failed = await t.http.get('/api/auth/me').set(bearer(token));
    expect(failed.status).toBe(503);
    expect(failed.headers['retry-after']).toBe(String(RETRY_AFTER_SECONDS));
    expect(failed.body).toEqual({ statusCode: 503, error: 'Service Unavailable', message: DATABASE_UNAVAILABLE });
    expect(failed.text).not.toMatch(/ECONNREFUSED|at \w+ \(|node_modules|\.ts:\d+/);

    await proxy.restore();
    let status = 0;
    for (let i = 0; i < 20 && status !== 200; i += 1) {
      status = (await t.http.get('/api/health')).status;
      if (status !== 200) await new Promise((r) => setTimeout(r, 100));
    }
    expect(status).toBe(200);
    expect((await t.http.get('/api/auth/me').set(bearer(token))).status).toBe(200);
  });
});

describe('serving the web app', () => {
  let t: TestApp;
  beforeAll(async () => {
    const dist = scratchDir('spa');
    mkdirSync(join(dist, 'assets'));
    writeFileSync(join(dist, 'index.html'), '<!doctype html><html><body><div id="root">dialsheet-spa</div></body></html>');
    writeFileSync(join(dist, 'assets', 'app.js'), 'console.log("dialsheet");');
    t = await startTestApp({ overrides: { frontendDir: dist } });
  });
  afterAll(() => t.close());

  it('serves files and falls back to index.html for app paths', async () => {
    for (const path of ['/', '/campaigns/3f1e/members', '/reset-password/confirm?token=abc', '/apiary']) {
      const res = await t.http.get(path);
      expect(res.status, path).toBe(200);
      expect(res.text, path).toContain('dialsheet-spa');
    }
    const js = await t.http.get('/assets/app.js');
    expect(js.status).toBe(200);
    expect(js.headers['content-type']).toMatch(/javascript/);
  });

  it('never answers /api paths with the web app', async () => {
    for (const path of ['/api/nothing-here', '/api/campaigns/x/nope', '/api']) {
      const res = await t.http.get(path);
      expect(res.status, path).toBe(404);
      expect(res.headers['content-type']).toMatch(/application\/json/);
      expect(res.text).not.toContain('dialsheet-spa');
    }
    expect((await t.http.get('/api/health')).body).toEqual({ status: 'ok', database: 'ok' });
  });
});
