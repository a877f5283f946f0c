import { describe, expect, it } from 'vitest';
import type { StabilityRule, TrendPoint } from '../types/analysis';
import { evaluateStability, validateStabilityRule } from './stability';

// The kind of rule: ASHRAE Standard 93-2010 (solar collectors) §8.3.3 — "a steady-state condition
// is assumed to exist when the outlet temperature of the fluid varies less than 0.05 °C per
// minute", after a 15 min hold. Quoted from a public copy of the text, not checked against the
// standard itself (treat as from memory).
const ashrae93: StabilityRule = { name: 'ASHRAE 93-style outlet steady', windowSeconds: 15 * 60, slopeLimitPerMinute: 0.05 };

/** Readings every 3 s over [0, 900] s: y = base + rate·t/60 plus a fixed ±0.01 zig-zag. */
function outlet(ratePerMinute: number, base = 45): TrendPoint[] {
  const points: TrendPoint[] = [];
  for (let i = 0; i <= 300; i++) {
    const t = 3 * i;
    points.push({ t, y: base + (ratePerMinute * t) / 60 + (i % 2 ? 0.01 : -0.01) });
  }
  return points;
}

describe('ASHRAE 93-style steady outlet temperature', () => {
  it('passes at 0.03 °C/min', () => {
    const verdict = evaluateStability(ashrae93, outlet(0.03), { unit: '°C' });
    expect(verdict.pass).toBe(true);
    expect(verdict.window).toEqual({ from: 0, to: 900 });
    expect(verdict.n).toBe(301);
    const slope = verdict.parts.find((p) => p.part === 'slope')!;
    expect(slope.measured).toBeCloseTo(0.03, 4);
    expect(slope).toMatchObject({ pass: true, limit: 0.05, unit: '°C/min' });
    expect(slope.message).toBe('|slope| 0.03 °C/min ≤ 0.05 °C/min');
  });

  it('fails at 0.08 °C/min, whichever way it drifts', () => {
    for (const rate of [0.08, -0.08]) {
      const verdict = evaluateStability(ashrae93, outlet(rate), { unit: '°C' });
      expect(verdict.pass).toBe(false);
      const slope = verdict.parts.find((p) => p.part === 'slope')!;
      expect(slope.pass).toBe(false);
      expect(slope.measured).toBeCloseTo(0.08, 4);
      expect(slope.message).toMatch(/> 0.05 °C\/min$/);
    }
  });
});

describe('band and drift parts', () => {
  const rule: StabilityRule = { name: 'tight', windowSeconds: 600, slopeLimitPerMinute: 0.1, bandLimit: 0.5, driftLimit: 0.3 };

  it('reports each part with measured value and limit; overall fails if one part fails', () => {
    // 0.04 °C/min over the last 600 s of a 900 s record: drift 0.4 > 0.3. Band: lowest 45.19 at
    // t = 300 s (zig-zag −0.01), highest 45.608 at t = 897 s (+0.01), so 0.418 ≤ 0.5.
    const verdict = evaluateStability(rule, outlet(0.04), { unit: '°C' });
    expect(verdict.window).toEqual({ from: 300, to: 900 });
    const part = Object.fromEntries(verdict.parts.map((p) => [p.part, p]));
    expect(part.coverage.pass).toBe(true);
    expect(part.slope.pass).toBe(true);
    expect(part.band.measured).toBeCloseTo(0.418, 9);
    expect(part.band.pass).toBe(true);
    expect(part.drift.measured).toBeCloseTo(0.4, 4);
    expect(part.drift.pass).toBe(false);
    expect(part.drift.message).toMatch(/^drift over 10 min 0.4\d* °C > 0.3 °C$/);
    expect(verdict.pass).toBe(false);
  });

  it('fails coverage when readings do not reach back over the window', () => {
    const verdict = evaluateStability({ ...rule, windowSeconds: 1200 }, outlet(0), { unit: '°C' });
    const coverage = verdict.parts.find((p) => p.part === 'coverage')!;
    expect(coverage).toMatchObject({ pass: false, measured: 900, limit: 1200 });
    expect(coverage.message).toMatch(/cover only 900 s of the 1200 s window/);
    expect(verdict.pass).toBe(false);
  });

  it('judges the window that ends at the chosen time', () => {
    const verdict = evaluateStability(rule, outlet(0), { end: 600 });
    expect(verdict.window).toEqual({ from: 0, to: 600 });
    expect(verdict.n).toBe(201);
    expect(verdict.pass).toBe(true);
  });
});

describe('rule validation', () => {
  it('needs a name, a positive window and at least one limit', () => {
    expect(() => validateStabilityRule({ name: '', windowSeconds: 60, bandLimit: 1 })).toThrow(/needs a name/);
    expect(() => validateStabilityRule({ name: 'r', windowSeconds: 0, bandLimit: 1 })).toThrow(/above 0 s/);
    expect(() => validateStabilityRule({ name: 'r', windowSeconds: 60 })).toThrow(/sets no limit/);
    expect(() => validateStabilityRule({ name: 'r', windowSeconds: 60, bandLimit: -1 })).toThrow(/band limit must not be negative/);
  });

  it('needs 3 readings in the window', () => {
    expect(() => evaluateStability(ashrae93, [{ t: 0, y: 1 }, { t: 3, y: 1 }])).toThrow(/holds 2 readings; at least 3 are needed/);
  });
});
