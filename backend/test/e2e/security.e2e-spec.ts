// Tokens, signed media links and path traversal (issue 7, part 4): every forged, expired or
// tampered credential is refused with 401/403 and never a 500, and nothing a client names (a
// media kind, an export format, a file name, an id in a path) reaches the file system.

import type { MediaKind, Recording } from '@dialsheet/common';
import { randomUUID } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { MEDIA_LINK_EXPIRED, MEDIA_LINK_INVALID, MediaUrlSigner } from '../../src/modules/recordings/media/media-url-signer';
import { SESSION_ENDED } from '../../src/modules/auth/jwt.strategy';
import { StorageService } from '../../src/storage/storage.service';
import { InvalidStorageKeyError } from '../../src/storage/storage-keys';
import { b64url, decodePayload, hs256, hs512, rawGet, rawRequest, rawUpload, TRAVERSALS } from '../helpers/matrix-attacks';
import { TestMedia } from '../helpers/media';
import { campaignFixture, createRun, filesUnder, listeningPort, upload, waitForStatus, type Fixture } from '../helpers/recordings';
import { bearer, createUser, login, scratchDir, startTestApp, type TestApp } from '../helpers/test-app';

/** The only two things a refused token is told (the guard's and the session check's). */
const REFUSALS = ['Sign in to continue', SESSION_ENDED];

describe('security', () => {
  let t: TestApp;
  let f: Fixture;
  let port: number;
  const media = new TestMedia();
  let rec1: Recording;
  let rec2: Recording;

  beforeAll(async () => {
    t = await startTestApp();
    port = await listeningPort(t);
    f = await campaignFixture(t, 'Security: cooling tower fan test');
    await media.clip();
    const [r1, r2] = await Promise.all([createRun(t.http, f.tokens.lead, f.campaign.id, 'Run 1'), createRun(t.http, f.tokens.lead, f.campaign.id, 'Run 2')]);
    expect((await upload(t.http, f.tokens.lead, r1.id, await media.unique(media.clip()))).status).toBe(201);
    expect((await upload(t.http, f.tokens.lead, r2.id, await media.unique(media.clip()))).status).toBe(201);
    rec1 = await waitForStatus(t.http, f.tokens.lead, r1.id, ['ready'], 120_000);
    rec2 = await waitForStatus(t.http, f.tokens.lead, r2.id, ['ready'], 120_000);
  }, 180_000);
  afterAll(async () => {
    await t?.close();
    media.remove();
  });

  /** Both a plain read and a campaign read, so the check is the guard's, not one route's. */
  async function expectRefused(authorization: string | undefined, label: string): Promise<void> {
    for (const path of ['/api/auth/me', `/api/campaigns/${f.campaign.id}`]) {
      const req = t.http.get(path);
      const res = authorization === undefined ? await req : await req.set('Authorization', authorization);
      expect(res.status, `${label} on ${path}: ${JSON.stringify(res.body)}`).toBe(401);
      expect(res.body.statusCode).toBe(401);
      expect(REFUSALS, `${label} on ${path}`).toContain(res.body.message);
      expect(JSON.stringify(res.body)).not.toMatch(/at \w+ \(|node_modules|jsonwebtoken|secret/i);
    }
  }

  describe('bearer tokens', () => {
    let token: string;
    let claims: Record<string, unknown>;
    const now = () => Math.floor(Date.now() / 1000);

    beforeAll(async () => {
      token = await login(t.http, f.users.reader.email);
      claims = decodePayload(token);
      expect(claims).toMatchObject({ sub: f.users.reader.id, ver: expect.any(Number), jti: expect.any(String), exp: expect.any(Number) });
    });

    it('a token made here with the server’s key and real claims works, so the refusals below are about the tampering', async () => {
      const made = hs256({ alg: 'HS256', typ: 'JWT' }, { ...claims, jti: randomUUID() }, t.config.jwtSecret);
      const res = await t.http.get('/api/auth/me').set(bearer(made));
      expect(res.status).toBe(200);
      expect(res.body.id).toBe(f.users.reader.id);
    });

    it('an expired token → 401', async () => {
      const expired = hs256({ alg: 'HS256', typ: 'JWT' }, { ...claims, jti: randomUUID(), iat: now() - 7200, exp: now() - 60 }, t.config.jwtSecret);
      await expectRefused(`Bearer ${expired}`, 'expired');
    });

    it('a payload changed under the original signature → 401 (another account, a later expiry, a newer version)', async () => {
      const [header, , signature] = token.split('.');
      for (const [label, changed] of [
        ['sub of another account', { ...claims, sub: f.users.lead.id }],
        ['exp a year later', { ...claims, exp: (claims.exp as number) + 365 * 86400 }],
        ['ver + 1', { ...claims, ver: (claims.ver as number) + 1 }],
        ['extra admin claim', { ...claims, isAdmin: true }],
      ] as const) {
        await expectRefused(`Bearer ${header}.${b64url(changed)}.${signature}`, label);
      }
    });

    it('alg "none" (any spelling), with or without a signature → 401', async () => {
      for (const alg of ['none', 'None', 'NONE', 'nOnE']) {
        const unsigned = `${b64url({ alg, typ: 'JWT' })}.${b64url({ ...claims, jti: randomUUID() })}`;
        await expectRefused(`Bearer ${unsigned}.`, `alg ${alg}`);
        await expectRefused(`Bearer ${unsigned}`, `alg ${alg}, two parts`);
        await expectRefused(`Bearer ${unsigned}.${token.split('.')[2]}`, `alg ${alg} with a real signature`);
      }
    });

    it('the wrong key, or the right key under another algorithm → 401', async () => {
      const fresh = () => ({ ...claims, jti: randomUUID() });
      await expectRefused(`Bearer ${hs256({ alg: 'HS256', typ: 'JWT' }, fresh(), 'not-the-server-secret-but-long-enough')}`, 'wrong key');
      await expectRefused(`Bearer ${hs256({ alg: 'HS256', typ: 'JWT' }, fresh(), '')}`, 'empty key');
      await expectRefused(`Bearer ${hs512({ alg: 'HS512', typ: 'JWT' }, fresh(), t.config.jwtSecret)}`, 'HS512 with the right key');
      // HS256 signature under a header that claims an asymmetric algorithm (key-confusion attempt).
      await expectRefused(`Bearer ${hs256({ alg: 'RS256', typ: 'JWT' }, fresh(), t.config.jwtSecret)}`, 'RS256 header');
    });

    it('signed with the right key but claims we never issue → 401, not a database error', async () => {
      const sign = (payload: object) => `Bearer ${hs256({ alg: 'HS256', typ: 'JWT' }, payload, t.config.jwtSecret)}`;
      for (const [label, payload] of [
        ['sub not a uuid', { ...claims, sub: "x' OR 1=1 --" }],
        ['sub of nobody', { ...claims, sub: randomUUID() }],
        ['jti not a uuid', { ...claims, jti: '../../etc/passwd' }],
        ['ver as text', { ...claims, ver: '1' }],
        ['no jti', { sub: claims.sub, ver: claims.ver, exp: claims.exp }],
        ['sub as an object', { ...claims, sub: { $ne: null } }],
        ['exp as text', { ...claims, exp: 'never' }],
      ] as const) {
        await expectRefused(sign(payload), label);
      }
      await expectRefused(`Bearer ${b64url({ alg: 'HS256' })}.${b64url('{not json')}.${hs256({}, {}, 'x').split('.')[2]}`, 'payload not JSON');
    });

    it('malformed Authorization headers → 401', async () => {
      for (const value of ['Bearer', 'Bearer ', 'Bearer a', 'Bearer a.b.c', 'Bearer ..', `Basic ${b64url('a:b')}`, `bearer${token}`, `Bearer ${token}x`, `Bearer ${'A'.repeat(4000)}`]) {
        await expectRefused(value, value.slice(0, 30));
      }
      await expectRefused(undefined, 'no header');
    });

    it('a token signed out, or from before a password change → 401', async () => {
      const user = await createUser(t.dataSource);
      const first = await login(t.http, user.email);
      const second = await login(t.http, user.email);
      expect((await t.http.post('/api/auth/logout').set(bearer(first))).status).toBe(204);
      await expectRefused(`Bearer ${first}`, 'signed out');
      expect((await t.http.get('/api/auth/me').set(bearer(second))).status).toBe(200);
    });
  });

  describe('signed media links', () => {
    let signer: MediaUrlSigner;
    let proxyUrl: string;
    let exp: string;
    let sig: string;
    const link = (recordingId: string, kind: string, query: string) => `/api/media/${recordingId}/${kind}?${query}`;

    beforeAll(async () => {
      signer = new MediaUrlSigner(t.config.jwtSecret);
      const res = await t.http.post(`/api/recordings/${rec1.id}/media-urls`).set(bearer(f.tokens.reader));
      expect(res.status).toBe(200);
      proxyUrl = res.body.proxyUrl as string;
      const q = new URL(proxyUrl, 'http://x').searchParams;
      exp = q.get('exp')!;
      sig = q.get('sig')!;
    });

    async function expectForbidden(path: string, message: string = MEDIA_LINK_INVALID): Promise<void> {
      for (const method of ['get', 'head'] as const) {
        const res = await t.http[method](path);
        expect(res.status, `${method} ${path}`).toBe(403);
        if (method === 'get') expect(res.body.message, path).toBe(message);
      }
    }

    it('the issued link opens the proxy (the control case)', async () => {
      const res = await t.http.get(proxyUrl);
      expect(res.status).toBe(200);
      expect(res.headers['content-type']).toBe('video/mp4');
    });

    it('an expired link → 403 "expired"; a later expiry under the old signature → 403 "not valid"', async () => {
      const past = Math.floor(Date.now() / 1000) - 5;
      await expectForbidden(signer.url(rec1.id, 'proxy', past), MEDIA_LINK_EXPIRED);
      await expectForbidden(link(rec1.id, 'proxy', `exp=${Number(exp) + 3600}&sig=${sig}`));
      await expectForbidden(link(rec1.id, 'proxy', `exp=${past}&sig=${sig}`));
    });

    it('a tampered signature → 403', async () => {
      const flipped = `${sig.slice(0, -1)}${sig.endsWith('A') ? 'B' : 'A'}`;
      for (const bad of [flipped, sig.toLowerCase() === sig ? sig.toUpperCase() : sig.toLowerCase(), `${sig}=`, sig.slice(1), '', 'x'.repeat(43), encodeURIComponent(`${sig}\u0000`)]) {
        await expectForbidden(link(rec1.id, 'proxy', `exp=${exp}&sig=${bad}`));
      }
      await expectForbidden(link(rec1.id, 'proxy', `exp=${exp}`));
      await expectForbidden(link(rec1.id, 'proxy', `sig=${sig}`));
      await expectForbidden(link(rec1.id, 'proxy', `exp=${exp}&exp=${exp}&sig=${sig}`));
      await expectForbidden(link(rec1.id, 'proxy', `exp=${exp}&sig=${sig}&sig=${sig}`));
      await expectForbidden(link(rec1.id, 'proxy', `exp=-1&sig=${sig}`));
      await expectForbidden(link(rec1.id, 'proxy', `exp=1e12&sig=${sig}`));
    });

    it('a link of one recording or kind does not open another → 403', async () => {
      await expectForbidden(link(rec2.id, 'proxy', `exp=${exp}&sig=${sig}`));
      await expectForbidden(link(rec1.id, 'original', `exp=${exp}&sig=${sig}`));
      await expectForbidden(link(rec1.id, 'poster', `exp=${exp}&sig=${sig}`));
      await expectForbidden(link(rec1.id.toUpperCase(), 'original', `exp=${exp}&sig=${sig}`));
      // The signature covers the id as issued: another spelling of it opens nothing else.
      const other = await t.http.get(link(rec2.id, 'proxy', `exp=${exp}&sig=${signer.sign(rec2.id, 'proxy', Number(exp))}`));
      expect(other.status).toBe(200);
    });

    it('a kind or id that names a path → 400, 403 or 404, even when signed with the real key', async () => {
      for (const bad of [...TRAVERSALS, 'proxy%00', 'proxy%2f..%2foriginal', '.', '..', 'proxy.mp4', 'original%20']) {
        const kind = rawGet(port, link(rec1.id, bad, `exp=${exp}&sig=${sig}`));
        const id = rawGet(port, link(bad, 'proxy', `exp=${exp}&sig=${sig}`));
        for (const [label, res] of [
          ['kind', await kind],
          ['id', await id],
        ] as const) {
          // 400: a segment that is not valid percent-encoding is refused before any route runs.
          expect([400, 403, 404], `${label} ${bad}: ${res.status} ${res.body.toString('utf8').slice(0, 200)}`).toContain(res.status);
        }
      }
      // With a valid signature for the odd text itself, the kind check and the id check still hold.
      const e = Math.floor(Date.now() / 1000) + 600;
      for (const bad of ['../../x', '../original', 'proxy/../../x']) {
        const asKind = await rawGet(port, link(rec1.id, encodeURIComponent(bad), `exp=${e}&sig=${signer.sign(rec1.id, bad as MediaKind, e)}`));
        expect(asKind.status, `kind ${bad}`).toBe(403);
        const asId = await rawGet(port, link(encodeURIComponent(bad), 'proxy', `exp=${e}&sig=${signer.sign(bad, 'proxy', e)}`));
        expect(asId.status, `id ${bad}`).toBe(404);
        expect(JSON.parse(asId.body.toString('utf8')).message).toBe('Recording not found');
      }
    });

    it('odd Range headers on a valid link → 200, 206 or 416, never 500', async () => {
      for (const range of ['bytes=999999999-', 'bytes=5-1', 'bytes=-0', 'bytes=abc', 'bytes=0-0,5-6', 'items=0-1', 'bytes=--1', `bytes=0-${'9'.repeat(30)}`]) {
        const res = await t.http.get(proxyUrl).set('Range', range);
        expect([200, 206, 416], `${range}: ${res.status}`).toContain(res.status);
      }
    });
  });

  describe('path traversal', () => {
    const marker = `dialsheet-traversal-${randomUUID().slice(0, 8)}`;

    /** Every place a naive join of a client's text to one of our folders would have written. */
    function landingSpots(): string[] {
      const storage = t.config.storageDir;
      const bases = [storage, join(storage, 'objects'), join(storage, 'tmp'), join(storage, 'objects', 'recordings'), join(storage, 'objects', 'recordings', rec1.id)];
      return bases.flatMap((base) => [resolve(base, marker), resolve(base, '..', marker), resolve(base, '..', '..', marker), resolve(base, '..', '..', '..', marker)]);
    }

    it('an export format that names a path → 400 with a message', async () => {
      const draft = `/api/campaigns/${f.campaign.id}/export`;
      expect((await t.http.get(`${draft}?format=csv-long`).set(bearer(f.tokens.lead))).status).toBe(200);
      for (const format of [...TRAVERSALS, 'csv-long%2f..%2fxlsx', 'csv-long%00', 'xlsx%0d%0aX-Injected:%201', '..', 'csv-long&format=xlsx', '']) {
        const res = await rawGet(port, `${draft}?format=${format}`, bearer(f.tokens.lead));
        expect(res.status, `format=${format}: ${res.body.toString('utf8').slice(0, 200)}`).toBe(400);
        expect(res.headers['x-injected']).toBeUndefined();
        expect(JSON.parse(res.body.toString('utf8')).message).toEqual([expect.stringMatching(/^format (is required|must be one of)/)]);
      }
    });

    it('a download name built from a campaign name stays one plain file name in the header', async () => {
      const lead = f.tokens.lead;
      const created = await t.http
        .post('/api/campaigns')
        .set(bearer(lead))
        .send({ name: `../../${marker}"; filename*=UTF-8''evil.sh ..\\..\\x %2e%2e%2f é` });
      expect(created.status, JSON.stringify(created.body)).toBe(201);
      const runRes = await createRun(t.http, lead, created.body.id as string, 'Only run');
      expect(runRes.id).toBeTruthy();
      for (const format of ['csv-long', 'csv-wide', 'xlsx', 'json']) {
        const res = await t.http.get(`/api/campaigns/${created.body.id}/export?format=${format}`).set(bearer(lead));
        expect(res.status).toBe(200);
        const disposition = res.headers['content-disposition'] as string;
        expect(disposition).toMatch(/^attachment; filename="dialsheet-[a-z0-9-]+-DRAFT-\d{8}-\d{4}\.(long\.csv|wide\.csv|xlsx|json)"$/);
      }
    });

    it('a multipart file name with folders is a label only: nothing lands outside storage', { timeout: 180_000 }, async () => {
      const bytes = readFileSync(await media.unique(media.clip()));
      const names = [`../../${marker}`, `..%2f..%2f${marker}`, `..\\..\\${marker}`, `/etc/${marker}`, `%2e%2e%2f%2e%2e%2f${marker}`, `....//....//${marker}`];
      const stored: string[] = [];
      const runs: string[] = [];
      for (const [i, filename] of names.entries()) {
        const run = await createRun(t.http, f.tokens.lead, f.campaign.id, `Upload name ${i}`);
        // New bytes each time, or the second upload is a duplicate of the first.
        const content = i === 0 ? bytes : readFileSync(await media.unique(media.clip()));
        const res = await rawUpload(port, `/api/runs/${run.id}/recording`, f.tokens.lead, filename, content);
        expect(res.status, `${filename}: ${res.body.toString('utf8').slice(0, 300)}`).toBe(201);
        const recording = JSON.parse(res.body.toString('utf8')) as Recording;
        expect(recording.originalName, filename).not.toMatch(/[/\\]/);
        expect(recording.originalName.endsWith(marker), filename).toBe(true);
        stored.push(recording.id);
        runs.push(run.id);
      }
      // Processing writes the proxy and poster: look only once it is over.
      await Promise.all(runs.map((id) => waitForStatus(t.http, f.tokens.lead, id, ['ready', 'failed'], 150_000)));
      for (const spot of landingSpots()) expect(existsSync(spot), spot).toBe(false);
      // Objects are only <recording id>/<our own file name>; the marker is in no path at all.
      const objects = filesUnder(join(t.config.storageDir, 'objects'));
      expect(objects.filter((p) => p.includes(marker))).toEqual([]);
      for (const p of objects) expect(p).toMatch(/^recordings\/[0-9a-f-]{36}\/(original|proxy\.mp4|poster\.jpg)$/);
      for (const id of stored) expect(objects).toContain(`recordings/${id}/original`);
      expect(filesUnder(join(t.config.storageDir, 'tmp')).filter((p) => !p.startsWith('work-'))).toEqual([]);
    });

    it('odd multipart bodies → 4xx with a message, no temporary file left, nothing stored', async () => {
      const run = await createRun(t.http, f.tokens.lead, f.campaign.id, 'Odd uploads');
      const clip = readFileSync(await media.unique(media.clip()));
      const part = (disposition: string, content: Buffer | string) =>
        Buffer.concat([Buffer.from(`--b0undary\r\nContent-Disposition: ${disposition}\r\nContent-Type: video/mp4\r\n\r\n`, 'latin1'), Buffer.from(content), Buffer.from('\r\n')]);
      const end = Buffer.from('--b0undary--\r\n');
      const multipart = { 'Content-Type': 'multipart/form-data; boundary=b0undary', ...bearer(f.tokens.lead) };
      const cases: Array<[string, Record<string, string>, Buffer | string]> = [
        ['another field name', multipart, Buffer.concat([part(`form-data; name="../../${marker}"; filename="a.mp4"`, clip), end])],
        ['two files', multipart, Buffer.concat([part('form-data; name="file"; filename="a.mp4"', clip), part('form-data; name="file"; filename="b.mp4"', clip), end])],
        ['no file part', multipart, Buffer.concat([part('form-data; name="note"', 'hello'), end])],
        ['empty body', multipart, ''],
        ['no closing boundary', multipart, part('form-data; name="file"; filename="a.mp4"', clip.subarray(0, 2000))],
        ['garbage', multipart, 'this is not multipart at all'],
        ['no boundary', { 'Content-Type': 'multipart/form-data', ...bearer(f.tokens.lead) }, Buffer.concat([part('form-data; name="file"; filename="a.mp4"', clip), end])],
        ['JSON instead of a form', { 'Content-Type': 'application/json', ...bearer(f.tokens.lead) }, JSON.stringify({ file: `../../${marker}` })],
        ['file name in RFC 5987 form', multipart, Buffer.concat([part(`form-data; name="file"; filename*=UTF-8''..%2f..%2f${marker}`, Buffer.from('not a video')), end])],
      ];
      for (const [label, headers, body] of cases) {
        const res = await rawRequest(port, 'POST', `/api/runs/${run.id}/recording`, headers, body);
        const text = res.body.toString('utf8');
        expect(res.status, `${label}: ${res.status} ${text.slice(0, 300)}`).toBeGreaterThanOrEqual(400);
        expect(res.status, `${label}: ${res.status} ${text.slice(0, 300)}`).toBeLessThan(500);
        expect(typeof JSON.parse(text).message, label).toBe('string');
      }
      expect((await t.http.get(`/api/runs/${run.id}/recording`).set(bearer(f.tokens.lead))).status).toBe(404);
      expect(filesUnder(join(t.config.storageDir, 'tmp')).filter((p) => !p.startsWith('work-'))).toEqual([]);
      for (const spot of landingSpots()) expect(existsSync(spot), spot).toBe(false);
    });

    it('ids in paths that spell a path → 400/403/404 with JSON, never a file', async () => {
      const admin = await createUser(t.dataSource, { isAdmin: true });
      const adminToken = await login(t.http, admin.email);
      const templates: Array<[string, string]> = [
        ['/api/admin/mail/ID', adminToken],
        ['/api/invitations/ID', f.tokens.lead],
        ['/api/runs/ID/recording', f.tokens.lead],
        ['/api/recordings/ID/frames', f.tokens.lead],
        ['/api/sheets/ID/grid', f.tokens.lead],
        ['/api/releases/ID/export?format=csv-long', f.tokens.lead],
        ['/api/campaigns/ID/export?format=csv-long', f.tokens.lead],
        ['/api/channels/ID/calibration', f.tokens.lead],
        ['/api/analyses/ID', f.tokens.lead],
      ];
      for (const [template, token] of templates) {
        for (const bad of [...TRAVERSALS.map((x) => x.replace('x', marker)), '..', '.', '%2e%2e', '%2e']) {
          const path = template.replace('ID', bad);
          const res = await rawGet(port, path, bearer(token));
          expect([400, 403, 404], `${path}: ${res.status} ${res.body.toString('utf8').slice(0, 200)}`).toContain(res.status);
          expect(res.headers['content-type'], path).toMatch(/application\/json/);
        }
      }
      for (const spot of landingSpots()) expect(existsSync(spot), spot).toBe(false);
    });

    it('the API description’s static files do not climb out of their folder', async () => {
      for (const bad of ['..%2f..%2fpackage.json', '%2e%2e/%2e%2e/package.json', '..%2f..%2f..%2f..%2fetc%2fpasswd', '%2e%2e%2f%2e%2e%2f%2e%2e%2fbackend%2fpackage.json']) {
        const res = await rawGet(port, `/api/docs/${bad}`);
        expect([400, 403, 404], `${bad}: ${res.status}`).toContain(res.status);
        expect(res.body.toString('utf8')).not.toMatch(/"dependencies"|root:x:0:0/);
      }
    });

    it('storage keys that leave the storage root are refused before any file is touched', async () => {
      const storage = t.app.get(StorageService);
      const source = join(t.config.storageDir, `${marker}-source.bin`);
      writeFileSync(source, 'payload');
      for (const key of [`../${marker}`, `recordings/../../${marker}`, `/etc/${marker}`, `recordings/%2e%2e/${marker}`, `recordings\\..\\..\\${marker}`, '', '.', 'recordings/./x', `recordings/${marker}/..`]) {
        await expect(storage.put(key, source), key).rejects.toBeInstanceOf(InvalidStorageKeyError);
        await expect(storage.stat(key), key).rejects.toBeInstanceOf(InvalidStorageKeyError);
        await expect(storage.openRead(key), key).rejects.toBeInstanceOf(InvalidStorageKeyError);
        await expect(storage.delete(key), key).rejects.toBeInstanceOf(InvalidStorageKeyError);
      }
      expect(readFileSync(source, 'utf8')).toBe('payload');
      for (const spot of landingSpots()) expect(existsSync(spot), spot).toBe(false);
    });
  });
});

describe('the built web app’s static files', () => {
  let t: TestApp;
  let port: number;
  const secret = `secret-${randomUUID()}`;

  beforeAll(async () => {
    // A web build folder with a file beside it (not in it) that must never be served.
    const root = scratchDir('static');
    const frontendDir = join(root, 'web');
    mkdirSync(join(frontendDir, 'assets'), { recursive: true });
    writeFileSync(join(frontendDir, 'index.html'), '<!doctype html><title>Dialsheet</title>');
    writeFileSync(join(frontendDir, 'assets', 'app.js'), 'console.log(1)');
    writeFileSync(join(root, 'private.txt'), secret);
    t = await startTestApp({ overrides: { frontendDir } });
    port = await listeningPort(t);
  });
  afterAll(() => t?.close());

  it('serves the app, and no spelling of ".." reaches the file beside its folder', async () => {
    expect((await rawGet(port, '/assets/app.js')).status).toBe(200);
    for (const path of [
      '/../private.txt',
      '/..%2fprivate.txt',
      '/%2e%2e/private.txt',
      '/%2e%2e%2fprivate.txt',
      '/assets/..%2f..%2fprivate.txt',
      '/assets/%2e%2e/%2e%2e/private.txt',
      '/..%5cprivate.txt',
      '/%252e%252e%252fprivate.txt',
      '/....//private.txt',
      '/assets/..%c0%af..%c0%afprivate.txt',
    ]) {
      const res = await rawGet(port, path);
      const text = res.body.toString('utf8');
      expect(text, path).not.toContain(secret);
      // The single-page app answers unknown paths with index.html; anything else is a refusal.
      if (res.status === 200) expect(text, path).toContain('<title>Dialsheet</title>');
      else expect([400, 403, 404], `${path}: ${res.status}`).toContain(res.status);
    }
  });
});
