// Rows of the analysis set-up tables as the database returns them, and their wire shapes. Read with
// SQL rather than entities: the columns are mostly jsonb that the wire types describe already.
import type { CalibrationChain, ChannelCalibration, DerivedChannel, StoredStabilityRule } from '@dialsheet/common';
import type { EntityManager } from 'typeorm';
import { iso } from './analysis-input';

export interface CalibrationRow {
  channel_id: string;
  chain: CalibrationChain;
  engineering_unit: string;
  version: number;
  updated_at: Date;
  updated_by: string | null;
  updated_by_name: string | null;
  campaign_id: string;
}

export interface DerivedChannelRow {
  id: string;
  campaign_id: string;
  name: string;
  symbol: string;
  unit: string;
  expression: string;
  constants: Record<string, number>;
  inputs: string[];
  version: number;
  created_at: Date;
  updated_at: Date;
}

export interface StabilityRuleRow {
  id: string;
  campaign_id: string;
  channel_id: string | null;
  name: string;
  window_seconds: number;
  slope_limit_per_minute: number | null;
  band_limit: number | null;
  drift_limit: number | null;
  version: number;
  created_at: Date;
  updated_at: Date;
}

export function toCalibration(row: CalibrationRow): ChannelCalibration {
  return {
    channelId: row.channel_id,
    chain: row.chain,
    engineeringUnit: row.engineering_unit,
    version: row.version,
    updatedAt: iso(row.updated_at),
    updatedBy: row.updated_by ? { id: row.updated_by, displayName: row.updated_by_name ?? 'Former member' } : null,
  };
}

export function toDerivedChannel(row: DerivedChannelRow): DerivedChannel {
  return {
    id: row.id,
    campaignId: row.campaign_id,
    name: row.name,
    symbol: row.symbol,
    unit: row.unit,
    expression: row.expression,
    constants: row.constants,
    inputs: row.inputs,
    version: row.version,
    createdAt: iso(row.created_at),
    updatedAt: iso(row.updated_at),
  };
}

export function toStabilityRule(row: StabilityRuleRow): StoredStabilityRule {
  return {
    id: row.id,
    campaignId: row.campaign_id,
    channelId: row.channel_id,
    name: row.name,
    windowSeconds: row.window_seconds,
    slopeLimitPerMinute: row.slope_limit_per_minute,
    bandLimit: row.band_limit,
    driftLimit: row.drift_limit,
    version: row.version,
    createdAt: iso(row.created_at),
    updatedAt: iso(row.updated_at),
  };
}

const CALIBRATION_SELECT = `
  SELECT cc.channel_id, cc.chain, cc.engineering_unit, cc.version, cc.updated_at, cc.updated_by,
         u.name AS updated_by_name, c.campaign_id
    FROM channel_calibrations cc
    JOIN channels c ON c.id = cc.channel_id
    LEFT JOIN users u ON u.id = cc.updated_by`;

export async function campaignCalibrations(manager: EntityManager, campaignId: string): Promise<CalibrationRow[]> {
  return (await manager.query(`${CALIBRATION_SELECT} WHERE c.campaign_id = $1 ORDER BY c.position, c.id`, [campaignId])) as CalibrationRow[];
}

export async function channelCalibration(manager: EntityManager, channelId: string): Promise<CalibrationRow | null> {
  const [row] = (await manager.query(`${CALIBRATION_SELECT} WHERE cc.channel_id = $1`, [channelId])) as CalibrationRow[];
  return row ?? null;
}

export async function campaignDerivedChannels(manager: EntityManager, campaignId: string): Promise<DerivedChannelRow[]> {
  return (await manager.query('SELECT * FROM derived_channels WHERE campaign_id = $1 ORDER BY created_at, id', [campaignId])) as DerivedChannelRow[];
}

export async function campaignStabilityRules(manager: EntityManager, campaignId: string): Promise<StabilityRuleRow[]> {
  return (await manager.query('SELECT * FROM stability_rules WHERE campaign_id = $1 ORDER BY lower(name), id', [campaignId])) as StabilityRuleRow[];
}
