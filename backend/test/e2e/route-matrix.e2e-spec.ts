// Route × role matrix (issue 7): every route the application's own router holds is called as
// nobody, as a stranger (lead of another campaign), as a platform administrator and as each role
// of the campaign, against real resources, and the status is compared with the table below. A
// route the router has and the table lacks fails, and so does a table entry with no route: a new
// route cannot ship without someone deciding who may call it. No call may answer 500.

import { randomUUID } from 'node:crypto';
import type { Response } from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { TestMedia } from '../helpers/media';
import { rawGet, rawRequest } from '../helpers/matrix-attacks';
import { fillPath, routesOf, type RouteKey } from '../helpers/matrix-routes';
import { listeningPort } from '../helpers/recordings';
import {
  ACTORS,
  buildMatrixWorld,
  createInvitation,
  freshChannel,
  freshRun,
  freshSheet,
  relockRunA,
  requestedRelease,
  resetToken,
  twinCampaign,
  typedPass1Sheet,
  type MatrixActor,
  type MatrixWorld,
  type SignedInActor,
} from '../helpers/matrix-world';
import { addMember, bearer, createUser, login, PASSWORD, startTestApp, uniqueEmail, type TestApp } from '../helpers/test-app';

type Expected = number;
type Row = Record<MatrixActor, Expected>;
type Role = 'reader' | 'checker' | 'engineer' | 'lead';

interface Call {
  /** Path parameters beyond (or instead of) the defaults. */
  params?: Record<string, string>;
  /** Query string without the "?". */
  query?: string;
  body?: object;
  /** A file sent as multipart field "file". */
  file?: string;
  /** Another token of the same person (e.g. one this call may end). */
  token?: string;
  /** Runs after the call, e.g. to give the person a working token again. */
  after?: (res: Response) => Promise<void>;
}

interface Rule {
  expect: Row;
  /**
   * Resources and body for one actor's call; called once per actor, just before the call.
   * `allowed`: the table expects this actor to succeed (2xx).
   */
  call?: (w: MatrixWorld, actor: MatrixActor, allowed: boolean) => Call | Promise<Call>;
}

/**
 * For calls that use up their resource (delete, sign, finish…): a fresh one for each actor the
 * table lets through, one shared for all the actors it refuses (a refusal changes nothing, and
 * the access check comes before any other check, so a shared resource tests the same decision).
 */
function freshWhenAllowed<T>(make: (w: MatrixWorld) => Promise<T>, use: (made: T, w: MatrixWorld) => Call): Rule['call'] {
  let shared: Promise<T> | undefined;
  return async (w, _actor, allowed) => {
    if (allowed) return use(await make(w), w);
    shared ??= make(w);
    return use(await shared, w);
  };
}

// ---- who may: the shapes the table is written in ----------------------------------------------

const everyone = (status: Expected): Row => Object.fromEntries(ACTORS.map((a) => [a, status])) as Row;
/** Any signed-in account, whatever its campaigns. */
const signedIn = (status: Expected): Row => ({ ...everyone(status), anonymous: 401 });
const adminOnly = (status: Expected): Row => ({ ...everyone(403), anonymous: 401, admin: status });
/**
 * A campaign route: strangers and administrators (who get no implicit campaign rights) see 404
 * like for an unknown id; members without the role 403.
 */
const members = (allowed: Partial<Record<Role, Expected>>, denied: Expected = 403): Row => ({
  anonymous: 401,
  outsider: 404,
  admin: 404,
  reader: allowed.reader ?? denied,
  checker: allowed.checker ?? denied,
  engineer: allowed.engineer ?? denied,
  lead: allowed.lead ?? denied,
});
const anyMember = (status: Expected) => members({ reader: status, checker: status, engineer: status, lead: status });
const writers = (status: Expected) => members({ engineer: status, lead: status });
const leadOnly = (status: Expected) => members({ lead: status });
const engineerOnly = (status: Expected) => members({ engineer: status });

const short = () => randomUUID().slice(0, 8);

/** The latest version of an object, read as the engineer, for calls that must name it. */
async function versionOf(w: MatrixWorld, path: string, id: string): Promise<number> {
  const res = await w.t.http.get(path).set(bearer(w.tokens.engineer));
  expect(res.status, path).toBe(200);
  const found = (Array.isArray(res.body) ? (res.body as Array<{ id?: string; channelId?: string; version: number }>) : [res.body]).find(
    (x) => x.id === id || x.channelId === id,
  );
  if (!found) throw new Error(`${id} not in ${path}`);
  return found.version;
}

const docs: Rule = { expect: everyone(200) };

// ---- the declared table: one entry per route ---------------------------------------------------

const TABLE: Record<RouteKey, Rule> = {
  // The API description (Swagger UI and the OpenAPI document) is public on purpose.
  'GET /api/docs/swagger-ui-init.js': docs,
  'GET /api/docs/docs/swagger-ui-init.js': docs,
  'GET /api/docs': docs,
  'GET /api/docs/index.html': docs,
  // Registered by the API description module for a file its package does not ship: 404 for all.
  'GET /api/docs/LICENSE': { expect: everyone(404) },
  'GET /api/docs/': docs,
  'GET /api/docs-json': docs,
  'GET /api/docs-yaml': docs,
  'GET /api/health': { expect: everyone(200) },

  'POST /api/auth/login': { expect: everyone(200), call: (w) => ({ body: { email: w.users.spare.email, password: PASSWORD } }) },
  'POST /api/auth/logout': {
    expect: signedIn(204),
    // A second session of the same person, so the one the matrix uses stays valid.
    call: async (w, actor) => (actor === 'anonymous' ? {} : { token: await login(w.t.http, w.users[actor].email) }),
  },
  'GET /api/auth/me': { expect: signedIn(200) },
  'PATCH /api/auth/me': { expect: signedIn(200), call: (w, actor) => ({ body: { name: actor === 'anonymous' ? 'Nobody' : w.users[actor].name } }) },
  'POST /api/auth/password': {
    expect: signedIn(204),
    call: (w, actor) => ({
      body: { currentPassword: PASSWORD, newPassword: `${PASSWORD}-changed` },
      // Every session ends on a change: check the new password works, put the old hash back
      // (test plumbing, not a product path) and sign in again for the routes after this one.
      after: async (res) => {
        if (actor === 'anonymous' || res.status !== 204) return;
        const user = w.users[actor];
        await login(w.t.http, user.email, `${PASSWORD}-changed`);
        await w.t.dataSource.query('UPDATE users SET password_hash = $2 WHERE id = $1', [user.id, user.passwordHash]);
        w.tokens[actor] = await login(w.t.http, user.email);
      },
    }),
  },
  'POST /api/auth/password-reset': { expect: everyone(202), call: (w) => ({ body: { email: w.users.spare.email } }) },
  'POST /api/auth/password-reset/confirm': {
    expect: everyone(204),
    call: async (w) => ({ body: { token: await resetToken(w.t, w.tokens.admin), newPassword: 'a-brand-new-passphrase' } }),
  },

  'GET /api/users': { expect: adminOnly(200) },
  'PATCH /api/users/:id': { expect: adminOnly(200), call: (w) => ({ params: { id: w.users.spare.id }, body: { disabled: false } }) },
  'GET /api/users/me/notifications': { expect: signedIn(200) },
  'PUT /api/users/me/notifications': { expect: signedIn(200), call: () => ({ body: { 'sheet-assigned': true } }) },
  'GET /api/admin/mail': { expect: adminOnly(200) },
  'GET /api/admin/mail/:id': { expect: adminOnly(200), call: (w) => ({ params: { id: w.mailId } }) },

  'GET /api/campaigns': { expect: signedIn(200) },
  'POST /api/campaigns': { expect: signedIn(201), call: () => ({ body: { name: `Matrix campaign ${short()}` } }) },
  'GET /api/campaigns/:campaignId': { expect: anyMember(200) },
  'PATCH /api/campaigns/:campaignId': { expect: leadOnly(200), call: () => ({ body: { description: 'Soak test of the plate exchanger' } }) },
  'POST /api/campaigns/:campaignId/archive': {
    expect: leadOnly(200),
    call: freshWhenAllowed(
      (w) => twinCampaign(w, false),
      (c) => ({ params: { campaignId: c.id }, body: { reason: 'finished' } }),
    ),
  },
  'POST /api/campaigns/:campaignId/restore': {
    expect: leadOnly(200),
    call: freshWhenAllowed(
      (w) => twinCampaign(w, true),
      (c) => ({ params: { campaignId: c.id }, body: { reason: 'one more run' } }),
    ),
  },
  'GET /api/campaigns/:campaignId/members': { expect: anyMember(200) },
  'PUT /api/campaigns/:campaignId/members/:userId': { expect: leadOnly(200), call: () => ({ body: { roles: ['reader'] } }) },
  'DELETE /api/campaigns/:campaignId/members/:userId': {
    expect: leadOnly(204),
    call: freshWhenAllowed(
      async (w) => {
        const leaving = await createUser(w.t.dataSource, { name: 'Pat leaving' });
        await addMember(w.t.dataSource, w.campaign.id, leaving.id, ['reader']);
        return leaving.id;
      },
      (userId) => ({ params: { userId } }),
    ),
  },
  'GET /api/campaigns/:campaignId/invitations': { expect: leadOnly(200) },
  'POST /api/campaigns/:campaignId/invitations': { expect: leadOnly(201), call: () => ({ body: { email: uniqueEmail('matrix-invitee'), roles: ['checker'] } }) },
  'DELETE /api/campaigns/:campaignId/invitations/:invitationId': {
    expect: leadOnly(204),
    call: freshWhenAllowed(
      (w) => createInvitation(w.t, w.tokens.lead, w.tokens.admin, w.campaign.id),
      (i) => ({ params: { invitationId: i.id } }),
    ),
  },
  // Reached from the e-mailed link: the token is the authorisation.
  'GET /api/invitations/:token': { expect: everyone(200) },
  'POST /api/invitations/accept': {
    expect: everyone(200),
    call: async (w) => ({
      body: { token: (await createInvitation(w.t, w.tokens.lead, w.tokens.admin, w.campaign.id)).token, name: 'Pat newcomer', password: PASSWORD },
    }),
  },
  'GET /api/campaigns/:campaignId/audit': { expect: anyMember(200) },

  'GET /api/campaigns/:campaignId/runs': { expect: anyMember(200) },
  'POST /api/campaigns/:campaignId/runs': { expect: writers(201), call: () => ({ body: { name: `Run ${short()}`, configuration: 'counter-flow' } }) },
  'GET /api/runs/:runId': { expect: anyMember(200) },
  'PATCH /api/runs/:runId': { expect: writers(200), call: () => ({ body: { notes: 'Chiller set to 12 °C' } }) },
  'DELETE /api/runs/:runId': { expect: writers(204), call: freshWhenAllowed(freshRun, (run) => ({ params: { runId: run.id } })) },
  'PUT /api/runs/:runId/sync': { expect: writers(200), call: () => ({ body: { first: { videoTime: 2, testTime: 0 } } }) },
  'POST /api/runs/:runId/recording': {
    expect: writers(201),
    // Each accepted upload needs new bytes (the same file twice in a campaign is a duplicate).
    call: freshWhenAllowed(
      async (w) => ({ run: await freshRun(w), file: await w.media.unique(w.media.clip()) }),
      ({ run, file }) => ({ params: { runId: run.id }, file }),
    ),
  },
  'GET /api/runs/:runId/recording': { expect: anyMember(200) },
  'DELETE /api/runs/:runId/recording': {
    expect: writers(204),
    call: freshWhenAllowed(
      (w) => freshRun(w, true),
      (run) => ({ params: { runId: run.id } }),
    ),
  },
  'GET /api/recordings/:recordingId/frames': { expect: anyMember(200) },
  'POST /api/recordings/:recordingId/media-urls': { expect: anyMember(200) },
  // Media for <video>/<img>: the signed query string is the authorisation, whoever asks.
  'HEAD /api/media/:recordingId/:kind': { expect: everyone(200), call: (w) => ({ query: w.mediaUrls.proxyUrl!.split('?')[1] }) },
  'GET /api/media/:recordingId/:kind': { expect: everyone(200), call: (w) => ({ query: w.mediaUrls.proxyUrl!.split('?')[1] }) },

  'GET /api/campaigns/:campaignId/channels': { expect: anyMember(200) },
  'POST /api/campaigns/:campaignId/channels': {
    expect: writers(201),
    call: () => {
      const symbol = `N${short().replace(/-/g, '')}`;
      return { body: { name: `Gauge ${symbol}`, symbol, quantity: 'pressure', rawUnit: 'kPa', resolution: 0.1, rangeMin: 0, rangeMax: 400 } };
    },
  },
  'PUT /api/campaigns/:campaignId/channels/order': {
    expect: writers(200),
    call: async (w) => {
      const list = await w.t.http.get(`/api/campaigns/${w.campaign.id}/channels`).set(bearer(w.tokens.lead));
      return { body: { channelIds: (list.body as Array<{ id: string }>).map((c) => c.id) } };
    },
  },
  'PATCH /api/channels/:channelId': { expect: writers(200), call: () => ({ body: { plausibleMin: -40 } }) },
  'DELETE /api/channels/:channelId': {
    expect: writers(204),
    call: freshWhenAllowed(
      (w) => freshChannel(w),
      (c) => ({ params: { channelId: c.id } }),
    ),
  },
  'GET /api/runs/:runId/display-regions': { expect: anyMember(200) },
  'PUT /api/runs/:runId/display-regions': {
    expect: writers(200),
    call: (w) => ({ body: { regions: [{ channelId: w.T.id, x: 0.1, y: 0.1, width: 0.2, height: 0.1 }] } }),
  },

  'GET /api/runs/:runId/sheets': { expect: anyMember(200) },
  'POST /api/runs/:runId/sheets': {
    expect: writers(201),
    call: (w) => ({ body: { name: `Sheet ${short()}`, startTime: 0, endTime: 4, interval: 2, channelIds: [w.T.id] } }),
  },
  'GET /api/sheets/:sheetId': { expect: anyMember(200) },
  'GET /api/sheets/:sheetId/rows': { expect: anyMember(200) },
  'PATCH /api/sheets/:sheetId': { expect: writers(200), call: () => ({ body: { name: 'Sheet in progress' } }) },
  'DELETE /api/sheets/:sheetId': { expect: writers(204), call: freshWhenAllowed(freshSheet, (sheet) => ({ params: { sheetId: sheet.id } })) },
  'PUT /api/sheets/:sheetId/assignment': {
    expect: writers(200),
    call: (w) => ({ body: { readerId: w.users.reader.id, checkerId: w.users.checker.id } }),
  },
  // Pass 1 belongs to the assigned reader alone.
  'PUT /api/sheets/:sheetId/rows/:rowIndex': {
    expect: members({ reader: 200 }),
    call: (w) => ({ body: { pass: 1, readings: [{ channelId: w.T.id, rawText: '21.4', frameTime: 2.02 }, { channelId: w.V.id, rawText: '2.315', frameTime: 2.02 }] } }),
  },
  // Blind double entry: the checker may not see pass 1 before finishing pass 2.
  'GET /api/sheets/:sheetId/readings': { expect: members({ reader: 200, engineer: 200, lead: 200 }), call: () => ({ query: 'pass=1' }) },
  'GET /api/sheets/:sheetId/grid': { expect: anyMember(200) },
  'POST /api/sheets/:sheetId/passes/:pass/finish': {
    expect: members({ reader: 200 }),
    call: freshWhenAllowed(typedPass1Sheet, (sheet) => ({ params: { sheetId: sheet.id, pass: '1' } })),
  },
  'GET /api/sheets/:sheetId/mismatches': { expect: members({ engineer: 200, lead: 200 }) },
  'PUT /api/sheets/:sheetId/resolutions/:rowIndex/:channelId': {
    expect: members({ checker: 200, lead: 200 }),
    call: async (w) => {
      const res = await w.t.http.get(`/api/sheets/${w.mismatchSheet.id}/mismatches`).set(bearer(w.tokens.lead));
      expect(res.status).toBe(200);
      const cell = (res.body as { cells: Array<{ rowIndex: number; channelId: string; resolution: { version: number } | null }> }).cells.find(
        (c) => c.rowIndex === 0 && c.channelId === w.V.id,
      );
      return {
        params: { sheetId: w.mismatchSheet.id, rowIndex: '0', channelId: w.V.id },
        body: { rawText: '2.315', reason: 'The frame shows 2.315', ...(cell?.resolution ? { baseVersion: cell.resolution.version } : {}) },
      };
    },
  },

  'GET /api/campaigns/:campaignId/calibrations': { expect: anyMember(200) },
  // On a channel no release has read (V's calibration is frozen by the release of run A).
  'PUT /api/channels/:channelId/calibration': {
    expect: engineerOnly(200),
    call: async (w) => ({
      params: { channelId: w.P.id },
      body: {
        chain: { steps: [{ kind: 'linear', a: 40, b: 0, inputUnit: 'V', outputUnit: 'SLPM', label: 'meter span' }] },
        baseVersion: await versionOf(w, `/api/campaigns/${w.campaign.id}/calibrations`, w.P.id),
      },
    }),
  },
  'DELETE /api/channels/:channelId/calibration': {
    expect: engineerOnly(204),
    call: freshWhenAllowed(
      (w) => freshChannel(w, true),
      (c) => ({ params: { channelId: c.id }, query: 'baseVersion=1' }),
    ),
  },
  'GET /api/campaigns/:campaignId/derived-channels': { expect: anyMember(200) },
  'POST /api/campaigns/:campaignId/derived-channels': {
    expect: engineerOnly(201),
    call: () => {
      const symbol = `D${short().replace(/-/g, '')}`;
      return { body: { name: `Derived ${symbol}`, symbol, unit: 'K', expression: 'T1 + 273.15' } };
    },
  },
  'PATCH /api/derived-channels/:id': {
    expect: engineerOnly(200),
    call: async (w) => ({
      params: { id: w.derived.id },
      body: { unit: 'L/s', baseVersion: await versionOf(w, `/api/campaigns/${w.campaign.id}/derived-channels`, w.derived.id) },
    }),
  },
  'DELETE /api/derived-channels/:id': {
    expect: engineerOnly(204),
    call: freshWhenAllowed(
      async (w) => {
        const symbol = `X${short().replace(/-/g, '')}`;
        const res = await w.t.http
          .post(`/api/campaigns/${w.campaign.id}/derived-channels`)
          .set(bearer(w.tokens.engineer))
          .send({ name: `Scratch ${symbol}`, symbol, unit: 'K', expression: 'T1 + 273.15' });
        expect(res.status).toBe(201);
        return (res.body as { id: string }).id;
      },
      (id) => ({ params: { id }, query: 'baseVersion=1' }),
    ),
  },
  'GET /api/campaigns/:campaignId/stability-rules': { expect: anyMember(200) },
  'POST /api/campaigns/:campaignId/stability-rules': {
    expect: engineerOnly(201),
    call: () => ({ body: { name: `Rule ${short()}`, windowSeconds: 60, bandLimit: 0.5 } }),
  },
  'PATCH /api/stability-rules/:id': {
    expect: engineerOnly(200),
    call: async (w) => ({
      params: { id: w.rule.id },
      body: { bandLimit: 0.4, baseVersion: await versionOf(w, `/api/campaigns/${w.campaign.id}/stability-rules`, w.rule.id) },
    }),
  },
  'DELETE /api/stability-rules/:id': {
    expect: engineerOnly(204),
    call: freshWhenAllowed(
      async (w) => {
        const res = await w.t.http
          .post(`/api/campaigns/${w.campaign.id}/stability-rules`)
          .set(bearer(w.tokens.engineer))
          .send({ name: `Scratch rule ${short()}`, windowSeconds: 60, bandLimit: 0.5 });
        expect(res.status).toBe(201);
        return (res.body as { id: string }).id;
      },
      (id) => ({ params: { id }, query: 'baseVersion=1' }),
    ),
  },

  'GET /api/runs/:runId/series/:channelId': { expect: writers(200), call: (w) => ({ params: { runId: w.runA.id, channelId: w.V.id } }) },
  'GET /api/campaigns/:campaignId/analyses': { expect: anyMember(200) },
  'POST /api/campaigns/:campaignId/analyses': {
    expect: engineerOnly(201),
    call: (w) => ({
      body: { kind: 'stable-value', name: `Flow ${short()}`, input: { runId: w.runA.id, channelId: w.V.id, window: { from: 4, to: 14 }, tStar: 14 } },
    }),
  },
  'GET /api/analyses/:id': { expect: anyMember(200), call: (w) => ({ params: { id: w.analysis.id } }) },
  'PUT /api/analyses/:id': {
    expect: engineerOnly(200),
    call: async (w) => {
      const res = await w.t.http.get(`/api/analyses/${w.analysis.id}`).set(bearer(w.tokens.engineer));
      return { params: { id: w.analysis.id }, body: { note: 'checked against the log', baseVersion: (res.body as { version: number }).version } };
    },
  },
  'DELETE /api/analyses/:id': {
    expect: engineerOnly(204),
    call: freshWhenAllowed(
      async (w) => {
        const res = await w.t.http
          .post(`/api/campaigns/${w.campaign.id}/analyses`)
          .set(bearer(w.tokens.engineer))
          .send({ kind: 'stable-value', name: `Scratch ${short()}`, input: { runId: w.runA.id, channelId: w.V.id, window: { from: 4, to: 14 }, tStar: 14 } });
        expect(res.status).toBe(201);
        return (res.body as { id: string }).id;
      },
      (id) => ({ params: { id } }),
    ),
  },
  'POST /api/analyses/:id/recompute': { expect: engineerOnly(200), call: (w) => ({ params: { id: w.analysis.id } }) },

  'POST /api/campaigns/:campaignId/releases': { expect: writers(201), call: (w) => ({ body: { title: `Request ${short()}`, runIds: [w.runA.id] } }) },
  'GET /api/campaigns/:campaignId/releases': { expect: anyMember(200) },
  'GET /api/campaigns/:campaignId/dashboard': { expect: writers(200) },
  'GET /api/releases/:releaseId': { expect: anyMember(200) },
  'POST /api/releases/:releaseId/sign': { expect: leadOnly(200), call: freshWhenAllowed(requestedRelease, (r) => ({ params: { releaseId: r.id }, body: {} })) },
  'POST /api/releases/:releaseId/decline': {
    expect: leadOnly(200),
    call: freshWhenAllowed(requestedRelease, (r) => ({ params: { releaseId: r.id }, body: { reason: 'Run A needs one more sheet' } })),
  },
  'POST /api/runs/:runId/correction': {
    expect: leadOnly(200),
    call: async (w) => {
      await relockRunA(w);
      return { params: { runId: w.runA.id }, body: { reason: 'Row 3 was typed from the wrong frame' } };
    },
  },
  'GET /api/releases/:releaseId/export': { expect: anyMember(200), call: () => ({ query: 'format=csv-long' }) },
  'GET /api/releases/:releaseId/analyses': { expect: anyMember(200) },
  'GET /api/campaigns/:campaignId/export': { expect: writers(200), call: () => ({ query: 'format=csv-wide' }) },
};

/** Values of path parameters when a rule names none. */
function defaultParams(w: MatrixWorld): Record<string, string> {
  return {
    campaignId: w.campaign.id,
    runId: w.runB.id,
    sheetId: w.sheetB.id,
    channelId: w.T.id,
    recordingId: w.recordingId,
    releaseId: w.release.id,
    invitationId: w.invitationId,
    userId: w.users.spare.id,
    token: w.invitationToken,
    kind: 'proxy',
    rowIndex: '0',
    pass: '1',
  };
}

describe('the router and the table', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await startTestApp();
  });
  afterAll(() => t?.close());

  it('name the same routes', () => {
    const routes = routesOf(t.app);
    expect(routes.length).toBeGreaterThan(80);
    const declared = new Set(Object.keys(TABLE));
    const found = new Set(routes);
    expect(routes.filter((r) => !declared.has(r)), 'routes in the router with no entry in the table').toEqual([]);
    expect([...declared].filter((r) => !found.has(r)), 'table entries with no route in the router').toEqual([]);
    expect(routes.length, 'a route registered twice').toBe(found.size);
  });
});

describe('route × role matrix', () => {
  let t: TestApp;
  let w: MatrixWorld;
  let routes: RouteKey[] = [];
  const media = new TestMedia();

  beforeAll(async () => {
    t = await startTestApp();
    routes = routesOf(t.app);
    w = await buildMatrixWorld(t, media);
  }, 120_000);
  afterAll(async () => {
    await t?.close();
    media.remove();
  });

  for (const [route, rule] of Object.entries(TABLE)) {
    it(route, { timeout: 90_000 }, async () => {
      expect(routes, 'declared but not in the router').toContain(route);
      const [method, path] = route.split(' ') as [string, string];
      const seen = {} as Record<MatrixActor, number>;
      const bodies: string[] = [];
      // Least privileged first, so a call that succeeds cannot change what the refused ones see.
      for (const actor of ACTORS) {
        const allowed = rule.expect[actor] >= 200 && rule.expect[actor] < 300;
        const call = (await rule.call?.(w, actor, allowed)) ?? {};
        const url = fillPath(path, { ...defaultParams(w), ...call.params }) + (call.query ? `?${call.query}` : '');
        let req = t.http[method.toLowerCase() as 'get' | 'head' | 'post' | 'put' | 'patch' | 'delete'](url);
        const token = call.token ?? (actor === 'anonymous' ? undefined : w.tokens[actor as SignedInActor]);
        if (token) req = req.set(bearer(token));
        const res = call.file ? await req.attach('file', call.file) : call.body ? await req.send(call.body) : await req;
        seen[actor] = res.status;
        if (res.status !== rule.expect[actor]) bodies.push(`${actor}: ${res.status} ${JSON.stringify(res.body).slice(0, 300)}`);
        await call.after?.(res);
      }
      // One comparison per route, so a failure shows every actor's answer at once.
      expect(seen, bodies.join('\n')).toEqual(rule.expect);
      expect(Object.values(seen).filter((s) => s >= 500)).toEqual([]);
    });
  }

  // After the table: every path parameter of every route, one at a time, replaced by text that
  // names nothing (the others kept real), called by the lead with an empty body: a 4xx, never 500.
  it('path parameters that name nothing → 4xx, never 500', { timeout: 120_000 }, async () => {
    const port = await listeningPort(t);
    const BAD = ['x', '-1', '1.5', '1e309', '%00', '..%2f..%2fx', 'a'.repeat(300), '00000000-0000-0000-0000-000000000000', '%F0%9F%92%A9', 'null'];
    const failures: string[] = [];
    let calls = 0;
    for (const route of Object.keys(TABLE)) {
      const [method, path] = route.split(' ') as [string, string];
      const names = [...path.matchAll(/:([A-Za-z]+)/g)].map((m) => m[1]);
      for (const name of names) {
        for (const bad of BAD) {
          const url = path.replace(/:([A-Za-z]+)/g, (_, n: string) => (n === name ? bad : encodeURIComponent(defaultParams(w)[n])));
          const res = await rawRequest(port, method, url, { 'Content-Type': 'application/json', ...bearer(w.tokens.lead) }, '{}');
          calls += 1;
          if (res.status < 400 || res.status >= 500) failures.push(`${method} ${url.slice(0, 120)} → ${res.status} ${res.body.toString('utf8').slice(0, 200)}`);
        }
      }
    }
    expect(calls).toBeGreaterThan(500);
    expect(failures).toEqual([]);
  });

  // Reads only (a change could go through with the real ids): query values repeated, empty,
  // out of range or spelling a path, on every GET route with its real ids → anything but a 500.
  it('odd query strings on every read → never 500', { timeout: 120_000 }, async () => {
    const port = await listeningPort(t);
    const QUERIES = [
      'format=csv-long&format=xlsx&pass=1&pass=2&baseVersion=1&baseVersion=2&runIds=a&runIds=b',
      'format=&pass=&limit=&cursor=&status=&runId=&kind=&entityType=&runIds=',
      'pass=3&limit=-1&cursor=..%2f..%2fx&status=deleted&runId=x&kind=..&entityType=%00&runIds=,,,',
      `limit=1e309&cursor=${'z'.repeat(2000)}&before=not-a-date&after=9999-99-99&runIds=${'00000000-0000-4000-8000-000000000000,'.repeat(200)}`,
      'limit[]=1&status[$ne]=x&__proto__[x]=1&constructor[prototype][x]=1',
    ];
    const failures: string[] = [];
    for (const [route, rule] of Object.entries(TABLE).filter(([r]) => r.startsWith('GET '))) {
      const path = route.slice(4);
      const params = { ...defaultParams(w), ...(await rule.call?.(w, 'lead', true))?.params };
      for (const query of QUERIES) {
        const url = `${fillPath(path, params)}?${query}`;
        const res = await rawGet(port, url, bearer(w.tokens.lead));
        if (res.status >= 500) failures.push(`${url.slice(0, 160)} → ${res.status} ${res.body.toString('utf8').slice(0, 200)}`);
      }
    }
    expect(failures).toEqual([]);
  });
});
