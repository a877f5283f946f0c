// Issue 7, bad input: every route that takes a JSON body, enumerated from the application's own
// OpenAPI document (a new route is fuzzed without anyone adding it here), gets fast-check bodies —
// arbitrary JSON, the route's own body with one field made hostile (wrong types, huge numbers,
// NaN-ish strings, control characters, very long text, deep nesting, prototype keys) and raw JSON
// text that JSON.parse turns into Infinity or nests thousands deep — sent by a member who holds
// the role the route asks for, on real resources. Two rules: never a 5xx, and a refused request
// (4xx) changes nothing already saved (a fingerprint of every table, read back after each call).
import type { Campaign, Channel, Invitation, Reading, Release, Run, Sheet } from '@dialsheet/common';
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { JobsService } from '../../src/jobs/jobs.service';
import { ANALYSIS_RECOMPUTE_QUEUE } from '../../src/modules/analyses/analysis-recompute.job';
import { TestMedia } from '../helpers/media';
import { campaignFixture, createChannel, createSyncedRun, type Fixture } from '../helpers/recordings';
import { addMember, bearer, createUser, login, startTestApp, type TestApp } from '../helpers/test-app';
import { call, FLOW_CHAIN, GAUGES, typedSheet } from './release-fixture';

/** Requests per route: 37 routes × 25 take under a minute on the shared two-core machine. */
const RUNS_PER_ROUTE = 25;

type Method = 'post' | 'put' | 'patch' | 'delete';
interface Schema {
  $ref?: string;
  type?: string;
  properties?: Record<string, Schema>;
  items?: Schema;
  enum?: unknown[];
  example?: unknown;
  allOf?: Schema[];
  required?: string[];
  maxLength?: number;
}
interface BodyRoute {
  method: Method;
  path: string;
  schema: Schema;
}

/** What a fuzz case sends: a value for supertest to serialise, or raw JSON text. */
type Body = { json: unknown } | { raw: string };

const deep = (depth: number, open: string, close: string, inner = '1') => open.repeat(depth) + inner + close.repeat(depth);

/** Values that break naive handlers: wrong types, edges of the double range, text that looks like something else. */
const hostileValue: fc.Arbitrary<unknown> = fc.oneof(
  fc.constantFrom<unknown>(
    null, true, false, 0, -1, 1e308, -1e308, 5e-324, 2 ** 53 + 1, -(2 ** 31), 4294967296,
    'NaN', 'Infinity', '-Infinity', '1e999', '0x1F', '1,5', '', ' ', '\u0000', '\u0000\u0001\u001b[31m', '\u202e\u200b', '\uD800',
    '<img src=x onerror=alert(1)>', "'; DROP TABLE campaigns; --", '../../../etc/passwd', '%00', '=cmd|\' /C calc\'!A0',
    '00000000-0000-0000-0000-000000000000', 'ffffffff-ffff-ffff-ffff-ffffffffffff', '__proto__', 'constructor',
    [], {}, [null], [[[]]], { toString: null }, { valueOf: null, toString: null }, JSON.parse('{"__proto__": {"isAdmin": true}}'), { constructor: { prototype: {} } },
  ),
  fc.string({ unit: 'binary', maxLength: 40 }),
  fc.integer({ min: 1000, max: 150_000 }).map((n) => 'ä'.repeat(n)),
  fc.double(),
  fc.bigInt().map((b) => b.toString()),
  fc.jsonValue({ maxDepth: 3 }),
  fc.integer({ min: 20, max: 400 }).map((d) => JSON.parse(deep(d, '[', ']')) as unknown),
);

/** Raw JSON text: numbers beyond the double range, very deep nesting, broken and odd documents. */
function rawText(props: string[]): fc.Arbitrary<string> {
  const prop = props.length ? fc.constantFrom(...props) : fc.constant('x');
  return fc.oneof(
    prop.chain((p) => fc.constantFrom(`{"${p}": 1e999}`, `{"${p}": -1e999}`, `{"${p}": 123456789012345678901234567890}`, `{"${p}": [${'1,'.repeat(5000)}1]}`)),
    prop.map((p) => `{"${p}": ${deep(5000, '{"a":', '}')}}`),
    fc.integer({ min: 1000, max: 20_000 }).map((d) => deep(d, '[', ']')),
    fc.integer({ min: 1000, max: 20_000 }).map((d) => deep(d, '{"a":', '}')),
    fc.constantFrom('', '{', '{"a":', 'null', '"text"', '[]', 'true', '\uFEFF{}', '{"__proto__": {"isAdmin": true}}', '{"a":1,"a":2}', 'NaN', '{"x": undefined}'),
    fc.string({ unit: 'binary', maxLength: 60 }),
  );
}

function resolveSchema(schema: Schema, all: Record<string, Schema>): Schema {
  if (schema.$ref) return resolveSchema(all[schema.$ref.replace('#/components/schemas/', '')], all);
  if (schema.allOf?.length === 1) return resolveSchema(schema.allOf[0], all);
  return schema;
}

/** A plausible body from the schema (examples, else a value of the declared type) for mutation. */
function plausible(schema: Schema, all: Record<string, Schema>, depth = 0): unknown {
  const s = resolveSchema(schema, all);
  if (s.example !== undefined) return s.example;
  if (s.enum?.length) return s.enum[0];
  if (s.properties && depth < 4) {
    return Object.fromEntries(Object.entries(s.properties).map(([k, v]) => [k, plausible(v, all, depth + 1)]));
  }
  switch (s.type) {
    case 'string':
      return 'text';
    case 'number':
    case 'integer':
      return 1;
    case 'boolean':
      return false;
    case 'array':
      return s.items ? [plausible(s.items, all, depth + 1)] : [];
    default:
      return {};
  }
}

/** Dotted paths of every property, nested ones included ("first.videoTime", "readings.0.rawText"). */
function propertyPaths(value: unknown, prefix = ''): string[] {
  if (value === null || typeof value !== 'object') return [];
  return Object.entries(value).flatMap(([k, v]) => [`${prefix}${k}`, ...propertyPaths(v, `${prefix}${k}.`)]);
}

function withValueAt(base: unknown, path: string, value: unknown): unknown {
  const copy = structuredClone(base) as Record<string, unknown>;
  const keys = path.split('.');
  let at: Record<string, unknown> = copy;
  for (const k of keys.slice(0, -1)) at = at[k] as Record<string, unknown>;
  at[keys[keys.length - 1]] = value;
  return copy;
}

function bodies(route: BodyRoute, all: Record<string, Schema>): fc.Arbitrary<Body> {
  const base = plausible(route.schema, all);
  const paths = propertyPaths(base);
  const topProps = Object.keys(resolveSchema(route.schema, all).properties ?? {});
  const arbitraries: Array<fc.Arbitrary<Body>> = [
    fc.jsonValue({ maxDepth: 4 }).map((json) => ({ json })),
    hostileValue.map((json) => ({ json })),
    rawText(topProps).map((raw) => ({ raw })),
    fc.tuple(fc.string({ minLength: 1, maxLength: 12 }), hostileValue).map(([k, v]) => ({ json: { ...(base as object), [k]: v } })),
  ];
  if (paths.length) {
    const mutated = fc.tuple(fc.constantFrom(...paths), hostileValue).map(([p, v]) => ({ json: withValueAt(base, p, v) }));
    arbitraries.push(mutated, mutated, mutated);
  }
  return fc.oneof(...arbitraries);
}

describe('fuzzed request bodies on every body-taking route', () => {
  let t: TestApp;
  let media: TestMedia;
  let f: Fixture;
  let T: Channel;
  let V: Channel;
  let openRun: Run;
  let releasedRun: Run;
  let steady: Sheet;
  let release: Release;
  let spare: { id: string; token: string };
  let adminToken: string;
  const ids: Record<string, string> = {};
  let fingerprintSql = '';

  async function fingerprint(): Promise<Record<string, string>> {
    const [row] = (await t.dataSource.query(fingerprintSql)) as Array<Record<string, string>>;
    return row;
  }

  beforeAll(async () => {
    t = await startTestApp();
    // The per-minute recompute of stale analyses would change rows in the middle of a check.
    await t.app.get(JobsService).unschedule(ANALYSIS_RECOMPUTE_QUEUE);
    media = new TestMedia();
    f = await campaignFixture(t, 'Fuzzed bodies campaign');
    T = await createChannel(t.http, f.tokens.lead, f.campaign.id, GAUGES[0]);
    V = await createChannel(t.http, f.tokens.lead, f.campaign.id, GAUGES[1]);
    expect((await call(t.http, 'put', `/api/channels/${V.id}/calibration`, f.tokens.engineer).send({ chain: FLOW_CHAIN, reason: 'data sheet' })).status).toBe(200);

    // A released run (pending release, its sheet typed, resolved) and an open run with a steady sheet.
    releasedRun = await createSyncedRun(t.http, f.tokens.lead, f.campaign.id, media);
    await typedSheet(t, { f, T, V, run: releasedRun }, 'Released sheet', releasedRun);
    const rel = await call(t.http, 'post', `/api/campaigns/${f.campaign.id}/releases`, f.tokens.lead).send({ title: 'Fuzz release', runIds: [releasedRun.id] });
    expect(rel.status, JSON.stringify(rel.body)).toBe(201);
    release = rel.body as Release;

    openRun = await createSyncedRun(t.http, f.tokens.lead, f.campaign.id, media);
    const created = await call(t.http, 'post', `/api/runs/${openRun.id}/sheets`, f.tokens.engineer).send({ name: 'Steady', startTime: 10, endTime: 50, interval: 2, channelIds: [T.id, V.id] });
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    const assigned = await call(t.http, 'put', `/api/sheets/${(created.body as Sheet).id}/assignment`, f.tokens.lead).send({ readerId: f.users.reader.id, checkerId: f.users.checker.id });
    expect(assigned.status).toBe(200);
    steady = assigned.body as Sheet;
    for (let i = 0; i <= 20; i++) {
      for (const [pass, token] of [[1, f.tokens.reader], [2, f.tokens.checker]] as const) {
        const saved = await call(t.http, 'put', `/api/sheets/${steady.id}/rows/${i}`, token).send({
          pass,
          readings: [
            { channelId: T.id, rawText: (35 + 0.1 * (i % 2)).toFixed(1), frameTime: 12 + 2 * i },
            { channelId: V.id, rawText: (2.5 + 0.001 * (i % 3)).toFixed(3), frameTime: 12 + 2 * i },
          ],
        });
        expect(saved.status, JSON.stringify(saved.body)).toBe(200);
      }
    }

    const derived = await call(t.http, 'post', `/api/campaigns/${f.campaign.id}/derived-channels`, f.tokens.engineer).send({ name: 'Doubled flow', symbol: 'V2', unit: 'V', expression: 'V1 * 2' });
    expect(derived.status, JSON.stringify(derived.body)).toBe(201);
    const rule = await call(t.http, 'post', `/api/campaigns/${f.campaign.id}/stability-rules`, f.tokens.engineer).send({ name: 'Steady', windowSeconds: 30, slopeLimitPerMinute: 0.5, channelId: T.id });
    expect(rule.status, JSON.stringify(rule.body)).toBe(201);
    const analysis = await call(t.http, 'post', `/api/campaigns/${f.campaign.id}/analyses`, f.tokens.engineer).send({
      kind: 'stable-value',
      name: 'Outlet at 50 s',
      input: { runId: openRun.id, channelId: T.id, window: { from: 10, to: 50 }, tStar: 50 },
    });
    expect(analysis.status, JSON.stringify(analysis.body)).toBe(201);
    const invitation = await call(t.http, 'post', `/api/campaigns/${f.campaign.id}/invitations`, f.tokens.lead).send({ email: 'invited.fuzz@example.test', roles: ['reader'] });
    expect(invitation.status, JSON.stringify(invitation.body)).toBe(201);

    const spareUser = await createUser(t.dataSource, { name: 'Spare member' });
    spare = { id: spareUser.id, token: await login(t.http, spareUser.email) };
    await addMember(t.dataSource, f.campaign.id, spare.id, ['reader']);
    const admin = await createUser(t.dataSource, { isAdmin: true });
    adminToken = await login(t.http, admin.email);

    Object.assign(ids, {
      campaignId: f.campaign.id,
      userId: spare.id,
      invitationId: (invitation.body as Invitation).id,
      runId: openRun.id,
      sheetId: steady.id,
      // Row 1 is the target; rows 0 and 2–20 are the fixture that must stay as typed.
      rowIndex: '1',
      channelId: T.id,
      releaseId: release.id,
      derived: (derived.body as { id: string }).id,
      rule: (rule.body as { id: string }).id,
      analysis: (analysis.body as { id: string }).id,
    });

    const tables = (await t.dataSource.query(
      "SELECT table_name FROM information_schema.tables WHERE table_schema = 'public' AND table_type = 'BASE TABLE' AND table_name <> 'migrations' ORDER BY table_name",
    )) as Array<{ table_name: string }>;
    expect(tables.length).toBeGreaterThan(10);
    fingerprintSql = `SELECT ${tables
      .map(({ table_name: n }) => `(SELECT md5(coalesce(string_agg(x::text, '|' ORDER BY x::text), '')) FROM "${n}" x) AS "${n}"`)
      .join(', ')}`;
  }, 180_000);

  afterAll(async () => {
    await t?.close();
  });

  /** The member who may call the route (the body, not the role, is what is under test). */
  function tokenFor(route: BodyRoute): string {
    const p = route.path;
    if (p === '/api/users/{id}') return adminToken;
    if (p.startsWith('/api/auth/') || p === '/api/users/me/notifications' || p === '/api/invitations/accept') return spare.token;
    if (/\/rows\//.test(p)) return f.tokens.reader;
    if (/\/resolutions\//.test(p)) return f.tokens.checker;
    if (/calibration|derived-channels|stability-rules|analyses|\/sheets$/.test(p)) return f.tokens.engineer;
    return f.tokens.lead;
  }

  function urlFor(route: BodyRoute): string {
    return route.path.replace(/\{([^}]+)\}/g, (_, name: string) => {
      if (name === 'id') {
        if (route.path.startsWith('/api/users/')) return spare.id;
        if (route.path.startsWith('/api/derived-channels/')) return ids.derived;
        if (route.path.startsWith('/api/stability-rules/')) return ids.rule;
        if (route.path.startsWith('/api/analyses/')) return ids.analysis;
      }
      if (name === 'runId' && route.path.endsWith('/correction')) return releasedRun.id;
      const value = ids[name];
      if (!value) throw new Error(`no fixture value for {${name}} in ${route.path}: add one above`);
      return value;
    });
  }

  let all: Record<string, Schema> = {};
  const routes: BodyRoute[] = [];
  let before: Record<string, string> = {};

  /** Sends one body as raw JSON text and applies both rules; true when it was accepted (2xx). */
  async function sendAndCheck(route: BodyRoute, body: Body): Promise<boolean> {
    const name = `${route.method.toUpperCase()} ${route.path}`;
    // Always raw JSON text, so that top-level strings, numbers and null go out as JSON too.
    const text = 'raw' in body ? body.raw : (JSON.stringify(body.json) ?? '');
    const res = await t.http[route.method](urlFor(route)).set(bearer(tokenFor(route))).set('Content-Type', 'application/json').send(text);
    const after = await fingerprint();
    const what = `${name} → ${res.status} ${JSON.stringify(res.body).slice(0, 300)} for ${text.slice(0, 200)}`;
    expect(res.status, what).toBeLessThan(500);
    if (res.status >= 400) {
      expect(Object.keys(after).filter((k) => after[k] !== before[k]), `${what}: a refused body changed these tables`).toEqual([]);
      // A refusal says why, in the error shape every 4xx uses.
      expect(typeof res.body?.message === 'string' || Array.isArray(res.body?.message), what).toBe(true);
    }
    before = after;
    return res.status < 400;
  }

  it('finds the body-taking routes in the OpenAPI document', async () => {
    const doc = await t.http.get('/api/docs-json');
    expect(doc.status).toBe(200);
    all = doc.body.components.schemas as Record<string, Schema>;
    for (const [path, ops] of Object.entries(doc.body.paths as Record<string, Record<string, { requestBody?: { content?: Record<string, { schema: Schema }> } }>>)) {
      for (const [method, op] of Object.entries(ops)) {
        const json = op.requestBody?.content?.['application/json'];
        if (json) routes.push({ method: method as Method, path, schema: json.schema });
      }
    }
    // Enumerated from the app: a count far below today's means the document lost its bodies.
    expect(routes.length).toBeGreaterThanOrEqual(35);
    before = await fingerprint();
  });

  it('null, an object, an empty string and a huge number in each field, one field at a time: never 5xx', async () => {
    expect(routes.length).toBeGreaterThan(0);
    let sentCount = 0;
    for (const route of routes) {
      const base = plausible(route.schema, all);
      for (const path of propertyPaths(base)) {
        for (const value of [null, {}, '', 1e308]) {
          await sendAndCheck(route, { json: withValueAt(base, path, value) });
          sentCount += 1;
        }
      }
    }
    expect(sentCount).toBeGreaterThan(routes.length * 4);
  }, 240_000);

  it('fast-check bodies on every route: never 5xx, and a refused body changes nothing saved', async () => {
    expect(routes.length).toBeGreaterThan(0);
    const accepted: Record<string, number> = {};
    const sent: Record<string, number> = {};
    for (const route of routes) {
      const name = `${route.method.toUpperCase()} ${route.path}`;
      await fc.assert(
        fc.asyncProperty(bodies(route, all), async (body) => {
          if (await sendAndCheck(route, body)) accepted[name] = (accepted[name] ?? 0) + 1;
          sent[name] = (sent[name] ?? 0) + 1;
        }),
        { numRuns: RUNS_PER_ROUTE, endOnFailure: true },
      );
    }
    // Every route really received its share (a generator that throws would skip a route silently).
    for (const route of routes) expect(sent[`${route.method.toUpperCase()} ${route.path}`], route.path).toBe(RUNS_PER_ROUTE);
    // Most hostile bodies must be refused; a route that accepted nearly all of them validates nothing.
    for (const [name, n] of Object.entries(accepted)) expect(n, name).toBeLessThan(RUNS_PER_ROUTE * 0.6);
  }, 240_000);

  it('left the fixture as it was saved: every row but the fuzzed one, the calibration and the release', async () => {
    for (const pass of [1, 2]) {
      const rows = await call(t.http, 'get', `/api/sheets/${steady.id}/readings?pass=${pass}`, f.tokens.lead);
      expect(rows.status).toBe(200);
      const kept = (rows.body as Reading[]).filter((r) => r.rowIndex !== 1);
      expect(kept.length).toBe(20 * 2);
      for (const r of kept) {
        const expected = r.channelId === T.id ? (35 + 0.1 * (r.rowIndex % 2)).toFixed(1) : (2.5 + 0.001 * (r.rowIndex % 3)).toFixed(3);
        expect(r.rawText, `row ${r.rowIndex} pass ${pass}`).toBe(expected);
        expect(r.version, `row ${r.rowIndex} pass ${pass}`).toBe(1);
      }
    }
    const campaign = (await call(t.http, 'get', `/api/campaigns/${f.campaign.id}`, f.tokens.lead)).body as Campaign;
    expect(campaign.id).toBe(f.campaign.id);
    const released = (await call(t.http, 'get', `/api/releases/${release.id}`, f.tokens.lead)).body as Release;
    expect(released.runIds).toEqual([releasedRun.id]);
  });
});
