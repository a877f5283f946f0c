// Everything of a campaign an analysis reads besides the readings: channels with their specs,
// calibrations, derived channels and rules, loaded once per request or job pass.
import type { ChannelAccuracy } from '@dialsheet/common';
import type { EntityManager } from 'typeorm';
import {
  campaignCalibrations,
  campaignDerivedChannels,
  campaignStabilityRules,
  type CalibrationRow,
  type DerivedChannelRow,
  type StabilityRuleRow,
} from '../calibrations/calibration-records';

export interface ChannelSpecRow {
  id: string;
  campaign_id: string;
  name: string;
  symbol: string;
  raw_unit: string;
  resolution: number;
  full_scale: number | null;
  accuracy: ChannelAccuracy | null;
  updated_at: Date;
}

export interface CampaignContext {
  campaignId: string;
  channels: Map<string, ChannelSpecRow>;
  derived: Map<string, DerivedChannelRow>;
  calibrations: Map<string, CalibrationRow>;
  rules: Map<string, StabilityRuleRow>;
  /** Channel and derived-channel symbols → id (channels win; symbols are kept apart on write). */
  symbols: Map<string, string>;
}

export async function loadContext(manager: EntityManager, campaignId: string): Promise<CampaignContext> {
  const channels = (await manager.query(
    `SELECT id, campaign_id, name, symbol, raw_unit, resolution, full_scale, accuracy, updated_at
       FROM channels WHERE campaign_id = $1 ORDER BY position, id`,
    [campaignId],
  )) as ChannelSpecRow[];
  const derived = await campaignDerivedChannels(manager, campaignId);
  const calibrations = await campaignCalibrations(manager, campaignId);
  const rules = await campaignStabilityRules(manager, campaignId);
  const symbols = new Map<string, string>();
  for (const d of derived) symbols.set(d.symbol, d.id);
  for (const c of channels) symbols.set(c.symbol, c.id);
  return {
    campaignId,
    channels: new Map(channels.map((c) => [c.id, c])),
    derived: new Map(derived.map((d) => [d.id, d])),
    calibrations: new Map(calibrations.map((c) => [c.channel_id, c])),
    rules: new Map(rules.map((r) => [r.id, r])),
    symbols,
  };
}
