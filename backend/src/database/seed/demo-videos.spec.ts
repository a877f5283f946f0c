import { describe, expect, it } from 'vitest';
import { channelProblems } from '../../modules/channels/channel-rules';
import { sheetProblems } from '../../modules/sheets/sheet-rules';
import { DEMO_CHANNELS } from './demo-seed';
import { demoSheetEnd } from './demo-videos';

describe('demo sheet end', () => {
  it('is the last whole interval strictly before the recording ends in test time', () => {
    // The default 180 s video with its start marker at 2 s ends at test time 178 s.
    expect(demoSheetEnd(178, 5)).toBe(175);
    // Ending exactly on a row time would ask for a frame the video no longer has.
    expect(demoSheetEnd(175, 5)).toBe(170);
    // …and so would one within the microsecond that float noise and frame times carry.
    expect(demoSheetEnd(175.0000005, 5)).toBe(170);
    expect(demoSheetEnd(175.01, 5)).toBe(175);
  });

  it('gives a plan the sheet rules refuse when the video is too short for two rows', () => {
    expect(demoSheetEnd(3, 5)).toBe(0);
    expect(sheetProblems({ startTime: 0, endTime: demoSheetEnd(3, 5), interval: 5, channelIds: ['a'] })).toEqual([
      'endTime (0 s) must be after startTime (0 s)',
    ]);
  });
});

describe('demo channels', () => {
  it('pass the channel rules and carry the panel’s display keys once each', () => {
    for (const channel of DEMO_CHANNELS) expect(channelProblems(channel), channel.symbol).toEqual([]);
    expect(DEMO_CHANNELS.map((c) => c.symbol)).toEqual(['T1', 'T2', 'T3', 'T4', 'V', 'P']);
    expect(new Set(DEMO_CHANNELS.map((c) => c.name.toLowerCase())).size).toBe(DEMO_CHANNELS.length);
  });
});
