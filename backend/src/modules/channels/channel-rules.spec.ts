import { plainToInstance } from 'class-transformer';
import { validate } from 'class-validator';
import { describe, expect, it } from 'vitest';
import { channelProblems, regionProblems, type ChannelNumbers } from './channel-rules';
import { CreateChannelDto } from './dto/create-channel.dto';
import { SetDisplayRegionsDto } from './dto/set-display-regions.dto';

const sound: ChannelNumbers = {
  resolution: 0.01,
  rangeMin: 0,
  rangeMax: 10,
  fullScale: 10,
  operatingMin: 0,
  operatingMax: 10,
  accuracy: { percentOfFullScale: 0.1, percentOfReading: 0.5, digits: 2 },
  plausibleMin: 0.5,
  plausibleMax: 5,
};

describe('channelProblems', () => {
  it('accepts a sound channel and one with every optional part absent', () => {
    expect(channelProblems(sound)).toEqual([]);
    const bare = { ...sound, fullScale: null, operatingMin: null, operatingMax: null, accuracy: null, plausibleMin: null, plausibleMax: null };
    expect(channelProblems(bare)).toEqual([]);
  });

  it('names each broken rule with its fields', () => {
    expect(channelProblems({ ...sound, resolution: 0 })).toEqual(['resolution must be greater than 0, got 0']);
    expect(channelProblems({ ...sound, resolution: -0.1 })).toEqual(['resolution must be greater than 0, got -0.1']);
    expect(channelProblems({ ...sound, rangeMin: 10 })).toEqual(['rangeMin (10) must be less than rangeMax (10)']);
    expect(channelProblems({ ...sound, fullScale: 0 })).toEqual(['fullScale must be greater than 0, got 0']);
    expect(channelProblems({ ...sound, operatingMin: 11 })).toEqual(['operatingMin (11) must be less than operatingMax (10)']);
    expect(channelProblems({ ...sound, plausibleMin: 6 })).toEqual(['plausibleMin (6) must be less than plausibleMax (5)']);
    expect(channelProblems({ ...sound, accuracy: { percentOfReading: -1 } })).toEqual(['accuracy.percentOfReading must not be negative, got -1']);
  });

  it('checks a bound only when both ends are given', () => {
    expect(channelProblems({ ...sound, operatingMin: 50, operatingMax: null, plausibleMin: null, plausibleMax: -3 })).toEqual([]);
  });

  it('lists several problems in a fixed order', () => {
    expect(channelProblems({ ...sound, resolution: 0, plausibleMin: 9 })).toEqual([
      'resolution must be greater than 0, got 0',
      'plausibleMin (9) must be less than plausibleMax (5)',
    ]);
  });
});

describe('regionProblems', () => {
  it('accepts a box inside the frame, touching the edges within float error', () => {
    expect(regionProblems({ x: 0, y: 0, width: 1, height: 1 }, 'regions.0')).toEqual([]);
    expect(regionProblems({ x: 0.7, y: 0.6, width: 0.3, height: 0.4 }, 'regions.0')).toEqual([]);
  });

  it('refuses boxes that leave the frame or have no area, naming the element', () => {
    expect(regionProblems({ x: 0.8, y: 0, width: 0.3, height: 0.1 }, 'regions.2')).toEqual([
      'regions.2: x + width must not exceed 1 (the right edge of the frame)',
    ]);
    expect(regionProblems({ x: 0, y: 0.95, width: 0.1, height: 0.1 }, 'regions.0')).toEqual([
      'regions.0: y + height must not exceed 1 (the bottom edge of the frame)',
    ]);
    expect(regionProblems({ x: -0.1, y: 0, width: 0.1, height: 0 }, 'regions.1')).toEqual([
      'regions.1.x must be a fraction of the frame between 0 and 1, got -0.1',
      'regions.1.height must be a fraction of the frame above 0 and at most 1, got 0',
    ]);
  });
});

async function messages(cls: new () => object, body: object): Promise<string[]> {
  const errors = await validate(plainToInstance(cls, body), { whitelist: true, forbidNonWhitelisted: true });
  const flat = (list: typeof errors, prefix = ''): string[] =>
    list.flatMap((e) => [
      ...Object.values(e.constraints ?? {}).map((m) => `${prefix}${m}`),
      ...flat(e.children ?? [], `${prefix}${e.property}.`),
    ]);
  return flat(errors);
}

const body = { name: ' T1 inlet ', symbol: 'T1', quantity: 'temperature', rawUnit: '°C', resolution: 0.1, rangeMin: -50, rangeMax: 200 };

describe('CreateChannelDto', () => {
  it('accepts a minimal channel and trims its texts', async () => {
    expect(await messages(CreateChannelDto, body)).toEqual([]);
    expect(plainToInstance(CreateChannelDto, body).name).toBe('T1 inlet');
  });

  it('names the field of each bad value', async () => {
    expect(await messages(CreateChannelDto, { ...body, name: '  ' })).toContain('name should not be empty');
    expect(await messages(CreateChannelDto, { ...body, resolution: '0.1' })).toEqual(['resolution must be a number']);
    expect(await messages(CreateChannelDto, { ...body, rangeMax: undefined })).toEqual(['rangeMax must be a number']);
    expect(await messages(CreateChannelDto, { ...body, fullScale: 'big' })).toEqual(['fullScale must be a number or null']);
    expect(await messages(CreateChannelDto, { ...body, accuracy: { digits: 1.5 } })).toEqual(['accuracy.digits must be a whole number of counts']);
    expect(await messages(CreateChannelDto, { ...body, accuracy: { percentOfReading: -2 } })).toEqual([
      'accuracy.percentOfReading must not be negative',
    ]);
    expect(await messages(CreateChannelDto, { ...body, accuracy: 5 })).toContain(
      'accuracy must be an object {percentOfFullScale, percentOfReading, digits} or null',
    );
  });

  it('lets optional limits be null', async () => {
    expect(await messages(CreateChannelDto, { ...body, fullScale: null, accuracy: null, plausibleMin: null })).toEqual([]);
  });
});

describe('SetDisplayRegionsDto', () => {
  const region = { channelId: '5a0c4c8e-1f7e-4b2a-9d55-0e3f2b1a7c01', x: 0.1, y: 0.1, width: 0.2, height: 0.1 };
  it('names the element and field of a bad region', async () => {
    expect(await messages(SetDisplayRegionsDto, { regions: [region] })).toEqual([]);
    expect(await messages(SetDisplayRegionsDto, { regions: [region, { ...region, width: 0 }] })).toEqual([
      'regions.1.width must be a fraction of the frame above 0 and at most 1',
    ]);
    expect(await messages(SetDisplayRegionsDto, { regions: [{ ...region, channelId: 'x', y: 1.5 }] })).toEqual([
      'regions.0.channelId must be a channel id (UUID)',
      'regions.0.y must be a fraction of the frame between 0 and 1',
    ]);
    expect(await messages(SetDisplayRegionsDto, {})).toContain('regions must be an array');
  });
});
