// The engineer's set-up of the demo campaign: the flow meter's calibration chain, a steady-state
// rule and a derived heat rate. No analysis is stored: the demo seeds no readings to analyse.
import type { CalibrationChain, CreateDerivedChannelRequest, CreateStabilityRuleRequest } from '@dialsheet/common';
import { compileChain, compileExpression, validateStabilityRule } from '@dialsheet/common/dist/analysis';
import type { EntityManager } from 'typeorm';
import type { CampaignEntity } from '../../modules/campaigns/campaign.entity';
import type { UserEntity } from '../../modules/users/user.entity';
import { demoAudit } from './demo-seed';

/** Full scale of the demo flow meter, standard L/min (0–5 V = 0–200, as printed on the panel). */
export const DEMO_METER_FULL_SCALE_SLPM = 200;

/**
 * Panel volts → standard L/min → g/min. The thermal mass-flow meter's ±1.5 % of full scale (a
 * typical data-sheet figure, from memory) is ±3 standard L/min at every reading, stated on the
 * first step's output as a bare ± (rectangular). Its reference conditions are 0 °C, 101.325 kPa;
 * the second step multiplies by the air density there.
 */
export const DEMO_FLOW_CHAIN: CalibrationChain = {
  steps: [
    {
      kind: 'linear',
      label: 'flow meter 0–5 V = 0–200 standard L/min',
      a: DEMO_METER_FULL_SCALE_SLPM / 5,
      b: 0,
      inputUnit: 'V',
      outputUnit: 'SLPM',
      uncertainty: {
        basis: 'absolute',
        value: 0.015 * DEMO_METER_FULL_SCALE_SLPM,
        distribution: null,
        label: '±1.5 % of full scale (200 standard L/min)',
        // One meter moved between the streams from run to run: one shared source.
        sourceId: 'demo-flow-meter/full-scale',
      },
    },
    {
      kind: 'standard-to-mass',
      label: 'standard L/min → g/min (air at 0 °C, 101.325 kPa)',
      inputUnit: 'SLPM',
      outputUnit: 'g/min',
      standardConditions: '0C',
    },
  ],
};

/** ASHRAE 93 style: an outlet is steady when it varies less than 0.05 °C per minute. */
export const DEMO_STABILITY_RULE: CreateStabilityRuleRequest = {
  name: 'Steady outlet',
  windowSeconds: 300,
  slopeLimitPerMinute: 0.05,
  bandLimit: null,
  driftLimit: null,
  channelId: null,
};

/**
 * Heat the warm stream gives up, W: ṁ [g/min] / 60 × cp [J/(g K)] × (T1 − T2). cp of dry air
 * 1.006 kJ/(kg K) (ASHRAE Handbook—Fundamentals). Meaningful in the runs with the flow meter on
 * the warm stream (runs 1 and 3).
 */
export const DEMO_DERIVED_CHANNEL: Required<CreateDerivedChannelRequest> = {
  name: 'Warm stream heat given up',
  symbol: 'Q_warm',
  unit: 'W',
  expression: 'V / 60 * cp * (T1 - T2)',
  constants: { cp: 1.006 },
};

export interface DemoAnalysisResult {
  calibrations: number;
  rules: number;
  derivedChannels: number;
}

/** Adds what is missing (matched by channel, rule name, derived symbol); an archived campaign gets nothing. */
export async function seedAnalysisSetup(manager: EntityManager, campaign: CampaignEntity, engineer: UserEntity): Promise<DemoAnalysisResult> {
  const result: DemoAnalysisResult = { calibrations: 0, rules: 0, derivedChannels: 0 };
  const [locked] = (await manager.query('SELECT status FROM campaigns WHERE id = $1 FOR UPDATE', [campaign.id])) as Array<{ status: string }>;
  if (!locked || locked.status === 'archived') return result;
  const channels = (await manager.query('SELECT id, symbol, raw_unit FROM channels WHERE campaign_id = $1', [campaign.id])) as Array<{
    id: string;
    symbol: string;
    raw_unit: string;
  }>;
  const meter = channels.find((c) => c.symbol === 'V');
  if (meter) {
    const [existing] = (await manager.query('SELECT 1 FROM channel_calibrations WHERE channel_id = $1', [meter.id])) as unknown[];
    if (!existing) {
      const compiled = compileChain(DEMO_FLOW_CHAIN, meter.raw_unit);
      await manager.query(
        `INSERT INTO channel_calibrations (channel_id, chain, engineering_unit, updated_by) VALUES ($1, $2, $3, $4)`,
        [meter.id, JSON.stringify(DEMO_FLOW_CHAIN), compiled.unit, engineer.id],
      );
      await demoAudit(manager, {
        campaignId: campaign.id,
        actorId: engineer.id,
        entityType: 'calibration',
        entityId: meter.id,
        action: 'create',
        after: { channel: 'V', chain: DEMO_FLOW_CHAIN, engineeringUnit: compiled.unit, version: 1 },
      });
      result.calibrations += 1;
    }
  }

  const [rule] = (await manager.query('SELECT 1 FROM stability_rules WHERE campaign_id = $1 AND lower(name) = lower($2)', [
    campaign.id,
    DEMO_STABILITY_RULE.name,
  ])) as unknown[];
  if (!rule) {
    validateStabilityRule(DEMO_STABILITY_RULE);
    const r = DEMO_STABILITY_RULE;
    const [row] = (await manager.query(
      `INSERT INTO stability_rules (campaign_id, channel_id, name, window_seconds, slope_limit_per_minute, band_limit, drift_limit)
       VALUES ($1, $2, $3, $4, $5, $6, $7) RETURNING id`,
      [campaign.id, r.channelId ?? null, r.name, r.windowSeconds, r.slopeLimitPerMinute ?? null, r.bandLimit ?? null, r.driftLimit ?? null],
    )) as Array<{ id: string }>;
    await demoAudit(manager, { campaignId: campaign.id, actorId: engineer.id, entityType: 'stability-rule', entityId: row.id, action: 'create', after: { ...r } });
    result.rules += 1;
  }

  const d = DEMO_DERIVED_CHANNEL;
  const symbols = channels.map((c) => c.symbol);
  const [derived] = (await manager.query('SELECT 1 FROM derived_channels WHERE campaign_id = $1 AND (symbol = $2 OR lower(name) = lower($3))', [
    campaign.id,
    d.symbol,
    d.name,
  ])) as unknown[];
  // Only with its input channels present (a campaign whose T1 or T2 was removed gets none).
  if (!derived && ['V', 'T1', 'T2'].every((s) => symbols.includes(s))) {
    const inputs = compileExpression(d.expression, symbols, d.constants).symbols.filter((s) => symbols.includes(s));
    const [row] = (await manager.query(
      `INSERT INTO derived_channels (campaign_id, name, symbol, unit, expression, constants, inputs) VALUES ($1, $2, $3, $4, $5, $6, $7) RETURNING id`,
      [campaign.id, d.name, d.symbol, d.unit, d.expression, JSON.stringify(d.constants), inputs],
    )) as Array<{ id: string }>;
    await demoAudit(manager, { campaignId: campaign.id, actorId: engineer.id, entityType: 'derived-channel', entityId: row.id, action: 'create', after: { ...d, inputs } });
    result.derivedChannels += 1;
  }
  return result;
}
