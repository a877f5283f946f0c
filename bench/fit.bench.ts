// `npm run bench -- fit`: trend fit + stable value + uncertainty budget over 100 000 readings, as
// the server computes a stored result and the browser a live preview while the engineer drags
// the window. The readings are the demo rig's flow meter read as volts on a panel voltmeter
// (rounded to 1 mV), converted through volts → standard L/min → g/min; the window holds all of
// them. One sample is one whole `stableValue` call: window selection, conversion, the fits in
// engineering and raw units with residuals, the value at t* with both intervals, and the budget.
// Baseline, measured in the same run: a bare single-pass sum over the same array of points.
// Figures: median, p95 and min of both; target median ≤ 50 ms. The code is imported from the
// sources of common/ (not its build), so the figure is always of the current code.
import os from 'node:os';
import type { CalibrationChain, ChannelSpec, TrendPoint } from '../common/src';
import { scaledOutputStep, stableValue } from '../common/src/analysis';
import { runBenchmark } from './lib/harness';
import { median, percentile, round } from './lib/measure';

const READINGS = 100_000;
const INTERVAL_S = 0.5;
const WARM_UP = 15;
const SAMPLES = 60;
const TARGET_MS = 50;

/** Small seeded generator, so every run fits the same readings. */
function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

function makeReadings(): TrendPoint[] {
  const random = mulberry32(93);
  const points: TrendPoint[] = new Array(READINGS);
  for (let i = 0; i < READINGS; i++) {
    const t = i * INTERVAL_S;
    const volts = 3.2 + (0.0004 * t) / 60 + (random() - 0.5) * 0.006;
    points[i] = { t, y: Math.round(volts * 1000) / 1000, ...(i % 50 === 0 ? { unchecked: true } : {}) };
  }
  return points;
}

const channel: ChannelSpec = { id: 'dvm-flow', name: 'flow meter volts', rawUnit: 'V', resolution: 0.001, accuracy: { percentOfReading: 0.5, digits: 2 } };
const calibration: CalibrationChain = {
  steps: [
    scaledOutputStep({
      signal: [0, 5],
      range: [0, 175],
      multiplier: 7.947,
      inputUnit: 'V',
      outputUnit: 'SLPM',
      label: 'meter and bypass',
      uncertainty: { basis: 'absolute', value: 0.015 * 175 * 7.947, sourceId: 'meter-1/fs' },
    }),
    { kind: 'standard-to-mass', inputUnit: 'SLPM', outputUnit: 'g/min', standardConditions: '20C' },
  ],
};

function timeMs(fn: () => void): number {
  const start = process.hrtime.bigint();
  fn();
  return Number(process.hrtime.bigint() - start) / 1e6;
}

runBenchmark('fit', 5 * 60_000, async () => {
  console.log(`machine: ${os.cpus().length} CPUs, load average ${os.loadavg()[0].toFixed(1)} (1 min) at start`);
  const points = makeReadings();
  const window = { from: 0, to: points[READINGS - 1].t };
  const tStar = window.to;
  console.log(`${READINGS} readings every ${INTERVAL_S} s (${round(window.to / 3600, 2)} h); window = all of them; t* = ${tStar} s`);

  let sink = 0;
  const ours = (): void => {
    const result = stableValue(points, window, tStar, channel, calibration);
    sink += result.value + result.expandedUncertainty + result.fit.residuals.length;
  };
  const baseline = (): void => {
    let sum = 0;
    for (let i = 0; i < points.length; i++) sum += points[i].y;
    sink += sum;
  };

  const first = stableValue(points, window, tStar, channel, calibration);
  console.log(
    `result: ${round(first.value, 2)} ${first.unit} ± ${round(first.expandedUncertainty, 2)} (k = ${first.budget.coverageFactor}), slope ${first.fit.slopePerMinute.toExponential(3)} ${first.unit}/min, n = ${first.fit.n}, ${first.budget.components.length} budget lines`,
  );
  for (const line of first.budget.components) {
    console.log(`  ${line.name}: u = ${line.standardUncertainty.toPrecision(4)} ${line.unit}, c = ${line.sensitivity.toPrecision(5)}, ${round(line.percentOfVariance, 1)} %`);
  }
  if (!Number.isFinite(first.value) || first.fit.n !== READINGS) throw new Error('the stable value came out wrong; the benchmark would measure nothing useful');

  for (let i = 0; i < WARM_UP; i++) {
    ours();
    baseline();
  }
  // Alternate the two so both see the same machine state.
  const oursMs: number[] = [];
  const baselineMs: number[] = [];
  for (let i = 0; i < SAMPLES; i++) {
    oursMs.push(timeMs(ours));
    baselineMs.push(timeMs(baseline));
  }
  const oursMedian = median(oursMs);
  const baselineMedian = median(baselineMs);
  console.log(`stable value (fit + value at t* + budget), ${SAMPLES} samples: median ${round(oursMedian, 2)} ms, p95 ${round(percentile(oursMs, 95), 2)} ms, min ${round(Math.min(...oursMs), 2)} ms`);
  console.log(`baseline (bare single-pass sum), ${SAMPLES} samples: median ${round(baselineMedian, 3)} ms, p95 ${round(percentile(baselineMs, 95), 3)} ms, min ${round(Math.min(...baselineMs), 3)} ms`);
  const ratio = oursMedian / baselineMedian;
  console.log(`ratio ours ÷ sum loop: ${round(ratio, 1)}; target median ≤ ${TARGET_MS} ms: ${oursMedian <= TARGET_MS ? 'met' : 'NOT met'} (checksum ${sink.toExponential(3)})`);
  return { name: 'fit', value: round(oursMedian, 2), unit: 'ms', stat: 'median', target: `<= ${TARGET_MS}`, ratio: round(ratio, 1) };
});
