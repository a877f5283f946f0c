// Wire-shaped calibrations, series and analyses for component tests of the analysis pages. Results
// are computed with the common functions (never typed in), so they stay consistent with the code.
import type {
  Channel,
  ChannelCalibration,
  ChannelSeries,
  StableValueAnalysis,
  StoredStabilityRule,
  TimeWindow,
} from '@dialsheet/common';
import { stableValue } from '../utils/analysis-lib';
import { channelSpecFor, rawPoints } from '../utils/stable-preview';

const at = '2026-03-02T09:15:00.000Z';
export const ANALYSIS_CAMPAIGN_ID = '10000000-0000-4000-8000-000000000001';
export const RUN_1_ID = '30000000-0000-4000-8000-000000000001';
export const RUN_2_ID = '30000000-0000-4000-8000-000000000002';

export function makeFlowChannel(overrides: Partial<Channel> = {}): Channel {
  return {
    id: '50000000-0000-4000-8000-000000000003',
    campaignId: ANALYSIS_CAMPAIGN_ID,
    name: 'Flow meter output',
    symbol: 'V1',
    quantity: 'voltage',
    rawUnit: 'V',
    resolution: 0.001,
    rangeMin: 0,
    rangeMax: 5,
    fullScale: 5,
    operatingMin: null,
    operatingMax: null,
    accuracy: { percentOfFullScale: 1.5 },
    plausibleMin: 0,
    plausibleMax: 5,
    position: 0,
    createdAt: at,
    updatedAt: at,
    ...overrides,
  };
}

export function makeTempChannel(overrides: Partial<Channel> = {}): Channel {
  return makeFlowChannel({
    id: '50000000-0000-4000-8000-000000000001',
    name: 'Warm stream inlet temperature',
    symbol: 'T1',
    quantity: 'temperature',
    rawUnit: '°C',
    resolution: 0.1,
    rangeMin: -50,
    rangeMax: 200,
    fullScale: null,
    accuracy: { digits: 2, percentOfReading: 0.5 },
    position: 1,
    ...overrides,
  });
}

/** 0–5 V → standard L/min (0–175 SLPM meter with a bypass passing 7.947×: common practice) → g/min. */
export function makeFlowCalibration(overrides: Partial<ChannelCalibration> = {}): ChannelCalibration {
  return {
    channelId: makeFlowChannel().id,
    chain: {
      steps: [
        { kind: 'linear', a: (175 * 7.947) / 5, b: 0, inputUnit: 'V', outputUnit: 'SLPM', label: 'meter span × bypass', uncertainty: null },
        { kind: 'standard-to-mass', standardConditions: '21.1C', inputUnit: 'SLPM', outputUnit: 'g/min', label: null, uncertainty: null },
      ],
    },
    engineeringUnit: 'g/min',
    version: 3,
    updatedAt: at,
    updatedBy: { id: '00000000-0000-4000-8000-000000000001', displayName: 'Erik Engineer' },
    ...overrides,
  };
}

/**
 * A settling reading every 2 s: y = base + drift·t + a fixed ripple (no randomness, so the test's
 * expected numbers are reproducible). Every `uncheckedEvery`-th point is a first-pass value only.
 */
export function makeSeries(options: { count?: number; base?: number; drift?: number; channel?: Channel; uncheckedEvery?: number; runId?: string; toEngineering?: (raw: number) => number; unit?: string } = {}): ChannelSeries {
  const { count = 30, base = 2.5, drift = 0.0004, uncheckedEvery = 7, runId = RUN_1_ID } = options;
  const channel = options.channel ?? makeFlowChannel();
  const t = Array.from({ length: count }, (_, i) => 2 * i);
  const raw = t.map((ti, i) => Number((base + drift * ti + 0.003 * Math.sin(i * 1.7)).toFixed(3)));
  const unchecked = t.map((_, i) => uncheckedEvery > 0 && i % uncheckedEvery === uncheckedEvery - 1);
  const convert = options.toEngineering ?? ((x: number) => x);
  return {
    runId,
    channelId: channel.id,
    derived: false,
    symbol: channel.symbol,
    rawUnit: channel.rawUnit,
    unit: options.unit ?? channel.rawUnit,
    t,
    raw,
    value: raw.map(convert),
    unchecked,
    uncheckedCount: unchecked.filter(Boolean).length,
    skipped: [],
    calibrationVersion: options.toEngineering ? 3 : null,
  };
}

export function makeRule(overrides: Partial<StoredStabilityRule> = {}): StoredStabilityRule {
  return {
    id: '70000000-0000-4000-8000-000000000001',
    campaignId: ANALYSIS_CAMPAIGN_ID,
    channelId: null,
    name: 'Steady 40 s',
    windowSeconds: 40,
    slopeLimitPerMinute: 0.05,
    bandLimit: 0.02,
    driftLimit: null,
    version: 1,
    createdAt: at,
    updatedAt: at,
    ...overrides,
  };
}

/** A saved stable value whose result is what the common code computes for the series. */
export function makeStableAnalysis(options: {
  id: string;
  name: string;
  series: ChannelSeries;
  channel: Channel;
  calibration?: ChannelCalibration | null;
  window?: TimeWindow;
  tStar?: number;
  status?: StableValueAnalysis['status'];
  staleReason?: string | null;
}): StableValueAnalysis {
  const { series, channel } = options;
  const window = options.window ?? { from: series.t[0], to: series.t[series.t.length - 1] };
  const tStar = options.tStar ?? window.to;
  const stable = stableValue(rawPoints(series), window, tStar, channelSpecFor(series, channel), options.calibration?.chain ?? null, {});
  return {
    id: options.id,
    campaignId: ANALYSIS_CAMPAIGN_ID,
    kind: 'stable-value',
    name: options.name,
    note: null,
    runIds: [series.runId],
    status: options.status ?? 'current',
    staleReason: options.staleReason ?? null,
    error: null,
    computedAt: at,
    computedBy: { id: '00000000-0000-4000-8000-000000000001', displayName: 'Erik Engineer' },
    version: 1,
    createdAt: at,
    updatedAt: at,
    input: { runId: series.runId, channelId: series.channelId, window, tStar, ruleId: null },
    result: { stable, stability: null },
  };
}
