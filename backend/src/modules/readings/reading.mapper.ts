import { checkLimits, type Reading, type Resolution } from '@dialsheet/common';
import type { ChannelEntity } from '../channels/channel.entity';
import type { ReadingEntity } from './reading.entity';
import type { ResolutionEntity } from './resolution.entity';

/** Warnings are computed on every send rather than stored: limits may be corrected later. */
export function toReading(entity: ReadingEntity, channel: Pick<ChannelEntity, 'plausibleMin' | 'plausibleMax' | 'operatingMin' | 'operatingMax'> | undefined): Reading {
  return {
    sheetId: entity.sheetId,
    rowIndex: entity.rowIndex,
    channelId: entity.channelId,
    pass: entity.pass,
    rawText: entity.rawText,
    value: entity.value,
    flag: entity.flag,
    frameTime: entity.frameTime,
    enteredBy: entity.enteredBy,
    version: entity.version,
    updatedAt: entity.updatedAt.toISOString(),
    warnings: entity.value !== null && channel ? checkLimits(entity.value, channel) : [],
  };
}

export function toResolution(entity: ResolutionEntity): Resolution {
  return {
    sheetId: entity.sheetId,
    rowIndex: entity.rowIndex,
    channelId: entity.channelId,
    rawText: entity.rawText,
    value: entity.value,
    flag: entity.flag,
    reason: entity.reason,
    resolvedBy: entity.resolvedBy,
    resolvedAt: entity.updatedAt.toISOString(),
    version: entity.version,
  };
}
