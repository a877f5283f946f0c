import type { AuditEntry, Channel, ChannelCalibration, DerivedChannel, Page, StoredStabilityRule } from '@dialsheet/common';
import { AnalysisError, compileChain, compileExpression, validateStabilityRule } from '@dialsheet/common/dist/analysis';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { campaignFixture, createChannel, type Fixture } from '../helpers/recordings';
import { bearer, startTestApp, type Http, type TestApp } from '../helpers/test-app';

function call(http: Http, method: 'get' | 'post' | 'put' | 'patch' | 'delete', path: string, token: string) {
  return http[method](path).set(bearer(token));
}

async function auditOf(http: Http, token: string, campaignId: string, entityType: string): Promise<AuditEntry[]> {
  const res = await call(http, 'get', `/api/campaigns/${campaignId}/audit?entityType=${entityType}&limit=200`, token);
  expect(res.status).toBe(200);
  return (res.body as Page<AuditEntry>).items;
}

/** The message the common computation gives for a bad input (the API must pass it through). */
function refusal(work: () => unknown): string {
  try {
    work();
  } catch (error) {
    if (error instanceof AnalysisError) return error.message;
    throw error;
  }
  throw new Error('expected the computation to refuse');
}

// The demo flow meter: 0–5 V = 0–200 standard L/min (its panel), then mass flow at 0 °C.
const flowChain = {
  steps: [
    {
      kind: 'linear',
      a: 40,
      b: 0,
      inputUnit: 'V',
      outputUnit: 'SLPM',
      label: 'meter span',
      uncertainty: { basis: 'absolute', value: 3, label: '±1.5 % of full scale', sourceId: 'meter/fs' },
    },
    { kind: 'standard-to-mass', inputUnit: 'SLPM', outputUnit: 'g/min', standardConditions: '0C' },
  ],
};

const gauges = [
  { name: 'Warm inlet', symbol: 'T1', quantity: 'temperature', rawUnit: '°C', resolution: 0.1, rangeMin: -50, rangeMax: 200 },
  { name: 'Warm outlet', symbol: 'T2', quantity: 'temperature', rawUnit: '°C', resolution: 0.1, rangeMin: -50, rangeMax: 200 },
  { name: 'Flow meter signal', symbol: 'V', quantity: 'voltage', rawUnit: 'V', resolution: 0.001, rangeMin: 0, rangeMax: 5, fullScale: 5 },
];

describe('analysis set-up: calibrations, derived channels, stability rules', () => {
  let t: TestApp;
  let f: Fixture;
  let channels: Record<string, Channel>;

  beforeAll(async () => {
    t = await startTestApp();
    f = await campaignFixture(t, 'Heat-recovery core calibrations');
    channels = {};
    for (const g of gauges) channels[g.symbol] = await createChannel(t.http, f.tokens.lead, f.campaign.id, g);
  }, 60_000);
  afterAll(async () => {
    await t.close();
  });

  it('sets a chain, refuses a stale or bad one with a clear message, deletes it with its version, and audits each change', async () => {
    const path = `/api/channels/${channels.V.id}/calibration`;
    // The engineer's part: others read only; strangers see nothing.
    expect((await call(t.http, 'put', path, f.tokens.reader).send({ chain: flowChain })).status).toBe(403);
    expect((await call(t.http, 'put', path, f.tokens.lead).send({ chain: flowChain })).status).toBe(403);
    expect((await call(t.http, 'put', path, f.tokens.outsider).send({ chain: flowChain })).status).toBe(404);

    const first = await call(t.http, 'put', path, f.tokens.engineer).send({ chain: flowChain, reason: 'meter data sheet' });
    expect(first.status, JSON.stringify(first.body)).toBe(200);
    const cal = first.body as ChannelCalibration;
    expect(cal).toMatchObject({ channelId: channels.V.id, engineeringUnit: 'g/min', version: 1, updatedBy: { id: f.users.engineer.id } });
    expect(cal.chain).toEqual(flowChain);

    const listed = await call(t.http, 'get', `/api/campaigns/${f.campaign.id}/calibrations`, f.tokens.reader);
    expect(listed.status).toBe(200);
    expect((listed.body as ChannelCalibration[]).map((c) => c.channelId)).toEqual([channels.V.id]);
    expect((await call(t.http, 'get', `/api/campaigns/${f.campaign.id}/calibrations`, f.tokens.outsider)).status).toBe(404);

    // First step in mA on a volt display: compileChain's own message, as a 400.
    const wrongUnit = { steps: [{ kind: 'linear', a: 12.5, b: -50, inputUnit: 'mA', outputUnit: 'SLPM' }] };
    const bad = await call(t.http, 'put', path, f.tokens.engineer).send({ chain: wrongUnit, baseVersion: 1 });
    expect(bad.status).toBe(400);
    expect(bad.body.message).toBe(refusal(() => compileChain(wrongUnit as never, 'V')));
    expect(bad.body.message).toContain('the first step must take the display');
    const empty = await call(t.http, 'put', path, f.tokens.engineer).send({ chain: { steps: [] }, baseVersion: 1 });
    expect(empty.status).toBe(400);
    expect(empty.body.message).toContain('at least one step');
    const notAChain = await call(t.http, 'put', path, f.tokens.engineer).send({ chain: 'linear' });
    expect(notAChain.status).toBe(400);
    const flatLine = { steps: [{ kind: 'linear', a: 0, b: 1, inputUnit: 'V', outputUnit: 'SLPM' }] };
    const flat = await call(t.http, 'put', path, f.tokens.engineer).send({ chain: flatLine, baseVersion: 1 });
    expect(flat.status).toBe(400);
    expect(flat.body.message).toBe(refusal(() => compileChain(flatLine as never, 'V')));

    // A change without (or with an old) version is stale: 409 with what is stored now.
    const at20C = { steps: [flowChain.steps[0], { ...flowChain.steps[1], standardConditions: '20C' }] };
    const stale = await call(t.http, 'put', path, f.tokens.engineer).send({ chain: at20C });
    expect(stale.status).toBe(409);
    expect((stale.body.current as ChannelCalibration).version).toBe(1);
    const changed = await call(t.http, 'put', path, f.tokens.engineer).send({ chain: at20C, baseVersion: 1, reason: 'meter is referenced to 20 °C' });
    expect(changed.status, JSON.stringify(changed.body)).toBe(200);
    expect((changed.body as ChannelCalibration).version).toBe(2);

    expect((await call(t.http, 'delete', path, f.tokens.engineer)).status).toBe(400);
    const oldDelete = await call(t.http, 'delete', `${path}?baseVersion=1`, f.tokens.engineer);
    expect(oldDelete.status).toBe(409);
    expect((oldDelete.body.current as ChannelCalibration).version).toBe(2);
    expect((await call(t.http, 'delete', `${path}?baseVersion=2`, f.tokens.engineer)).status).toBe(204);
    expect((await call(t.http, 'delete', `${path}?baseVersion=2`, f.tokens.engineer)).status).toBe(404);
    expect((await call(t.http, 'get', `/api/campaigns/${f.campaign.id}/calibrations`, f.tokens.engineer)).body).toEqual([]);

    const trail = (await auditOf(t.http, f.tokens.lead, f.campaign.id, 'calibration')).filter((e) => e.entityId === channels.V.id);
    // Newest first: delete, update, create; refused attempts left no row.
    expect(trail.map((e) => e.action)).toEqual(['delete', 'update', 'create']);
    expect(trail[1].reason).toBe('meter is referenced to 20 °C');
    expect(trail[1].before).toMatchObject({ version: 1 });
  });

  it('compiles a derived channel against the campaign’s symbols, keeps symbols unique, refuses cycles and unsafe syntax', async () => {
    const base = `/api/campaigns/${f.campaign.id}/derived-channels`;
    const body = { name: 'Warm stream heat given up', symbol: 'Q_warm', unit: 'W', expression: 'V * 40 * 1.293 / 60 * cp * (T1 - T2)', constants: { cp: 1.006 } };
    expect((await call(t.http, 'post', base, f.tokens.reader).send(body)).status).toBe(403);
    const created = await call(t.http, 'post', base, f.tokens.engineer).send(body);
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    const q = created.body as DerivedChannel;
    // The inputs are the channel symbols the expression uses (mathjs parser, sorted).
    expect(q.inputs).toEqual(compileExpression(body.expression, ['T1', 'T2', 'V'], body.constants).symbols.filter((s) => s !== 'cp'));
    expect(q).toMatchObject({ symbol: 'Q_warm', unit: 'W', constants: { cp: 1.006 }, version: 1 });

    const unknown = await call(t.http, 'post', base, f.tokens.engineer).send({ ...body, name: 'Other', symbol: 'Q2', expression: 'T9 * 2' });
    expect(unknown.status).toBe(400);
    expect(unknown.body.message).toContain('unknown symbol "T9"');
    const assignment = await call(t.http, 'post', base, f.tokens.engineer).send({ ...body, name: 'Other', symbol: 'Q2', expression: 'T1 = 2' });
    expect(assignment.status).toBe(400);
    expect(assignment.body.message).toBe(refusal(() => compileExpression('T1 = 2', ['T1', 'T2', 'V', 'Q_warm'], body.constants)));
    expect((await call(t.http, 'post', base, f.tokens.engineer).send({ ...body, name: 'Other', symbol: 'T1' })).status).toBe(409);
    expect((await call(t.http, 'post', base, f.tokens.engineer).send({ ...body, symbol: 'Q3' })).status).toBe(409);
    const badSymbol = await call(t.http, 'post', base, f.tokens.engineer).send({ ...body, name: 'Other', symbol: '2Q' });
    expect(badSymbol.status).toBe(400);

    // dT uses nothing derived; kW uses Q_warm; making Q_warm use kW would be a cycle.
    const kw = await call(t.http, 'post', base, f.tokens.engineer).send({ name: 'Heat in kW', symbol: 'Q_kW', unit: 'kW', expression: 'Q_warm / 1000' });
    expect(kw.status, JSON.stringify(kw.body)).toBe(201);
    const cycle = await call(t.http, 'patch', `/api/derived-channels/${q.id}`, f.tokens.engineer).send({ expression: 'Q_kW * 1000', baseVersion: 1 });
    expect(cycle.status).toBe(400);
    expect(cycle.body.message).toContain('Q_warm → Q_kW → Q_warm');

    const stale = await call(t.http, 'patch', `/api/derived-channels/${q.id}`, f.tokens.engineer).send({ unit: 'kJ/s', baseVersion: 5 });
    expect(stale.status).toBe(409);
    expect((stale.body.current as DerivedChannel).version).toBe(1);
    const patched = await call(t.http, 'patch', `/api/derived-channels/${q.id}`, f.tokens.engineer).send({ expression: 'V * 51.72 / 60 * cp * (T1 - T2)', baseVersion: 1 });
    expect(patched.status, JSON.stringify(patched.body)).toBe(200);
    expect((patched.body as DerivedChannel).version).toBe(2);
    // Renaming or deleting a symbol another derived channel uses is refused.
    expect((await call(t.http, 'patch', `/api/derived-channels/${q.id}`, f.tokens.engineer).send({ symbol: 'Qw', baseVersion: 2 })).status).toBe(409);
    const inUse = await call(t.http, 'delete', `/api/derived-channels/${q.id}`, f.tokens.engineer);
    expect(inUse.status).toBe(409);
    expect(inUse.body.message).toContain('Heat in kW');
    expect((await call(t.http, 'delete', `/api/derived-channels/${(kw.body as DerivedChannel).id}`, f.tokens.engineer)).status).toBe(204);

    const listed = (await call(t.http, 'get', base, f.tokens.checker)).body as DerivedChannel[];
    expect(listed.map((d) => d.symbol)).toEqual(['Q_warm']);
    const trail = await auditOf(t.http, f.tokens.lead, f.campaign.id, 'derived-channel');
    // Newest first: kW deleted, Q_warm changed, kW created, Q_warm created.
    expect(trail.map((e) => e.action)).toEqual(['delete', 'update', 'create', 'create']);
  });

  it('stores named stability rules checked like the computation checks them', async () => {
    const base = `/api/campaigns/${f.campaign.id}/stability-rules`;
    // ASHRAE 93 style: steady when the outlet varies less than 0.05 °C per minute over 5 minutes.
    const rule = { name: 'Steady outlet', windowSeconds: 300, slopeLimitPerMinute: 0.05, channelId: channels.T2.id };
    expect((await call(t.http, 'post', base, f.tokens.checker).send(rule)).status).toBe(403);
    const created = await call(t.http, 'post', base, f.tokens.engineer).send(rule);
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    const stored = created.body as StoredStabilityRule;
    expect(stored).toMatchObject({ ...rule, bandLimit: null, driftLimit: null, version: 1 });

    const noLimit = { name: 'No limit', windowSeconds: 60 };
    const refused = await call(t.http, 'post', base, f.tokens.engineer).send(noLimit);
    expect(refused.status).toBe(400);
    expect(refused.body.message).toBe(refusal(() => validateStabilityRule(noLimit)));
    const negative = await call(t.http, 'post', base, f.tokens.engineer).send({ name: 'Neg', windowSeconds: 60, bandLimit: -1 });
    expect(negative.status).toBe(400);
    expect((await call(t.http, 'post', base, f.tokens.engineer).send({ ...rule, name: 'steady OUTLET' })).status).toBe(409);
    const foreign = await call(t.http, 'post', base, f.tokens.engineer).send({ ...rule, name: 'Other', channelId: '00000000-0000-4000-8000-000000000000' });
    expect(foreign.status).toBe(400);

    expect((await call(t.http, 'patch', `/api/stability-rules/${stored.id}`, f.tokens.engineer).send({ bandLimit: 0.3 })).status).toBe(400);
    const patched = await call(t.http, 'patch', `/api/stability-rules/${stored.id}`, f.tokens.engineer).send({ bandLimit: 0.3, baseVersion: 1 });
    expect(patched.status, JSON.stringify(patched.body)).toBe(200);
    expect(patched.body).toMatchObject({ bandLimit: 0.3, slopeLimitPerMinute: 0.05, version: 2 });
    expect((await call(t.http, 'get', base, f.tokens.reader)).body).toHaveLength(1);
    expect((await call(t.http, 'delete', `/api/stability-rules/${stored.id}?baseVersion=1`, f.tokens.engineer)).status).toBe(409);
    expect((await call(t.http, 'delete', `/api/stability-rules/${stored.id}?baseVersion=2`, f.tokens.engineer)).status).toBe(204);
    const trail = await auditOf(t.http, f.tokens.lead, f.campaign.id, 'stability-rule');
    expect(trail.map((e) => e.action)).toEqual(['delete', 'update', 'create']);
  });
});
