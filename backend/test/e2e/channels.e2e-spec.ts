import type { AuditEntry, Channel, DisplayRegion, Page } from '@dialsheet/common';
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { campaignFixture, createRun, MEMBERS, VIEWERS, type Fixture } from '../helpers/recordings';
import { bearer, startTestApp, type Http, type TestApp } from '../helpers/test-app';

function call(http: Http, method: 'get' | 'post' | 'patch' | 'put' | 'delete', path: string, token?: string) {
  const req = http[method](path);
  return token ? req.set(bearer(token)) : req;
}

const thermometer = {
  name: 'Warm stream inlet temperature',
  symbol: 'T1',
  quantity: 'temperature',
  rawUnit: '°C',
  resolution: 0.1,
  rangeMin: -50,
  rangeMax: 200,
  operatingMin: -40,
  operatingMax: 180,
  accuracy: { percentOfReading: 0.5, digits: 2 },
  plausibleMin: 5,
  plausibleMax: 90,
};
const voltmeter = {
  name: 'Flow meter output',
  symbol: 'V1',
  quantity: 'voltage',
  rawUnit: 'V',
  resolution: 0.001,
  rangeMin: 0,
  rangeMax: 10,
  fullScale: 10,
  accuracy: { percentOfFullScale: 0.1 },
};
const gauge = { name: 'Supply pressure', symbol: 'P1', quantity: 'pressure', rawUnit: 'kPa', resolution: 1, rangeMin: 0, rangeMax: 600 };

async function createChannel(http: Http, token: string, campaignId: string, body: object): Promise<Channel> {
  const res = await call(http, 'post', `/api/campaigns/${campaignId}/channels`, token).send(body);
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body as Channel;
}

async function auditOf(http: Http, token: string, campaignId: string, entityType: string): Promise<AuditEntry[]> {
  const res = await call(http, 'get', `/api/campaigns/${campaignId}/audit?entityType=${entityType}&limit=200`, token);
  expect(res.status).toBe(200);
  return (res.body as Page<AuditEntry>).items;
}

describe('channels and display regions', () => {
  let t: TestApp;
  let f: Fixture;
  beforeAll(async () => {
    t = await startTestApp({ env: { WORKER: 'off' } });
  });
  afterAll(() => t.close());
  beforeEach(async () => {
    f = await campaignFixture(t);
  });

  it('lead and engineer add channels; every member lists them in order', async () => {
    const res = await call(t.http, 'post', `/api/campaigns/${f.campaign.id}/channels`, f.tokens.engineer).send({
      ...thermometer,
      name: '  Warm stream inlet temperature ',
    });
    expect(res.status).toBe(201);
    expect(res.body).toEqual({
      id: expect.any(String),
      campaignId: f.campaign.id,
      ...thermometer,
      fullScale: null,
      position: 0,
      createdAt: expect.any(String),
      updatedAt: expect.any(String),
    });
    const second = await createChannel(t.http, f.tokens.lead, f.campaign.id, voltmeter);
    expect(second).toMatchObject({ position: 1, fullScale: 10, accuracy: { percentOfFullScale: 0.1 }, plausibleMin: null, operatingMax: null });
    for (const actor of MEMBERS) {
      const list = await call(t.http, 'get', `/api/campaigns/${f.campaign.id}/channels`, f.tokens[actor]);
      expect(list.status, actor).toBe(200);
      expect((list.body as Channel[]).map((c) => [c.symbol, c.position])).toEqual([
        ['T1', 0],
        ['V1', 1],
      ]);
    }
  });

  it('refuses readers and checkers (403), hides channels from strangers (404) and needs a token (401)', async () => {
    const channel = await createChannel(t.http, f.tokens.lead, f.campaign.id, thermometer);
    const run = await createRun(t.http, f.tokens.lead, f.campaign.id);
    const region = { regions: [{ channelId: channel.id, x: 0.1, y: 0.1, width: 0.2, height: 0.1 }] };
    const writes = [
      ['post', `/api/campaigns/${f.campaign.id}/channels`, gauge],
      ['put', `/api/campaigns/${f.campaign.id}/channels/order`, { channelIds: [channel.id] }],
      ['patch', `/api/channels/${channel.id}`, { symbol: 'Tx' }],
      ['delete', `/api/channels/${channel.id}`, {}],
      ['put', `/api/runs/${run.id}/display-regions`, region],
    ] as const;
    for (const actor of VIEWERS) {
      for (const [method, path, body] of writes) {
        const res = await call(t.http, method, path, f.tokens[actor]).send(body);
        expect(res.status, `${actor} ${method} ${path}`).toBe(403);
        expect(res.body.message).toBe('This needs the Lead or Engineer role in this campaign');
      }
      expect((await call(t.http, 'get', `/api/runs/${run.id}/display-regions`, f.tokens[actor])).status).toBe(200);
    }
    const reads = [
      ['get', `/api/campaigns/${f.campaign.id}/channels`, {}, 'Campaign not found'],
      ['get', `/api/runs/${run.id}/display-regions`, {}, 'Run not found'],
    ] as const;
    const notFound: Record<string, string> = {
      [`/api/campaigns/${f.campaign.id}/channels`]: 'Campaign not found',
      [`/api/campaigns/${f.campaign.id}/channels/order`]: 'Campaign not found',
      [`/api/channels/${channel.id}`]: 'Channel not found',
      [`/api/runs/${run.id}/display-regions`]: 'Run not found',
    };
    for (const [method, path, body] of [...writes, ...reads]) {
      const res = await call(t.http, method, path, f.tokens.outsider).send(body);
      expect(res.status, `${method} ${path}`).toBe(404);
      expect(res.body.message, `${method} ${path}`).toBe(notFound[path]);
      expect((await call(t.http, method, path).send(body)).status, `${method} ${path} without token`).toBe(401);
    }
    for (const id of [randomUUID(), 'not-a-uuid']) {
      const res = await call(t.http, 'patch', `/api/channels/${id}`, f.tokens.lead).send({ symbol: 'x' });
      expect(res.status).toBe(404);
      expect(res.body.message).toBe('Channel not found');
    }
    // Nothing the refused callers sent was saved.
    const list = await call(t.http, 'get', `/api/campaigns/${f.campaign.id}/channels`, f.tokens.lead);
    expect(list.body).toEqual([channel]);
    expect((await call(t.http, 'get', `/api/runs/${run.id}/display-regions`, f.tokens.lead)).body).toEqual([]);
  });

  it('answers 400 naming the field, for bad values and for limits that contradict each other, and saves nothing', async () => {
    const cases: Array<[Record<string, unknown>, string]> = [
      [{ ...thermometer, name: '   ' }, 'name should not be empty'],
      [{ ...thermometer, symbol: undefined }, 'symbol should not be empty'],
      [{ ...thermometer, rawUnit: 5 }, 'rawUnit must be a string'],
      [{ ...thermometer, resolution: '0.1' }, 'resolution must be a number'],
      [{ ...thermometer, rangeMin: null }, 'rangeMin must be a number'],
      [{ ...thermometer, fullScale: 'full' }, 'fullScale must be a number or null'],
      [{ ...thermometer, accuracy: { digits: -1 } }, 'accuracy.digits must not be negative'],
      [{ ...thermometer, accuracy: { percentOfFullScale: -0.5 } }, 'accuracy.percentOfFullScale must not be negative'],
      [{ ...thermometer, accuracy: { margin: 3 } }, 'accuracy.property margin should not exist'],
      [{ ...thermometer, campaignId: randomUUID() }, 'property campaignId should not exist'],
      [{ ...thermometer, resolution: 0 }, 'resolution must be greater than 0, got 0'],
      [{ ...thermometer, rangeMin: 200 }, 'rangeMin (200) must be less than rangeMax (200)'],
      [{ ...thermometer, fullScale: -10 }, 'fullScale must be greater than 0, got -10'],
      [{ ...thermometer, operatingMin: 190 }, 'operatingMin (190) must be less than operatingMax (180)'],
      [{ ...thermometer, plausibleMax: 1 }, 'plausibleMin (5) must be less than plausibleMax (1)'],
    ];
    for (const [body, message] of cases) {
      const res = await call(t.http, 'post', `/api/campaigns/${f.campaign.id}/channels`, f.tokens.lead).send(body);
      expect(res.status, JSON.stringify(body)).toBe(400);
      expect(res.body.message, JSON.stringify(body)).toContain(message);
    }
    expect((await call(t.http, 'get', `/api/campaigns/${f.campaign.id}/channels`, f.tokens.lead)).body).toEqual([]);
  });

  it('judges a change against the stored values, records old and new in the audit trail', async () => {
    const channel = await createChannel(t.http, f.tokens.lead, f.campaign.id, thermometer);
    const crossed = await call(t.http, 'patch', `/api/channels/${channel.id}`, f.tokens.engineer).send({ plausibleMin: 95 });
    expect(crossed.status).toBe(400);
    expect(crossed.body.message).toContain('plausibleMin (95) must be less than plausibleMax (90)');
    const nullRange = await call(t.http, 'patch', `/api/channels/${channel.id}`, f.tokens.engineer).send({ rangeMax: null });
    expect(nullRange.status).toBe(400);
    expect(nullRange.body.message).toContain('rangeMax must be a number');

    const res = await call(t.http, 'patch', `/api/channels/${channel.id}`, f.tokens.engineer).send({
      plausibleMin: 10,
      plausibleMax: 95,
      operatingMin: null,
      accuracy: { percentOfReading: 0.3, digits: 1 },
      symbol: 'T1',
      reason: 'plausible band from the heater set-point',
    });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ plausibleMin: 10, plausibleMax: 95, operatingMin: null, accuracy: { percentOfReading: 0.3, digits: 1 } });
    const unchanged = await call(t.http, 'patch', `/api/channels/${channel.id}`, f.tokens.engineer).send({ symbol: 'T1' });
    expect(unchanged.status).toBe(200);

    const items = await auditOf(t.http, f.tokens.lead, f.campaign.id, 'channel');
    expect(items.map((e) => e.action)).toEqual(['update', 'create']);
    expect(items[0]).toMatchObject({
      entityId: channel.id,
      actorId: f.users.engineer.id,
      before: { plausibleMin: 5, plausibleMax: 90, operatingMin: -40, accuracy: { percentOfReading: 0.5, digits: 2 } },
      after: { plausibleMin: 10, plausibleMax: 95, operatingMin: null, accuracy: { percentOfReading: 0.3, digits: 1 } },
      reason: 'plausible band from the heater set-point',
    });
    expect(Object.keys(items[0].after ?? {}).sort()).toEqual(['accuracy', 'operatingMin', 'plausibleMax', 'plausibleMin']);
    expect(items[1]).toMatchObject({ actorId: f.users.lead.id, after: expect.objectContaining({ name: thermometer.name, rawUnit: '°C' }) });
  });

  it('refuses a second channel of the same name in a campaign (409), in any case, but allows it elsewhere', async () => {
    const first = await createChannel(t.http, f.tokens.lead, f.campaign.id, thermometer);
    const other = await createChannel(t.http, f.tokens.lead, f.campaign.id, voltmeter);
    const dup = await call(t.http, 'post', `/api/campaigns/${f.campaign.id}/channels`, f.tokens.lead).send({
      ...gauge,
      name: 'WARM STREAM INLET TEMPERATURE',
    });
    expect(dup.status).toBe(409);
    expect(dup.body.message).toBe('A channel named “WARM STREAM INLET TEMPERATURE” already exists in this campaign');
    const rename = await call(t.http, 'patch', `/api/channels/${other.id}`, f.tokens.lead).send({ name: thermometer.name });
    expect(rename.status).toBe(409);
    expect(rename.body.message).toBe(`A channel named “${thermometer.name}” already exists in this campaign`);
    const recase = await call(t.http, 'patch', `/api/channels/${first.id}`, f.tokens.lead).send({ name: 'warm stream inlet temperature' });
    expect(recase.status).toBe(200);

    const elsewhere = await campaignFixture(t, 'Second rig');
    await createChannel(t.http, elsewhere.tokens.lead, elsewhere.campaign.id, thermometer);
  });

  it('reorders channels, refusing a list that is not every channel once, and deletes with renumbering', async () => {
    const a = await createChannel(t.http, f.tokens.lead, f.campaign.id, thermometer);
    const b = await createChannel(t.http, f.tokens.lead, f.campaign.id, voltmeter);
    const c = await createChannel(t.http, f.tokens.lead, f.campaign.id, gauge);
    const order = `/api/campaigns/${f.campaign.id}/channels/order`;
    for (const [channelIds, message] of [
      [[a.id, b.id], 'channelIds must list every channel of this campaign exactly once (3 channels)'],
      [[a.id, b.id, c.id, randomUUID()], 'channelIds must list every channel of this campaign exactly once (3 channels)'],
      [[a.id, a.id, b.id], 'channelIds must not list a channel twice'],
      [['nope'], 'channelIds must contain channel ids (UUIDs)'],
      ['x', 'channelIds must be an array of channel ids'],
    ] as const) {
      const res = await call(t.http, 'put', order, f.tokens.lead).send({ channelIds });
      expect(res.status, JSON.stringify(channelIds)).toBe(400);
      expect(res.body.message).toContain(message);
    }
    const res = await call(t.http, 'put', order, f.tokens.engineer).send({ channelIds: [c.id, a.id, b.id] });
    expect(res.status).toBe(200);
    expect((res.body as Channel[]).map((ch) => [ch.symbol, ch.position])).toEqual([
      ['P1', 0],
      ['T1', 1],
      ['V1', 2],
    ]);
    const moves = (await auditOf(t.http, f.tokens.lead, f.campaign.id, 'channel')).filter((e) => e.reason === 'Channels reordered');
    expect(moves.map((e) => [e.entityId, e.before, e.after]).sort()).toEqual(
      [
        [a.id, { position: 0 }, { position: 1 }],
        [b.id, { position: 1 }, { position: 2 }],
        [c.id, { position: 2 }, { position: 0 }],
      ].sort(),
    );

    expect((await call(t.http, 'delete', `/api/channels/${a.id}`, f.tokens.engineer)).status).toBe(204);
    const after = await call(t.http, 'get', `/api/campaigns/${f.campaign.id}/channels`, f.tokens.reader);
    expect((after.body as Channel[]).map((ch) => [ch.symbol, ch.position])).toEqual([
      ['P1', 0],
      ['V1', 1],
    ]);
    expect((await call(t.http, 'patch', `/api/channels/${a.id}`, f.tokens.lead).send({ symbol: 'x' })).status).toBe(404);
    const deleted = (await auditOf(t.http, f.tokens.lead, f.campaign.id, 'channel')).filter((e) => e.action === 'delete');
    expect(deleted).toEqual([
      expect.objectContaining({ entityId: a.id, actorId: f.users.engineer.id, before: expect.objectContaining({ name: thermometer.name }) }),
    ]);
    // A new channel goes to the end of the renumbered list.
    expect((await createChannel(t.http, f.tokens.lead, f.campaign.id, thermometer)).position).toBe(2);
  });

  it('replaces a run’s display regions, lists them in channel order and audits each change', async () => {
    const t1 = await createChannel(t.http, f.tokens.lead, f.campaign.id, thermometer);
    const v1 = await createChannel(t.http, f.tokens.lead, f.campaign.id, voltmeter);
    const run = await createRun(t.http, f.tokens.lead, f.campaign.id);
    const path = `/api/runs/${run.id}/display-regions`;
    const first = await call(t.http, 'put', path, f.tokens.engineer).send({
      regions: [
        { channelId: v1.id, x: 0.7, y: 0.6, width: 0.3, height: 0.4 },
        { channelId: t1.id, x: 0, y: 0, width: 0.25, height: 0.1 },
      ],
    });
    expect(first.status, JSON.stringify(first.body)).toBe(200);
    const expected: DisplayRegion[] = [
      { runId: run.id, channelId: t1.id, x: 0, y: 0, width: 0.25, height: 0.1 },
      { runId: run.id, channelId: v1.id, x: 0.7, y: 0.6, width: 0.3, height: 0.4 },
    ];
    expect(first.body).toEqual(expected);
    for (const actor of MEMBERS) {
      const list = await call(t.http, 'get', path, f.tokens[actor]);
      expect(list.status).toBe(200);
      expect(list.body).toEqual(expected);
    }
    const second = await call(t.http, 'put', path, f.tokens.lead).send({
      regions: [{ channelId: t1.id, x: 0.05, y: 0.05, width: 0.25, height: 0.1 }],
      reason: 'camera nudged',
    });
    expect(second.body).toEqual([{ runId: run.id, channelId: t1.id, x: 0.05, y: 0.05, width: 0.25, height: 0.1 }]);
    // The same set again changes nothing and writes no audit row.
    expect((await call(t.http, 'put', path, f.tokens.lead).send({ regions: [{ channelId: t1.id, x: 0.05, y: 0.05, width: 0.25, height: 0.1 }] })).status).toBe(200);

    const items = await auditOf(t.http, f.tokens.lead, f.campaign.id, 'display-region');
    expect(items).toHaveLength(2);
    expect(items[0]).toMatchObject({
      entityId: run.id,
      action: 'update',
      actorId: f.users.lead.id,
      before: { regions: expected.map(({ runId: _runId, ...box }) => box) },
      after: { regions: [{ channelId: t1.id, x: 0.05, y: 0.05, width: 0.25, height: 0.1 }] },
      reason: 'camera nudged',
    });
    expect(items[1]).toMatchObject({ actorId: f.users.engineer.id, before: { regions: [] } });

    // Deleting the channel takes its regions in every run with it.
    expect((await call(t.http, 'delete', `/api/channels/${t1.id}`, f.tokens.lead)).status).toBe(204);
    expect((await call(t.http, 'get', path, f.tokens.lead)).body).toEqual([]);
  });

  it('refuses regions outside the frame, of foreign channels or listed twice (400), keeping the saved set', async () => {
    const t1 = await createChannel(t.http, f.tokens.lead, f.campaign.id, thermometer);
    const run = await createRun(t.http, f.tokens.lead, f.campaign.id);
    const elsewhere = await campaignFixture(t, 'Another rig');
    const foreign = await createChannel(t.http, elsewhere.tokens.lead, elsewhere.campaign.id, thermometer);
    const path = `/api/runs/${run.id}/display-regions`;
    const saved = { channelId: t1.id, x: 0.1, y: 0.1, width: 0.2, height: 0.1 };
    expect((await call(t.http, 'put', path, f.tokens.lead).send({ regions: [saved] })).status).toBe(200);

    const cases: Array<[unknown, string]> = [
      [[{ ...saved, x: -0.1 }], 'regions.0.x must be a fraction of the frame between 0 and 1'],
      [[{ ...saved, y: 1.2 }], 'regions.0.y must be a fraction of the frame between 0 and 1'],
      [[{ ...saved, width: 0 }], 'regions.0.width must be a fraction of the frame above 0 and at most 1'],
      [[{ ...saved, height: 'tall' }], 'regions.0.height must be a number'],
      [[{ ...saved, x: 0.9, width: 0.2 }], 'regions.0: x + width must not exceed 1 (the right edge of the frame)'],
      [[saved, { ...saved, y: 0.95, height: 0.1 }], 'regions.1: y + height must not exceed 1 (the bottom edge of the frame)'],
      [[saved, saved], 'regions.1.channelId: the channel already has a region in this request'],
      [[{ ...saved, channelId: 'T1' }], 'regions.0.channelId must be a channel id (UUID)'],
      [[{ ...saved, channelId: foreign.id }], 'regions.0.channelId is not a channel of this run’s campaign'],
      [[{ ...saved, channelId: randomUUID() }], 'regions.0.channelId is not a channel of this run’s campaign'],
      ['all', 'regions must be an array'],
    ];
    for (const [regions, message] of cases) {
      const res = await call(t.http, 'put', path, f.tokens.lead).send({ regions });
      expect(res.status, JSON.stringify(regions)).toBe(400);
      expect(res.body.message, JSON.stringify(regions)).toContain(message);
    }
    expect((await call(t.http, 'get', path, f.tokens.lead)).body).toEqual([{ runId: run.id, ...saved }]);
  });

  it('keeps channels and regions of an archived campaign read-only', async () => {
    const channel = await createChannel(t.http, f.tokens.lead, f.campaign.id, thermometer);
    const run = await createRun(t.http, f.tokens.lead, f.campaign.id);
    expect((await call(t.http, 'post', `/api/campaigns/${f.campaign.id}/archive`, f.tokens.lead).send({})).status).toBe(200);
    const archived = 'This campaign is archived and read-only; restore it first';
    for (const [method, path, body] of [
      ['post', `/api/campaigns/${f.campaign.id}/channels`, gauge],
      ['put', `/api/campaigns/${f.campaign.id}/channels/order`, { channelIds: [channel.id] }],
      ['patch', `/api/channels/${channel.id}`, { symbol: 'Tx' }],
      ['delete', `/api/channels/${channel.id}`, {}],
      ['put', `/api/runs/${run.id}/display-regions`, { regions: [{ channelId: channel.id, x: 0, y: 0, width: 0.1, height: 0.1 }] }],
    ] as const) {
      const res = await call(t.http, method, path, f.tokens.lead).send(body);
      expect(res.status, `${method} ${path}`).toBe(409);
      expect(res.body.message).toBe(archived);
    }
    const list = await call(t.http, 'get', `/api/campaigns/${f.campaign.id}/channels`, f.tokens.reader);
    expect(list.body).toEqual([channel]);
  });

  it('documents every route in the OpenAPI description', async () => {
    const doc = await t.http.get('/api/docs-json');
    const paths = doc.body.paths as Record<string, Record<string, { tags?: string[] }>>;
    for (const [path, method] of [
      ['/api/campaigns/{campaignId}/channels', 'get'],
      ['/api/campaigns/{campaignId}/channels', 'post'],
      ['/api/campaigns/{campaignId}/channels/order', 'put'],
      ['/api/channels/{channelId}', 'patch'],
      ['/api/channels/{channelId}', 'delete'],
      ['/api/runs/{runId}/display-regions', 'get'],
      ['/api/runs/{runId}/display-regions', 'put'],
    ]) {
      expect(paths[path]?.[method]?.tags, `${method} ${path}`).toEqual(['channels']);
    }
  });
});
