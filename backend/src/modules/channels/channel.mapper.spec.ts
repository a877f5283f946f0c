import { describe, expect, it } from 'vitest';
import { ChannelEntity } from './channel.entity';
import { channelSnapshot, normaliseAccuracy, toChannel, toDisplayRegion } from './channel.mapper';
import { DisplayRegionEntity } from './display-region.entity';

const channel = Object.assign(new ChannelEntity(), {
  id: '5a0c4c8e-1f7e-4b2a-9d55-0e3f2b1a7c01',
  campaignId: '0b8e6c1e-3f0e-4d8e-9a51-2c7d1f2e9a01',
  name: 'Warm stream inlet temperature',
  symbol: 'T1',
  quantity: 'temperature',
  rawUnit: '°C',
  resolution: 0.1,
  rangeMin: -50,
  rangeMax: 200,
  fullScale: null,
  operatingMin: -40,
  operatingMax: 180,
  accuracy: { percentOfReading: 0.5, digits: 2, percentOfFullScale: null },
  plausibleMin: 5,
  plausibleMax: 90,
  position: 3,
  createdAt: new Date('2025-01-02T03:04:05.000Z'),
  updatedAt: new Date('2025-01-03T03:04:05.000Z'),
});

describe('toChannel', () => {
  it('maps every wire field, with ISO times and the accuracy spec without empty parts', () => {
    expect(toChannel(channel)).toEqual({
      id: channel.id,
      campaignId: channel.campaignId,
      name: 'Warm stream inlet temperature',
      symbol: 'T1',
      quantity: 'temperature',
      rawUnit: '°C',
      resolution: 0.1,
      rangeMin: -50,
      rangeMax: 200,
      fullScale: null,
      operatingMin: -40,
      operatingMax: 180,
      accuracy: { percentOfReading: 0.5, digits: 2 },
      plausibleMin: 5,
      plausibleMax: 90,
      position: 3,
      createdAt: '2025-01-02T03:04:05.000Z',
      updatedAt: '2025-01-03T03:04:05.000Z',
    });
  });
});

describe('normaliseAccuracy', () => {
  it('keeps the numbers given, zero included, and turns an empty spec into null', () => {
    expect(normaliseAccuracy({ percentOfFullScale: 0, percentOfReading: null })).toEqual({ percentOfFullScale: 0 });
    expect(normaliseAccuracy({ percentOfReading: null, digits: undefined })).toBeNull();
    expect(normaliseAccuracy(null)).toBeNull();
    expect(normaliseAccuracy(undefined)).toBeNull();
  });
});

describe('channelSnapshot', () => {
  it('records the settable fields only (no ids, position or times)', () => {
    const snapshot = channelSnapshot(channel);
    expect(Object.keys(snapshot)).toEqual([
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
    ]);
    expect(snapshot.accuracy).toEqual({ percentOfReading: 0.5, digits: 2 });
    expect(snapshot.rawUnit).toBe('°C');
  });
});

describe('toDisplayRegion', () => {
  it('maps the run, the channel and the box', () => {
    const region = Object.assign(new DisplayRegionEntity(), {
      runId: 'r1',
      channelId: channel.id,
      x: 0.1,
      y: 0.2,
      width: 0.3,
      height: 0.05,
    });
    expect(toDisplayRegion(region)).toEqual({ runId: 'r1', channelId: channel.id, x: 0.1, y: 0.2, width: 0.3, height: 0.05 });
  });
});
