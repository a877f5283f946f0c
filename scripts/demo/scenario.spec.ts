import { describe, expect, it } from 'vitest';
import { displayRegions, filterGraph, filterPath, sendcmdScript, withRegions } from './panel';
import {
  DISPLAYS,
  HEIGHT,
  PLANT,
  RUNS,
  approach,
  buildRunTruth,
  firstFrameAtOrAfter,
  formatReading,
  frameAtVideoTime,
  frameMicros,
  laggedApproach,
  mulberry32,
  readingsAt,
  timeConstants,
  trend,
  updateSchedule,
  updateShownOnFrame,
  WIDTH,
} from './scenario';

const display = (key: string) => DISPLAYS.find((d) => d.key === key)!;

describe('trend', () => {
  it('starts at the initial state and approaches the design point', () => {
    expect(trend('T1', -1, 180, 'warm')).toBe(PLANT.ambientC);
    expect(trend('T1', 0, 180, 'warm')).toBe(PLANT.ambientC);
    expect(trend('T1', 1e6, 180, 'warm')).toBeCloseTo(PLANT.warmInSteadyC, 9);
    // One heater time constant in: 1 − 1/e of the step.
    const tau = timeConstants(180).heater;
    expect(trend('T1', tau, 180, 'warm')).toBeCloseTo(21 + 19 * (1 - Math.exp(-1)), 9);
  });

  it('is steady in the second half of a run: the last 60 s move less than one display step', () => {
    for (const key of ['T1', 'T2', 'T3', 'T4'] as const) {
      const a = trend(key, 118, 180, 'warm');
      const b = trend(key, 178, 180, 'warm');
      expect(Math.abs(b - a)).toBeLessThan(0.1);
    }
    // …while the first half is a clear transient.
    expect(trend('T4', 60, 180, 'warm') - trend('T4', 0, 180, 'warm')).toBeGreaterThan(10);
  });

  it('closes the energy balance: heat given by the warm stream equals heat taken by the cool one', () => {
    for (const t of [0, 10, 30, 90, 178]) {
      const warmSlpm = (trend('V', t, 180, 'warm') / PLANT.meterFullScaleV) * PLANT.meterFullScaleSlpm;
      const coolSlpm = (trend('V', t, 180, 'cool') / PLANT.meterFullScaleV) * PLANT.meterFullScaleSlpm;
      const given = warmSlpm * (trend('T1', t, 180, 'warm') - trend('T2', t, 180, 'warm'));
      const taken = coolSlpm * (trend('T4', t, 180, 'warm') - trend('T3', t, 180, 'warm'));
      expect(given).toBeCloseTo(taken, 9);
    }
  });

  it('puts the moved flow meter at different voltages on the two streams', () => {
    expect(trend('V', 0, 180, 'warm')).toBeCloseTo(3.2, 12);
    expect(trend('V', 0, 180, 'cool')).toBeCloseTo(2.8, 12);
    expect(trend('V', 1e6, 180, 'warm')).toBeCloseTo(3.18, 12);
  });

  it('uses closed-form first-order responses', () => {
    expect(approach(-5, 10)).toBe(0);
    expect(approach(10, 10)).toBeCloseTo(1 - Math.exp(-1), 12);
    // Lagged response: starts with zero slope, stays below its input, converges to 1.
    expect(laggedApproach(0, 20, 10)).toBe(0);
    expect(laggedApproach(0.01, 20, 10)).toBeLessThan(1e-6);
    expect(laggedApproach(15, 20, 10)).toBeLessThan(approach(15, 20));
    expect(laggedApproach(400, 20, 10)).toBeCloseTo(1, 6);
    // Equal time constants use the limit form; both sides agree near it.
    expect(laggedApproach(15, 10, 10)).toBeCloseTo(laggedApproach(15, 10, 10 + 1e-6), 5);
  });
});

describe('formatReading', () => {
  it('rounds to the display resolution with its decimals', () => {
    expect(formatReading(23.449, 0.1)).toBe('23.4');
    expect(formatReading(23.45, 0.1)).toBe('23.5');
    expect(formatReading(26.05, 0.1)).toBe('26.1');
    expect(formatReading(3.2004, 0.001)).toBe('3.200');
    expect(formatReading(3.2005, 0.001)).toBe('3.201');
    expect(formatReading(18, 0.1)).toBe('18.0');
  });

  it('rounds the gauge to the nearest half division', () => {
    expect(formatReading(6.74, 0.5)).toBe('6.5');
    expect(formatReading(6.75, 0.5)).toBe('7.0');
    expect(formatReading(7.2, 0.5)).toBe('7.0');
    expect(formatReading(7.26, 0.5)).toBe('7.5');
  });

  it('never shows a negative zero and refuses bad input', () => {
    expect(formatReading(-0.04, 0.1)).toBe('0.0');
    expect(formatReading(-0.06, 0.1)).toBe('-0.1');
    expect(() => formatReading(Number.NaN, 0.1)).toThrow(RangeError);
    expect(() => formatReading(1, 0)).toThrow(/resolution/);
  });
});

describe('update schedule', () => {
  it('refreshes each display at its own rate, after the reading already shown at 0', () => {
    const t = updateSchedule(display('T1'), 10);
    expect(t.slice(0, 4)).toEqual([0, 137_000, 637_000, 1_137_000]);
    expect(t).toHaveLength(1 + 20);
    expect(updateSchedule(display('V'), 10)).toHaveLength(1 + 40);
    expect(updateSchedule(display('P'), 10)).toHaveLength(1 + 50);
  });

  it('never refreshes exactly on a frame, so each refresh has one unambiguous first frame', () => {
    for (const d of DISPLAYS) {
      for (const us of updateSchedule(d, 180).slice(1)) {
        const k = firstFrameAtOrAfter(us);
        expect(frameMicros(k)).toBeGreaterThan(us);
        expect(frameMicros(k - 1)).toBeLessThan(us);
      }
    }
  });

  it('maps times to frames the way ffmpeg rescales 1/30 timestamps to microseconds', () => {
    expect(frameMicros(1)).toBe(33_333);
    expect(frameMicros(2)).toBe(66_667);
    expect(firstFrameAtOrAfter(0)).toBe(0);
    expect(firstFrameAtOrAfter(66_667)).toBe(2);
    expect(firstFrameAtOrAfter(66_668)).toBe(3);
    expect(firstFrameAtOrAfter(137_000)).toBe(5);
    expect(frameAtVideoTime(2)).toBe(60);
    expect(frameAtVideoTime(2 / 30)).toBe(2);
    expect(frameAtVideoTime(0.0666)).toBe(1);
  });
});

describe('buildRunTruth', () => {
  const truth = buildRunTruth(RUNS[0], 30);

  it('is deterministic for a seed and differs between runs', () => {
    expect(buildRunTruth(RUNS[0], 30)).toEqual(truth);
    const run3 = buildRunTruth(RUNS[2], 30);
    expect(run3.updates.map((u) => u.value)).not.toEqual(truth.updates.map((u) => u.value));
    expect(mulberry32(1)()).toBe(mulberry32(1)());
  });

  it('lists every refresh with its test time, value, text and first frame', () => {
    expect(truth.frameCount).toBe(900);
    expect(truth.startMarkerFrames).toEqual([60, 74]);
    const counts = Object.fromEntries(DISPLAYS.map((d) => [d.key, truth.updates.filter((u) => u.display === d.key).length]));
    expect(counts).toEqual({ T1: 61, T2: 61, T3: 61, T4: 61, V: 121, P: 151 });
    for (const u of truth.updates) {
      expect(u.testTime).toBeCloseTo(u.videoTime - 2, 9);
      expect(u.text).toBe(formatReading(u.value, display(u.display).resolution));
      expect(u.frame).toBe(firstFrameAtOrAfter(Math.round(u.videoTime * 1e6)));
    }
    for (let i = 1; i < truth.updates.length; i++) {
      expect(truth.updates[i].videoTime).toBeGreaterThanOrEqual(truth.updates[i - 1].videoTime);
    }
  });

  it('keeps the noise small: readings stay within a few standard deviations of the trend', () => {
    for (const u of truth.updates) {
      const sd = display(u.display).noiseSd;
      expect(Math.abs(u.value - trend(u.display, u.testTime, 30, 'warm'))).toBeLessThan(5 * sd);
    }
    // …and it is there: the thermometer's last digit moves while T3 sits still.
    expect(new Set(truth.updates.filter((u) => u.display === 'T3').map((u) => u.text)).size).toBeGreaterThan(1);
  });

  it('answers what any frame shows: a display holds its reading between refreshes', () => {
    const v = truth.updates.filter((u) => u.display === 'V');
    const u = v[10];
    expect(updateShownOnFrame(truth.updates, 'V', u.frame)).toBe(u);
    expect(updateShownOnFrame(truth.updates, 'V', u.frame - 1)).toBe(v[9]);
    expect(readingsAt(truth, u.frame / 30).V).toBe(u.text);
    expect(readingsAt(truth, (u.frame - 1) / 30).V).toBe(v[9].text);
    expect(Object.keys(readingsAt(truth, 0))).toEqual(['T1', 'T2', 'T3', 'T4', 'V', 'P']);
  });

  it('refuses runs shorter than 5 s', () => {
    expect(() => buildRunTruth(RUNS[0], 2)).toThrow(/at least 5 s/);
  });
});

describe('panel drawing', () => {
  const truth = buildRunTruth(RUNS[1], 10);

  it('sends a command only when a display’s text changes, at the refresh time to the microsecond', () => {
    const script = sendcmdScript(truth);
    const lines = script.trim().split('\n');
    for (const line of lines) expect(line).toMatch(/^\d+\.\d{6} (drawtext@(T[1-4]|V|P) reinit text=-?\d+\.\d+(, )?)+;$/);
    const commands = lines.flatMap((l) => [...l.matchAll(/drawtext@(\w+) reinit text=([\d.-]+)/g)].map((m) => ({ display: m[1], text: m[2] })));
    const changes = DISPLAYS.flatMap((d) => {
      const own = truth.updates.filter((u) => u.display === d.key);
      return own.filter((u, i) => i > 0 && u.text !== own[i - 1].text).map((u) => ({ display: d.key, text: u.text }));
    });
    expect(commands).toHaveLength(changes.length);
    expect(commands.sort((a, b) => a.display.localeCompare(b.display))).toEqual(changes.sort((a, b) => a.display.localeCompare(b.display)));
  });

  it('starts each display on its frame-0 reading and lights the lamp on frames 60–74', () => {
    const graph = filterGraph(truth, { regular: '/fonts/regular.ttf', bold: '/fonts/bold.ttf' }, '/work dir/commands.txt');
    for (const d of DISPLAYS) {
      const first = truth.updates.find((u) => u.display === d.key)!;
      expect(graph).toContain(`drawtext@${d.key}=fontfile='/fonts/bold.ttf':expansion=none:text='${first.text}'`);
    }
    expect(graph).toContain("enable='between(n,60,74)'");
    expect(graph).toContain("sendcmd=f='/work dir/commands.txt'");
    expect(graph).toContain('METER ON COOL STREAM');
    expect(graph).toContain('trim=end_frame=300');
    expect(graph.endsWith('[out]')).toBe(true);
  });

  it('escapes paths for the filter graph and refuses ones it cannot carry', () => {
    expect(filterPath('C:\\fonts\\a.ttf')).toBe("'C\\:\\\\fonts\\\\a.ttf'");
    expect(() => filterPath("/media/it's")).toThrow(/single quote/);
  });
});

describe('display regions in the truth file', () => {
  const truth = buildRunTruth(RUNS[0], 10);
  const graph = filterGraph(truth, { regular: 'fonts/regular.ttf', bold: 'fonts/bold.ttf' }, 'demo/commands.txt');
  const regions = displayRegions();
  const pixels = (r: { x: number; y: number; w: number; h: number }) => ({ x: r.x * WIDTH, y: r.y * HEIGHT, w: r.w * WIDTH, h: r.h * HEIGHT });

  it('gives every display exactly one region, in panel order', () => {
    expect(regions.map((r) => r.key)).toEqual(DISPLAYS.map((d) => d.key));
    const listed = withRegions(truth.displays);
    expect(listed.map((d) => d.key)).toEqual(['T1', 'T2', 'T3', 'T4', 'V', 'P']);
    expect(listed.map((d) => d.region)).toEqual(regions.map((r) => r.region));
    // The rest of each display's entry is kept as it was.
    expect(listed[4]).toMatchObject({ key: 'V', unit: 'V', resolution: 0.001 });
    expect(() => withRegions([{ key: 'X' as never }])).toThrow(/display X has no digit window/);
  });

  it('keeps every region inside the frame and apart from the others', () => {
    for (const { key, region: r } of regions) {
      expect(r.x, key).toBeGreaterThanOrEqual(0);
      expect(r.y, key).toBeGreaterThanOrEqual(0);
      expect(r.w, key).toBeGreaterThan(0);
      expect(r.h, key).toBeGreaterThan(0);
      expect(r.x + r.w, key).toBeLessThanOrEqual(1);
      expect(r.y + r.h, key).toBeLessThanOrEqual(1);
    }
    for (const [i, a] of regions.entries()) {
      for (const b of regions.slice(i + 1)) {
        const apart = a.region.x + a.region.w <= b.region.x || b.region.x + b.region.w <= a.region.x ||
          a.region.y + a.region.h <= b.region.y || b.region.y + b.region.h <= a.region.y;
        expect(apart, `${a.key} and ${b.key}`).toBe(true);
      }
    }
  });

  it('is the digit window the video draws, with the display’s digits inside it', () => {
    for (const { key, region } of regions) {
      const p = pixels(region);
      // Whole pixels: the fractions are exact enough to give back the drawn box.
      for (const v of Object.values(p)) expect(Math.abs(v - Math.round(v)), key).toBeLessThan(1e-9);
      const [x, y, w, h] = [p.x, p.y, p.w, p.h].map(Math.round);
      expect(graph, key).toContain(`drawbox=x=${x}:y=${y}:w=${w}:h=${h}:color=`);
      // The digits: right-aligned at an anchor inside the window, top and font size within it.
      const digits = new RegExp(`drawtext@${key}=[^,]*:x=(\\d+)-tw:y=(\\d+):fontsize=(\\d+)`).exec(graph);
      expect(digits, key).not.toBeNull();
      const [anchor, top, size] = digits!.slice(1).map(Number);
      expect(anchor).toBeGreaterThan(x);
      expect(anchor).toBeLessThanOrEqual(x + w);
      expect(top).toBeGreaterThanOrEqual(y);
      expect(top + size).toBeLessThanOrEqual(y + h);
    }
  });
});
