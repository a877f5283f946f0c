import type {
  ChannelCalibration,
  Analysis,
  AuditEntry,
  BalanceAnalysis,
  ChannelSpec,
  Channel,
  ChannelSeries,
  DerivedChannel,
  Page,
  Run,
  Sheet,
  StableValueAnalysis,
  StoredStabilityRule,
  TrendPoint,
} from '@dialsheet/common';
import { compileChain, evaluateStability, massBalance, measuredFromBudget, stableValue } from '@dialsheet/common/dist/analysis';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { JobsService } from '../../src/jobs/jobs.service';
import { AnalysisRecomputeJob, ANALYSIS_RECOMPUTE_QUEUE } from '../../src/modules/analyses/analysis-recompute.job';
import { TestMedia } from '../helpers/media';
import { campaignFixture, createChannel, createSyncedRun, type Fixture } from '../helpers/recordings';
import { bearer, startTestApp, type Http, type TestApp } from '../helpers/test-app';

function call(http: Http, method: 'get' | 'post' | 'put' | 'patch' | 'delete', path: string, token: string) {
  return http[method](path).set(bearer(token));
}

const gauges = [
  {
    name: 'Flow meter signal',
    symbol: 'V',
    quantity: 'voltage',
    rawUnit: 'V',
    resolution: 0.001,
    rangeMin: 0,
    rangeMax: 5,
    fullScale: 5,
    accuracy: { percentOfReading: 0.05, digits: 2 },
  },
  { name: 'Warm outlet', symbol: 'T2', quantity: 'temperature', rawUnit: '°C', resolution: 0.1, rangeMin: -50, rangeMax: 200, accuracy: { percentOfReading: 0.5, digits: 3 } },
];

// The demo flow meter: 0–5 V = 0–200 standard L/min with ±1.5 % of full scale, then mass flow at 0 °C.
const flowChain = (standardConditions: string) => ({
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
    { kind: 'standard-to-mass', inputUnit: 'SLPM', outputUnit: 'g/min', standardConditions },
  ],
});

/** The steady window: rows every 2 s from 10 to 50 s of test time (21 rows). */
const STEADY = { startTime: 10, endTime: 50, interval: 2 };
const steadyTimes = Array.from({ length: 21 }, (_, i) => 10 + 2 * i);
const wiggle = [0, 3, -2, 1, -1];
/** A slow drift with a little scatter, as typed from the display (3 decimals). */
const voltText = (i: number, scale: number) => ((2.5 + 0.002 * i + 0.001 * wiggle[i % 5]) * scale).toFixed(3);
const tempText = (i: number) => (35 + 0.1 * (i % 2) + 0.1 * Math.floor(i / 10)).toFixed(1);

describe('analyses: series, stable values, balances, stale marking', () => {
  let t: TestApp;
  let media: TestMedia;
  let f: Fixture;
  let run1: Run;
  let run2: Run;
  let V: Channel;
  let T2: Channel;
  let steady1: Sheet;
  let steady2: Sheet;
  let massRun1: StableValueAnalysis;
  let massRun2: StableValueAnalysis;
  let balance: BalanceAnalysis;

  async function openSheet(run: Run, name: string, plan: { startTime: number; endTime: number; interval: number }, channels: Channel[], checkerId = f.users.checker.id) {
    const res = await call(t.http, 'post', `/api/runs/${run.id}/sheets`, f.tokens.lead).send({ name, ...plan, channelIds: channels.map((c) => c.id) });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const assigned = await call(t.http, 'put', `/api/sheets/${(res.body as Sheet).id}/assignment`, f.tokens.lead).send({ readerId: f.users.reader.id, checkerId });
    expect(assigned.status, JSON.stringify(assigned.body)).toBe(200);
    return assigned.body as Sheet;
  }

  async function enterRow(sheet: Sheet, pass: 1 | 2, rowIndex: number, texts: Array<[Channel, string]>, token = pass === 1 ? f.tokens.reader : f.tokens.checker) {
    const res = await call(t.http, 'put', `/api/sheets/${sheet.id}/rows/${rowIndex}`, token).send({
      pass,
      readings: texts.map(([c, rawText]) => ({ channelId: c.id, rawText, frameTime: 2 + sheet.startTime + rowIndex * sheet.interval + 0.017 })),
    });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
  }

  async function fillSteady(sheet: Sheet, scale: number, pass2Rows: number) {
    for (let i = 0; i < steadyTimes.length; i++) await enterRow(sheet, 1, i, [[V, voltText(i, scale)], [T2, tempText(i)]]);
    for (let i = 0; i < pass2Rows; i++) await enterRow(sheet, 2, i, [[V, voltText(i, scale)], [T2, tempText(i)]]);
  }

  async function getAnalysis<T extends Analysis>(id: string, token = f.tokens.engineer): Promise<T> {
    const res = await call(t.http, 'get', `/api/analyses/${id}`, token);
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    return res.body as T;
  }

  async function createAnalysis<T extends Analysis>(body: object): Promise<T> {
    const res = await call(t.http, 'post', `/api/campaigns/${f.campaign.id}/analyses`, f.tokens.engineer).send(body);
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    return res.body as T;
  }

  async function setCalibration(standard: string, baseVersion?: number) {
    const res = await call(t.http, 'put', `/api/channels/${V.id}/calibration`, f.tokens.engineer).send({ chain: flowChain(standard), baseVersion });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
  }

  const spec = (): ChannelSpec => ({ id: V.id, name: V.name, rawUnit: V.rawUnit, resolution: V.resolution, fullScale: V.fullScale, accuracy: V.accuracy });

  beforeAll(async () => {
    t = await startTestApp();
    // The schedule would recompute stale analyses at the next minute, in the middle of a check
    // that they are stale; the job is run by hand below instead.
    await t.app.get(JobsService).unschedule(ANALYSIS_RECOMPUTE_QUEUE);
    media = new TestMedia();
    f = await campaignFixture(t, 'Heat-recovery core analyses');
    V = await createChannel(t.http, f.tokens.lead, f.campaign.id, gauges[0]);
    T2 = await createChannel(t.http, f.tokens.lead, f.campaign.id, gauges[1]);
    run1 = await createSyncedRun(t.http, f.tokens.lead, f.campaign.id, media);
    run2 = await createSyncedRun(t.http, f.tokens.lead, f.campaign.id, media);
    await setCalibration('0C');
  }, 180_000);
  afterAll(async () => {
    await t.close();
    media.remove();
  });

  it('gives the resolved value of each cell: agreed or resolved, one pass alone unchecked, mismatches and flags skipped', async () => {
    const sheet = await openSheet(run1, 'Series rules', { startTime: 0, endTime: 8, interval: 2 }, [V]);
    const pass1 = ['2.000', '2.010', '2.020', '#unreadable', '2.040'];
    const pass2 = ['2.0', '2.010', '2.200', '#unreadable'];
    for (const [i, text] of pass1.entries()) await enterRow(sheet, 1, i, [[V, text]]);
    for (const [i, text] of pass2.entries()) await enterRow(sheet, 2, i, [[V, text]]);

    const path = `/api/runs/${run1.id}/series/${V.id}`;
    // Pass-1 values before pass 2 exists: lead and engineer only.
    expect((await call(t.http, 'get', path, f.tokens.reader)).status).toBe(403);
    expect((await call(t.http, 'get', path, f.tokens.checker)).status).toBe(403);
    expect((await call(t.http, 'get', path, f.tokens.outsider)).status).toBe(404);
    expect((await call(t.http, 'get', `/api/runs/${run1.id}/series/00000000-0000-4000-8000-000000000000`, f.tokens.lead)).status).toBe(404);
    const res = await call(t.http, 'get', path, f.tokens.engineer);
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const series = res.body as ChannelSeries;
    const chain = compileChain(flowChain('0C') as never, 'V');
    expect(series).toMatchObject({ runId: run1.id, channelId: V.id, derived: false, symbol: 'V', rawUnit: 'V', unit: 'g/min', calibrationVersion: 1 });
    // "2.000"/"2.0" agree; row 2 differs unresolved; row 3 flagged in both; row 4 has pass 1 only.
    expect(series.t).toEqual([0, 2, 8]);
    expect(series.raw).toEqual([2, 2.01, 2.04]);
    expect(series.value).toEqual([2, 2.01, 2.04].map((x) => chain.apply(x)));
    expect(series.unchecked).toEqual([false, false, true]);
    expect(series.uncheckedCount).toBe(1);
    expect(series.skipped.map((s) => s.t)).toEqual([4, 6]);
    expect(series.skipped[0].reason).toContain('not resolved');
    expect(series.skipped[1].reason).toContain('unreadable');

    // A lead resolves the mismatch: its value joins the series.
    const resolved = await call(t.http, 'put', `/api/sheets/${sheet.id}/resolutions/2/${V.id}`, f.tokens.lead).send({ rawText: '2.020', reason: 'The frame shows 2.020' });
    expect(resolved.status, JSON.stringify(resolved.body)).toBe(200);
    const after = (await call(t.http, 'get', path, f.tokens.lead)).body as ChannelSeries;
    expect(after.t).toEqual([0, 2, 4, 8]);
    expect(after.raw).toEqual([2, 2.01, 2.02, 2.04]);
    expect(after.skipped.map((s) => s.t)).toEqual([6]);
  });

  it('computes a stable value as the common function does, refuses what it refuses with its message and stores nothing then', async () => {
    steady1 = await openSheet(run1, 'Steady', STEADY, [V, T2]);
    // Row 20 gets no second pass yet: one unchecked point.
    await fillSteady(steady1, 1, 20);
    const input = { runId: run1.id, channelId: V.id, window: { from: 10, to: 50 }, tStar: 50 };
    expect((await call(t.http, 'post', `/api/campaigns/${f.campaign.id}/analyses`, f.tokens.reader).send({ kind: 'stable-value', name: 'x', input })).status).toBe(403);
    massRun1 = await createAnalysis<StableValueAnalysis>({ kind: 'stable-value', name: 'Run 1 warm-stream mass flow', note: 'meter on warm stream', input });
    expect(massRun1).toMatchObject({ kind: 'stable-value', status: 'current', staleReason: null, runIds: [run1.id], version: 1, computedBy: { id: f.users.engineer.id } });

    // Same points, same spec, same chain, through the common function in this test (stableValue is
    // checked in common against NIST StRD Norris and Montgomery & Runger's intervals).
    const points: TrendPoint[] = steadyTimes.map((time, i) => ({ t: time, y: Number(voltText(i, 1)), unchecked: i === 20 }));
    const expected = stableValue(points, input.window, 50, spec(), flowChain('0C') as never);
    const stable = massRun1.result!.stable;
    expect(stable.unit).toBe('g/min');
    expect(stable.value).toBeCloseTo(expected.value, 9);
    expect(stable.expandedUncertainty).toBeCloseTo(expected.expandedUncertainty, 9);
    expect(stable.fit.n).toBe(21);
    expect(stable.fit.uncheckedCount).toBe(1);
    expect(massRun1.result!.stability).toBeNull();

    const refusedCount = async () => ((await call(t.http, 'get', `/api/campaigns/${f.campaign.id}/analyses`, f.tokens.reader)).body as Analysis[]).length;
    const before = await refusedCount();
    const few = await call(t.http, 'post', `/api/campaigns/${f.campaign.id}/analyses`, f.tokens.engineer).send({
      kind: 'stable-value',
      name: 'Too short',
      input: { ...input, window: { from: 10, to: 12 }, tStar: 12 },
    });
    expect(few.status).toBe(400);
    expect(few.body.message).toContain('at least 3 readings');
    const outside = await call(t.http, 'post', `/api/campaigns/${f.campaign.id}/analyses`, f.tokens.engineer).send({ kind: 'stable-value', name: 'Beyond', input: { ...input, tStar: 58 } });
    expect(outside.status).toBe(400);
    let message = '';
    try {
      stableValue(points, input.window, 58, spec(), flowChain('0C') as never);
    } catch (error) {
      message = (error as Error).message;
    }
    expect(message).not.toBe('');
    expect(outside.body.message).toBe(message);
    const shapeless = await call(t.http, 'post', `/api/campaigns/${f.campaign.id}/analyses`, f.tokens.engineer).send({ kind: 'stable-value', name: 'Bad', input: { runId: run1.id } });
    expect(shapeless.status).toBe(400);
    expect(shapeless.body.message).toContain('input.channelId must be a channel or derived channel id');
    const duplicate = await call(t.http, 'post', `/api/campaigns/${f.campaign.id}/analyses`, f.tokens.engineer).send({ kind: 'stable-value', name: 'RUN 1 warm-stream mass flow', input });
    expect(duplicate.status).toBe(409);
    expect(await refusedCount()).toBe(before);

    // A stored rule judges the window that ends at t*, in engineering units.
    const ruleRes = await call(t.http, 'post', `/api/campaigns/${f.campaign.id}/stability-rules`, f.tokens.engineer).send({
      name: 'Steady outlet',
      windowSeconds: 30,
      slopeLimitPerMinute: 0.5,
      channelId: T2.id,
    });
    expect(ruleRes.status, JSON.stringify(ruleRes.body)).toBe(201);
    const rule = ruleRes.body as StoredStabilityRule;
    const wrongChannel = await call(t.http, 'post', `/api/campaigns/${f.campaign.id}/analyses`, f.tokens.engineer).send({ kind: 'stable-value', name: 'V judged', input: { ...input, ruleId: rule.id } });
    expect(wrongChannel.status).toBe(400);
    expect(wrongChannel.body.message).toContain('is for channel T2');
    const outlet = await createAnalysis<StableValueAnalysis>({ kind: 'stable-value', name: 'Run 1 warm outlet', input: { ...input, channelId: T2.id, ruleId: rule.id } });
    const tPoints: TrendPoint[] = steadyTimes.map((time, i) => ({ t: time, y: Number(tempText(i)), unchecked: i === 20 }));
    // The common rule check (ASHRAE 93 style slope limit; common/src/analysis/stability.spec.ts).
    const verdict = evaluateStability(rule, tPoints, { end: 50, unit: '°C' });
    expect(outlet.result!.stability).toEqual(verdict);
    expect(outlet.result!.stable.unit).toBe('°C');
    expect((await call(t.http, 'delete', `/api/stability-rules/${rule.id}?baseVersion=1`, f.tokens.engineer)).status).toBe(409);

    const trail = ((await call(t.http, 'get', `/api/campaigns/${f.campaign.id}/audit?entityType=analysis&limit=50`, f.tokens.lead)).body as Page<AuditEntry>).items;
    expect(trail.filter((e) => e.action === 'create').map((e) => e.entityId).sort()).toEqual([massRun1.id, outlet.id].sort());
  });

  it('closes a mass balance across two runs with the common function’s result on the same stored values', async () => {
    steady2 = await openSheet(run2, 'Steady', STEADY, [V, T2]);
    await fillSteady(steady2, 0.99, 21);
    massRun2 = await createAnalysis<StableValueAnalysis>({
      kind: 'stable-value',
      name: 'Run 2 cool-stream mass flow',
      input: { runId: run2.id, channelId: V.id, window: { from: 10, to: 50 }, tStar: 50 },
    });
    const input = {
      streams: [
        { id: 'warm', label: 'Warm stream', side: 'in', massFlowAnalysisId: massRun1.id },
        { id: 'cool', label: 'Cool stream', side: 'out', massFlowAnalysisId: massRun2.id },
      ],
      energy: false,
    };
    const needsT = await call(t.http, 'post', `/api/campaigns/${f.campaign.id}/analyses`, f.tokens.engineer).send({ kind: 'balance', name: 'Energy', input: { ...input, energy: true } });
    expect(needsT.status).toBe(400);
    expect(needsT.body.message).toContain('input.streams.0.temperatureAnalysisId is needed for an energy balance');
    balance = await createAnalysis<BalanceAnalysis>({ kind: 'balance', name: 'Mass closure runs 1–2', input });
    expect(balance.runIds.sort()).toEqual([run1.id, run2.id].sort());

    const a1 = await getAnalysis<StableValueAnalysis>(massRun1.id);
    const a2 = await getAnalysis<StableValueAnalysis>(massRun2.id);
    // The common closure (GUM 5.2.2 with shared sources; common/src/analysis/balance.spec.ts) on
    // the budgets the server stored.
    const expected = massBalance([
      { id: 'warm', label: 'Warm stream', side: 'in', massFlow: measuredFromBudget(a1.result!.stable.budget) },
      { id: 'cool', label: 'Cool stream', side: 'out', massFlow: measuredFromBudget(a2.result!.stable.budget) },
    ]);
    expect(balance.result!.mass).toEqual(expected);
    expect(balance.result!.energy).toBeNull();
    // By construction: run 2 was typed at 0.99 × run 1 and the chain has no offset, so about −1 %.
    expect(balance.result!.mass.closurePercent).toBeCloseTo(-1, 1);

    const inUse = await call(t.http, 'delete', `/api/analyses/${massRun1.id}`, f.tokens.engineer);
    expect(inUse.status).toBe(409);
    expect(inUse.body.message).toContain('Mass closure runs 1–2');
    const byRun = (await call(t.http, 'get', `/api/campaigns/${f.campaign.id}/analyses?runId=${run2.id}`, f.tokens.checker)).body as Analysis[];
    expect(byRun.map((a) => a.name).sort()).toEqual(['Mass closure runs 1–2', 'Run 2 cool-stream mass flow']);
    const balances = (await call(t.http, 'get', `/api/campaigns/${f.campaign.id}/analyses?kind=balance`, f.tokens.reader)).body as Analysis[];
    expect(balances.map((a) => a.id)).toEqual([balance.id]);
    expect((await call(t.http, 'get', `/api/campaigns/${f.campaign.id}/analyses?kind=fit`, f.tokens.reader)).status).toBe(400);
    expect((await call(t.http, 'get', `/api/analyses/${balance.id}`, f.tokens.outsider)).status).toBe(404);
  });

  it('evaluates a derived channel at each timestamp over its inputs’ engineering values, and takes a stable value of it', async () => {
    const res = await call(t.http, 'post', `/api/campaigns/${f.campaign.id}/derived-channels`, f.tokens.engineer).send({
      name: 'Heat above 30 °C',
      symbol: 'Q30',
      unit: 'W',
      expression: 'V / 60 * cp * (T2 - 30)',
      constants: { cp: 1.006 },
    });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const q30 = res.body as DerivedChannel;
    const series = (await call(t.http, 'get', `/api/runs/${run1.id}/series/${q30.id}`, f.tokens.engineer)).body as ChannelSeries;
    const v = (await call(t.http, 'get', `/api/runs/${run1.id}/series/${V.id}`, f.tokens.engineer)).body as ChannelSeries;
    const temp = (await call(t.http, 'get', `/api/runs/${run1.id}/series/${T2.id}`, f.tokens.engineer)).body as ChannelSeries;
    expect(series).toMatchObject({ derived: true, symbol: 'Q30', unit: 'W', calibrationVersion: null });
    // Only the steady sheet reads T2: its 21 times; V's first-sheet times have no T2 and are skipped.
    expect(series.t).toEqual(steadyTimes);
    // The same arithmetic on the inputs' engineering values (g/min and °C) taken from their series.
    const expected = steadyTimes.map((time) => (v.value[v.t.indexOf(time)] / 60) * 1.006 * (temp.value[temp.t.indexOf(time)] - 30));
    series.value.forEach((value, i) => expect(value).toBeCloseTo(expected[i], 9));
    expect(series.unchecked).toEqual(steadyTimes.map((_, i) => i === 20));
    expect(series.skipped.map((k) => k.t)).toEqual([0, 2, 4, 6, 8]);
    expect(series.skipped[0].reason).toBe('no T2 reading at this time');
    // At 6 s V itself was flagged: each input's reason is named.
    expect(series.skipped[3].reason).toMatch(/^no T2 reading at this time; V: flagged unreadable in both passes \(sheet/);

    const heat = await createAnalysis<StableValueAnalysis>({
      kind: 'stable-value',
      name: 'Run 1 heat above 30 °C',
      input: { runId: run1.id, channelId: q30.id, window: { from: 10, to: 50 }, tStar: 50 },
    });
    const points: TrendPoint[] = series.t.map((time, i) => ({ t: time, y: series.value[i], unchecked: series.unchecked[i] }));
    // The common function with no calibration and no display resolution: a derived value's budget is the fit's.
    const direct = stableValue(points, { from: 10, to: 50 }, 50, { id: q30.id, rawUnit: 'W', resolution: 0 }, null, { includeResolution: false });
    expect(heat.result!.stable.value).toBeCloseTo(direct.value, 9);
    expect(heat.result!.stable.unit).toBe('W');
    // Its budget: the derived series' fit, plus each input's instrument uncertainty at t* (its
    // budget without the fit line) times ∂f/∂input, here by hand for f = V/60·cp·(T2 − 30)
    // (GUM 5.1.2, independent inputs; the server takes the derivatives by central difference).
    const calibrations = (await call(t.http, 'get', `/api/campaigns/${f.campaign.id}/calibrations`, f.tokens.engineer)).body as ChannelCalibration[];
    const vChain = compileChain(calibrations.find((c) => c.channelId === V.id)!.chain, 'V');
    const instruments = (s: ChannelSeries, channelSpec: ChannelSpec, chain: ReturnType<typeof compileChain> | null) => {
      const rawPoints: TrendPoint[] = s.t.map((time, i) => ({ t: time, y: s.raw[i], unchecked: s.unchecked[i] }));
      const at = stableValue(rawPoints, { from: 10, to: 50 }, 50, channelSpec, chain);
      const lines = at.budget.components.filter((c) => c.name !== 'trend fit at t*');
      expect(lines.length).toBeGreaterThan(0);
      return { value: at.value, u: Math.sqrt(lines.reduce((sum, c) => sum + c.contribution ** 2, 0)) };
    };
    const vAt = instruments(v, spec(), vChain);
    const tAt = instruments(temp, { id: T2.id, name: T2.name, rawUnit: T2.rawUnit, resolution: T2.resolution, fullScale: T2.fullScale, accuracy: T2.accuracy }, null);
    const cV = (1.006 * (tAt.value - 30)) / 60;
    const cT = (vAt.value * 1.006) / 60;
    const uFit = direct.budget.combinedStandardUncertainty;
    const expectedUc = Math.sqrt(uFit ** 2 + (cV * vAt.u) ** 2 + (cT * tAt.u) ** 2);
    const budget = heat.result!.stable.budget;
    expect(budget.components.map((c) => c.name).sort()).toEqual(['T2 instruments', 'V instruments', 'trend fit at t*']);
    expect(Math.abs(budget.combinedStandardUncertainty - expectedUc) / expectedUc).toBeLessThan(1e-6);
    expect(budget.combinedStandardUncertainty).toBeGreaterThan(uFit);
    expect(heat.result!.stable.expandedUncertainty).toBeCloseTo(2 * budget.combinedStandardUncertainty, 12);
    const inUse = await call(t.http, 'delete', `/api/derived-channels/${q30.id}`, f.tokens.engineer);
    expect(inUse.status).toBe(409);
    expect((await call(t.http, 'delete', `/api/analyses/${heat.id}`, f.tokens.engineer)).status).toBe(204);
    expect((await call(t.http, 'delete', `/api/derived-channels/${q30.id}`, f.tokens.engineer)).status).toBe(204);
  });

  it('marks analyses stale when their readings or calibration change, and recomputes them on request and by the job', async () => {
    // The missing second pass of row 20 arrives: run 1's readings changed.
    await enterRow(steady1, 2, 20, [[V, voltText(20, 1)], [T2, tempText(20)]]);
    const stale = await getAnalysis<StableValueAnalysis>(massRun1.id, f.tokens.reader);
    expect(stale.status).toBe('stale');
    expect(stale.staleReason).toContain(`readings of run “${run1.name}” changed`);
    expect(stale.result!.stable.fit.uncheckedCount).toBe(1);
    const staleBalance = await getAnalysis<BalanceAnalysis>(balance.id);
    expect(staleBalance.status).toBe('stale');
    expect(staleBalance.staleReason).toContain('analysis “Run 1 warm-stream mass flow” it uses is stale');

    expect((await call(t.http, 'post', `/api/analyses/${massRun1.id}/recompute`, f.tokens.reader)).status).toBe(403);
    const recomputed = await call(t.http, 'post', `/api/analyses/${massRun1.id}/recompute`, f.tokens.engineer);
    expect(recomputed.status, JSON.stringify(recomputed.body)).toBe(200);
    expect(recomputed.body).toMatchObject({ status: 'current', staleReason: null, computedBy: { id: f.users.engineer.id } });
    expect((recomputed.body as StableValueAnalysis).result!.stable.fit.uncheckedCount).toBe(0);
    expect((await getAnalysis<BalanceAnalysis>(balance.id)).staleReason).toBe('analysis “Run 1 warm-stream mass flow” was recomputed');

    // The meter's reference changes to 20 °C: both flow values go stale; the job recomputes them
    // and then the balance that uses them, as "automatic" (no person).
    await setCalibration('20C', 1);
    expect((await getAnalysis(massRun2.id)).staleReason).toBe('the calibration of V changed');
    await t.app.get(AnalysisRecomputeJob).run();
    for (const id of [massRun1.id, massRun2.id, balance.id]) {
      const a = await getAnalysis(id);
      expect(a.status, `${a.name}: ${a.staleReason}`).toBe('current');
      expect(a.computedBy).toBeNull();
    }
    const points: TrendPoint[] = steadyTimes.map((time, i) => ({ t: time, y: Number(voltText(i, 0.99)) }));
    // The common function on the 20 °C chain (density ratio per shared/reference/air-standard-density.json).
    const expected = stableValue(points, { from: 10, to: 50 }, 50, spec(), flowChain('20C') as never);
    expect((await getAnalysis<StableValueAnalysis>(massRun2.id)).result!.stable.value).toBeCloseTo(expected.value, 9);
    const trail = ((await call(t.http, 'get', `/api/campaigns/${f.campaign.id}/audit?entityType=analysis&limit=100`, f.tokens.lead)).body as Page<AuditEntry>).items;
    const automatic = trail.filter((e) => e.actorId === null && e.entityId === massRun2.id);
    expect(automatic).toHaveLength(1);
    expect(automatic[0].action).toBe('update');
    expect(automatic[0].reason).toBe('Recomputed automatically: the calibration of V changed');
    // A job with nothing stale does nothing.
    const rows = trail.length;
    await t.app.get(AnalysisRecomputeJob).run();
    expect(((await call(t.http, 'get', `/api/campaigns/${f.campaign.id}/audit?entityType=analysis&limit=100`, f.tokens.lead)).body as Page<AuditEntry>).total).toBe(rows);
  });

  it('keeps the old result, marked failed with the reason, when a recompute is refused', async () => {
    const before = await getAnalysis<StableValueAnalysis>(massRun2.id);
    // A table that stops at 1 V refuses every reading (about 2.5 V): no points are left to fit.
    const table = { steps: [{ kind: 'table', inputUnit: 'V', outputUnit: 'g/min', points: [{ raw: 0, eng: 0 }, { raw: 1, eng: 50 }] }] };
    const res = await call(t.http, 'put', `/api/channels/${V.id}/calibration`, f.tokens.engineer).send({ chain: table, baseVersion: 2 });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const failed = (await call(t.http, 'post', `/api/analyses/${massRun2.id}/recompute`, f.tokens.engineer)).body as StableValueAnalysis;
    expect(failed.status).toBe('failed');
    expect(failed.error).toContain('at least 3 readings');
    expect(failed.result).toEqual(before.result);
    await setCalibration('20C', 3);
    await t.app.get(AnalysisRecomputeJob).run();
    const back = await getAnalysis<StableValueAnalysis>(massRun2.id);
    expect(back).toMatchObject({ status: 'current', error: null });
  });

  it('renames and re-inputs an analysis against its version', async () => {
    const current = await getAnalysis<StableValueAnalysis>(massRun1.id);
    const stale = await call(t.http, 'put', `/api/analyses/${massRun1.id}`, f.tokens.engineer).send({ baseVersion: current.version + 1, name: 'x' });
    expect(stale.status).toBe(409);
    expect((stale.body.current as Analysis).version).toBe(current.version);
    const res = await call(t.http, 'put', `/api/analyses/${massRun1.id}`, f.tokens.engineer).send({
      baseVersion: current.version,
      name: 'Run 1 mass flow at 40 s',
      input: { ...current.input, tStar: 40 },
      reason: 'value taken mid-window',
    });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const updated = res.body as StableValueAnalysis;
    expect(updated).toMatchObject({ name: 'Run 1 mass flow at 40 s', version: current.version + 1, status: 'current' });
    expect(updated.result!.stable.tStar).toBe(40);
    const refused = await call(t.http, 'put', `/api/analyses/${massRun1.id}`, f.tokens.engineer).send({ baseVersion: updated.version, input: { ...current.input, window: { from: 10, to: 11 } } });
    expect(refused.status).toBe(400);
    expect((await getAnalysis<StableValueAnalysis>(massRun1.id)).result!.stable.tStar).toBe(40);
  });

  it('hides pass-1 values from the checker of an unfinished pass 2, whatever their role', async () => {
    // The engineer also takes the checker role, checks a new sheet on run 2 and has not typed pass 2.
    await t.dataSource.query(`UPDATE campaign_members SET roles = '{engineer,checker}' WHERE campaign_id = $1 AND user_id = $2`, [f.campaign.id, f.users.engineer.id]);
    await openSheet(run2, 'Engineer checks', { startTime: 0, endTime: 4, interval: 2 }, [V], f.users.engineer.id);
    const series = await call(t.http, 'get', `/api/runs/${run2.id}/series/${V.id}`, f.tokens.engineer);
    expect(series.status).toBe(403);
    expect(series.body.message).toContain('Engineer checks');
    expect((await call(t.http, 'get', `/api/runs/${run1.id}/series/${V.id}`, f.tokens.engineer)).status).toBe(200);
    const hidden = await getAnalysis<StableValueAnalysis>(massRun2.id);
    expect(hidden.result).toBeNull();
    expect(hidden.error).toContain('Engineer checks');
    expect((await getAnalysis<StableValueAnalysis>(massRun2.id, f.tokens.lead)).result).not.toBeNull();
  });
});
