import type { AuditEntry, Page, Run } from '@dialsheet/common';
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { campaignFixture, createRun, MEMBERS, VIEWERS, type Fixture } from '../helpers/recordings';
import { bearer, startTestApp, type Http, type TestApp } from '../helpers/test-app';

function call(http: Http, method: 'get' | 'post' | 'patch' | 'put' | 'delete', path: string, token?: string) {
  const req = http[method](path);
  return token ? req.set(bearer(token)) : req;
}

describe('runs', () => {
  let t: TestApp;
  let f: Fixture;
  beforeAll(async () => {
    t = await startTestApp({ env: { WORKER: 'off' } });
  });
  afterAll(() => t.close());
  beforeEach(async () => {
    f = await campaignFixture(t);
  });

  it('lead and engineer create runs; every member lists and reads them, oldest first', async () => {
    const res = await call(t.http, 'post', `/api/campaigns/${f.campaign.id}/runs`, f.tokens.lead).send({
      name: '  Run 1 — meter on warm stream ',
      runDate: '2025-03-14',
      configuration: 'flow meter on warm stream',
      operator: 'E. Engineer',
      notes: 'Heater at 2 kW; ducts insulated.',
    });
    expect(res.status).toBe(201);
    expect(res.body).toEqual({
      id: expect.any(String),
      campaignId: f.campaign.id,
      name: 'Run 1 — meter on warm stream',
      runDate: '2025-03-14',
      configuration: 'flow meter on warm stream',
      operator: 'E. Engineer',
      notes: 'Heater at 2 kW; ducts insulated.',
      sync: null,
      recording: null,
      createdAt: expect.any(String),
      updatedAt: expect.any(String),
    });
    const second = await createRun(t.http, f.tokens.engineer, f.campaign.id, 'Run 2 — meter on cool stream');
    expect(second.runDate).toBeNull();
    for (const actor of MEMBERS) {
      const list = await call(t.http, 'get', `/api/campaigns/${f.campaign.id}/runs`, f.tokens[actor]);
      expect(list.status, actor).toBe(200);
      expect((list.body as Run[]).map((r) => r.name)).toEqual(['Run 1 — meter on warm stream', 'Run 2 — meter on cool stream']);
      const one = await call(t.http, 'get', `/api/runs/${second.id}`, f.tokens[actor]);
      expect(one.status, actor).toBe(200);
      expect(one.body).toEqual(second);
    }
  });

  it('refuses readers and checkers (403), hides runs from strangers (404) and needs a token (401)', async () => {
    const run = await createRun(t.http, f.tokens.lead, f.campaign.id);
    for (const actor of VIEWERS) {
      const create = await call(t.http, 'post', `/api/campaigns/${f.campaign.id}/runs`, f.tokens[actor]).send({ name: 'x' });
      expect(create.status, actor).toBe(403);
      expect(create.body.message).toBe('This needs the Lead or Engineer role in this campaign');
      expect((await call(t.http, 'patch', `/api/runs/${run.id}`, f.tokens[actor]).send({ name: 'x' })).status, actor).toBe(403);
      expect((await call(t.http, 'delete', `/api/runs/${run.id}`, f.tokens[actor])).status, actor).toBe(403);
      const sync = await call(t.http, 'put', `/api/runs/${run.id}/sync`, f.tokens[actor]).send({ first: { videoTime: 1, testTime: 0 } });
      expect(sync.status, actor).toBe(403);
    }
    const stranger = f.tokens.outsider;
    const list = await call(t.http, 'get', `/api/campaigns/${f.campaign.id}/runs`, stranger);
    expect(list.status).toBe(404);
    expect(list.body.message).toBe('Campaign not found');
    const sync = { first: { videoTime: 1, testTime: 0 } };
    for (const [method, path, body] of [
      ['get', `/api/runs/${run.id}`, {}],
      ['patch', `/api/runs/${run.id}`, { name: 'x' }],
      ['delete', `/api/runs/${run.id}`, {}],
      ['put', `/api/runs/${run.id}/sync`, sync],
      ['get', `/api/runs/${run.id}/recording`, {}],
      ['delete', `/api/runs/${run.id}/recording`, {}],
    ] as const) {
      const res = await call(t.http, method, path, stranger).send(body);
      expect(res.status, `${method} ${path}`).toBe(404);
      expect(res.body.message, `${method} ${path}`).toBe('Run not found');
      expect((await call(t.http, method, path).send(body)).status, `${method} ${path} without token`).toBe(401);
    }
    for (const id of [randomUUID(), 'not-a-uuid']) {
      const res = await call(t.http, 'get', `/api/runs/${id}`, f.tokens.lead);
      expect(res.status).toBe(404);
      expect(res.body.message).toBe('Run not found');
    }
    expect((await call(t.http, 'post', `/api/campaigns/${f.campaign.id}/runs`).send({ name: 'x' })).status).toBe(401);
  });

  it('answers 400 naming the field and saves nothing', async () => {
    const cases: Array<[Record<string, unknown>, string]> = [
      [{}, 'name should not be empty'],
      [{ name: '   ' }, 'name should not be empty'],
      [{ name: 'x'.repeat(201) }, 'name must be shorter than or equal to 200 characters'],
      [{ name: 'ok', runDate: '14.03.2025' }, 'runDate must be a date written YYYY-MM-DD'],
      [{ name: 'ok', runDate: '2025-02-30' }, 'runDate must be a date written YYYY-MM-DD'],
      [{ name: 'ok', configuration: 5 }, 'configuration must be a string'],
      [{ name: 'ok', campaignId: randomUUID() }, 'property campaignId should not exist'],
    ];
    for (const [body, message] of cases) {
      const res = await call(t.http, 'post', `/api/campaigns/${f.campaign.id}/runs`, f.tokens.lead).send(body);
      expect(res.status, JSON.stringify(body)).toBe(400);
      expect(res.body.message).toContain(message);
    }
    expect((await call(t.http, 'get', `/api/campaigns/${f.campaign.id}/runs`, f.tokens.lead)).body).toEqual([]);
  });

  it('updates only what changed, with old and new values and the reason in the audit trail', async () => {
    const run = await createRun(t.http, f.tokens.lead, f.campaign.id);
    const res = await call(t.http, 'patch', `/api/runs/${run.id}`, f.tokens.engineer).send({
      configuration: 'flow meter on cool stream',
      runDate: '2025-03-15',
      name: run.name,
      reason: 'meter was moved before filming',
    });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ configuration: 'flow meter on cool stream', runDate: '2025-03-15', name: run.name });
    const cleared = await call(t.http, 'patch', `/api/runs/${run.id}`, f.tokens.engineer).send({ runDate: null });
    expect(cleared.body.runDate).toBeNull();
    const bad = await call(t.http, 'patch', `/api/runs/${run.id}`, f.tokens.engineer).send({ name: '' });
    expect(bad.status).toBe(400);
    expect(bad.body.message).toContain('name should not be empty');

    const audit = await call(t.http, 'get', `/api/campaigns/${f.campaign.id}/audit?entityType=run`, f.tokens.lead);
    const items = (audit.body as Page<AuditEntry>).items;
    expect(items.map((e) => e.action)).toEqual(['update', 'update', 'create']);
    expect(items[1]).toMatchObject({
      entityId: run.id,
      actorId: f.users.engineer.id,
      before: { configuration: 'flow meter on warm stream', runDate: null },
      after: { configuration: 'flow meter on cool stream', runDate: '2025-03-15' },
      reason: 'meter was moved before filming',
    });
    expect(items[0]).toMatchObject({ before: { runDate: '2025-03-15' }, after: { runDate: null } });
  });

  it('deletes a run (204) with an audit row; the id is gone afterwards', async () => {
    const run = await createRun(t.http, f.tokens.lead, f.campaign.id);
    expect((await call(t.http, 'delete', `/api/runs/${run.id}`, f.tokens.engineer)).status).toBe(204);
    expect((await call(t.http, 'get', `/api/runs/${run.id}`, f.tokens.lead)).status).toBe(404);
    const audit = await call(t.http, 'get', `/api/campaigns/${f.campaign.id}/audit?entityType=run&action=delete`, f.tokens.lead);
    expect((audit.body as Page<AuditEntry>).items).toEqual([
      expect.objectContaining({ entityId: run.id, before: expect.objectContaining({ name: run.name }), after: null }),
    ]);
  });

  it('keeps runs of an archived campaign read-only', async () => {
    const run = await createRun(t.http, f.tokens.lead, f.campaign.id);
    expect((await call(t.http, 'post', `/api/campaigns/${f.campaign.id}/archive`, f.tokens.lead).send({})).status).toBe(200);
    const archived = 'This campaign is archived and read-only; restore it first';
    const create = await call(t.http, 'post', `/api/campaigns/${f.campaign.id}/runs`, f.tokens.lead).send({ name: 'late' });
    expect(create.status).toBe(409);
    expect(create.body.message).toBe(archived);
    const patch = await call(t.http, 'patch', `/api/runs/${run.id}`, f.tokens.lead).send({ name: 'late' });
    expect(patch.status).toBe(409);
    expect((await call(t.http, 'delete', `/api/runs/${run.id}`, f.tokens.lead)).status).toBe(409);
    const upload = await call(t.http, 'post', `/api/runs/${run.id}/recording`, f.tokens.lead).attach('file', Buffer.from('x'), 'clip.mp4');
    expect(upload.status).toBe(409);
    expect(upload.body.message).toBe(archived);
    expect((await call(t.http, 'get', `/api/runs/${run.id}`, f.tokens.reader)).status).toBe(200);
  });

  it('documents every route in the OpenAPI description', async () => {
    const doc = await t.http.get('/api/docs-json');
    const paths = Object.keys(doc.body.paths as object);
    for (const path of [
      '/api/campaigns/{campaignId}/runs',
      '/api/runs/{runId}',
      '/api/runs/{runId}/sync',
      '/api/runs/{runId}/recording',
      '/api/recordings/{recordingId}/frames',
      '/api/recordings/{recordingId}/media-urls',
      '/api/media/{recordingId}/{kind}',
    ]) {
      expect(paths, path).toContain(path);
    }
  });
});
