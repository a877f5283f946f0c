import type { Channel, ChannelAccuracy, DisplayRegion } from '@dialsheet/common';
import type { ChannelEntity } from './channel.entity';
import type { DisplayRegionEntity } from './display-region.entity';

/** The fields a client may set, in the order the wire type lists them. */
export const CHANNEL_FIELDS = [
  'name',
  'symbol',
  'quantity',
  'rawUnit',
  'resolution',
  'rangeMin',
  'rangeMax',
  'fullScale',
  'operatingMin',
  'operatingMax',
  'accuracy',
  'plausibleMin',
  'plausibleMax',
] as const;

export type ChannelField = (typeof CHANNEL_FIELDS)[number];

/** Drops absent parts so an accuracy spec has one spelling; null when nothing is left. */
export function normaliseAccuracy(accuracy: ChannelAccuracy | null | undefined): ChannelAccuracy | null {
  if (!accuracy) return null;
  const out: ChannelAccuracy = {};
  if (typeof accuracy.percentOfFullScale === 'number') out.percentOfFullScale = accuracy.percentOfFullScale;
  if (typeof accuracy.percentOfReading === 'number') out.percentOfReading = accuracy.percentOfReading;
  if (typeof accuracy.digits === 'number') out.digits = accuracy.digits;
  return Object.keys(out).length > 0 ? out : null;
}

export function toChannel(entity: ChannelEntity): Channel {
  return {
    id: entity.id,
    campaignId: entity.campaignId,
    name: entity.name,
    symbol: entity.symbol,
    quantity: entity.quantity,
    rawUnit: entity.rawUnit,
    resolution: entity.resolution,
    rangeMin: entity.rangeMin,
    rangeMax: entity.rangeMax,
    fullScale: entity.fullScale,
    operatingMin: entity.operatingMin,
    operatingMax: entity.operatingMax,
    accuracy: normaliseAccuracy(entity.accuracy),
    plausibleMin: entity.plausibleMin,
    plausibleMax: entity.plausibleMax,
    position: entity.position,
    createdAt: entity.createdAt.toISOString(),
    updatedAt: entity.updatedAt.toISOString(),
  };
}

/** The fields of a channel the audit trail records. */
export function channelSnapshot(entity: ChannelEntity): Record<string, unknown> {
  const snapshot: Record<string, unknown> = {};
  for (const key of CHANNEL_FIELDS) snapshot[key] = key === 'accuracy' ? normaliseAccuracy(entity.accuracy) : entity[key];
  return snapshot;
}

export function toDisplayRegion(entity: DisplayRegionEntity): DisplayRegion {
  return {
    runId: entity.runId,
    channelId: entity.channelId,
    x: entity.x,
    y: entity.y,
    width: entity.width,
    height: entity.height,
  };
}
