import fc from 'fast-check';
import psychrolib from 'psychrolib';
import { beforeAll, describe, expect, it } from 'vitest';
import enthalpyReference from '../reference-data/air-ideal-gas-enthalpy.json';
import type { EnergyStream, MassStream, MeasuredValue } from '../types/analysis';
import { AIR_ENTHALPY_H_KJ_PER_KG, AIR_ENTHALPY_T_K } from './air-enthalpy-table';
import { airEnthalpyFromTable, airEnthalpyTableSlope, energyBalance, enthalpyFunction, massBalance, measuredFromBudget } from './balance';
import { combineBudget } from './uncertainty';

beforeAll(() => {
  // psychrolib keeps its unit system as module-global state; set it in every file that uses it.
  psychrolib.SetUnitSystem(psychrolib.SI);
});

const value = (v: number, unit: string, components: MeasuredValue['components'] = []): MeasuredValue => ({ value: v, unit, components });

describe('air enthalpy', () => {
  // Çengel & Boles, Table A-17 (ideal-gas properties of air), as transcribed in
  // air-ideal-gas-enthalpy.json: the shipped table must be that table, row for row.
  it('ships the reference table row for row', () => {
    expect(AIR_ENTHALPY_T_K).toEqual(enthalpyReference.rows.map((r) => r.T_K));
    expect(AIR_ENTHALPY_H_KJ_PER_KG).toEqual(enthalpyReference.rows.map((r) => r.h_kJ_per_kg));
  });

  it('reproduces the table differences on the knots and the file worked interpolation', () => {
    const rows = enthalpyReference.rows;
    for (let i = 1; i < rows.length; i++) {
      const dh = airEnthalpyFromTable(rows[i].T_K) - airEnthalpyFromTable(rows[0].T_K);
      expect(dh).toBeCloseTo(rows[i].h_kJ_per_kg - rows[0].h_kJ_per_kg, 10);
    }
    // "h(293.15 K) = 290.16 + (3.15/5)·(295.17 − 290.16) = 293.3163 kJ/kg" (interpolation_note).
    expect(airEnthalpyFromTable(293.15)).toBeCloseTo(293.3163, 10);
    expect(airEnthalpyTableSlope(300)).toBeCloseTo((305.22 - 300.19) / 5, 12);
  });

  // NASA Glenn coefficients for air (NASA/TP-2002-211556), values computed in the reference file:
  // differences agree with the table to about 0.1 % (0.06 kJ/kg over 300 → 400 K, 0.11 kJ/kg over
  // 250 → 400 K); the table's last digit is 0.01 kJ/kg.
  it('agrees on differences with the NASA Glenn polynomial values within 0.1 % + 0.01 kJ/kg', () => {
    const nasa = enthalpyReference.cross_check_nasa_glenn.computed_rows;
    for (const a of nasa) {
      for (const b of nasa) {
        const ours = airEnthalpyFromTable(b.T_K) - airEnthalpyFromTable(a.T_K);
        const theirs = b.h_minus_h0K_kJ_per_kg - a.h_minus_h0K_kJ_per_kg;
        expect(Math.abs(ours - theirs)).toBeLessThanOrEqual(0.01 + 0.001 * Math.abs(theirs));
      }
    }
    const span = airEnthalpyFromTable(400) - airEnthalpyFromTable(300);
    expect(Math.abs(span - (401.317 - 300.469))).toBeLessThan(0.06);
  });

  // psychrolib 1.1.1 GetDryAirEnthalpy (ASHRAE Handbook—Fundamentals 2017, ch. 1 eqn 28: h = 1.006·t
  // kJ/kg, h = 0 at 0 °C) returns J/kg. Reference states differ (0 K vs 0 °C): differences only.
  it('agrees on differences with psychrolib ASHRAE dry-air enthalpy within 0.3 %', () => {
    const pairs: Array<[number, number]> = [
      [20, 40],
      [-10, 50],
      [26.85, 126.85],
      [10, 29.5],
      [0, 100],
    ];
    for (const [t1, t2] of pairs) {
      const ashrae = (psychrolib.GetDryAirEnthalpy(t2) - psychrolib.GetDryAirEnthalpy(t1)) / 1000;
      const table = airEnthalpyFromTable(t2 + 273.15) - airEnthalpyFromTable(t1 + 273.15);
      expect(Math.abs(table - ashrae) / ashrae).toBeLessThan(0.003);
    }
    // The notes' figure: 300 → 400 K gives 100.6 (ASHRAE) against 100.79 kJ/kg (table).
    expect((psychrolib.GetDryAirEnthalpy(126.85) - psychrolib.GetDryAirEnthalpy(26.85)) / 1000).toBeCloseTo(100.6, 9);
    expect(airEnthalpyFromTable(400) - airEnthalpyFromTable(300)).toBeCloseTo(100.79, 9);
  });

  it('constant cp 1006 J/(kg K) reproduces psychrolib exactly, and its reference state is ours to choose', () => {
    const at0 = enthalpyFunction({ kind: 'constant-cp' });
    for (const t of [-10, 0, 20, 25, 45.5]) {
      expect(at0.h(t + 273.15)).toBeCloseTo(psychrolib.GetDryAirEnthalpy(t), 8);
    }
    const at25 = enthalpyFunction({ kind: 'constant-cp', referenceTemperatureC: 25 });
    expect(at25.h(298.15)).toBe(0);
    expect(at25.h(318.15) - at25.h(298.15)).toBeCloseTo(at0.h(318.15) - at0.h(298.15), 9);
  });

  it('refuses temperatures outside the table and unknown models', () => {
    expect(() => airEnthalpyFromTable(500)).toThrow(/500 K \(226.85 °C\) is outside the air enthalpy table \(250–400 K\); use constant cp/);
    expect(() => enthalpyFunction({ kind: 'steam' } as never)).toThrow(/unknown enthalpy model "steam"/);
  });
});

describe('mass balance', () => {
  it('gives R = Σout/Σin in any mass-flow units, the closure in percent and the verdict', () => {
    const streams: MassStream[] = [
      { id: 'in', label: 'warm in', side: 'in', massFlow: value(60, 'g/min', [{ name: 'meter', effect: 0.3 }]) },
      { id: 'out', label: 'warm out', side: 'out', massFlow: value(0.000995, 'kg/s', [{ name: 'meter', effect: 0.000005 }]) },
    ];
    const r = massBalance(streams);
    expect(r.sumIn).toBeCloseTo(0.001, 15);
    expect(r.ratio).toBeCloseTo(0.995, 12);
    expect(r.closurePercent).toBeCloseTo(-0.5, 10);
    // Independent: u_R² = (0.005/1)² + (0.995·0.005)².
    expect(r.standardUncertainty).toBeCloseTo(Math.hypot(0.005, 0.995 * 0.005), 12);
    expect(r.expandedUncertainty).toBeCloseTo(2 * r.standardUncertainty, 14);
    expect(r.pass).toBe(true);
    expect(r.normalisedError).toBeCloseTo(0.005 / r.expandedUncertainty, 10);
  });

  it('fails when the imbalance exceeds U_R', () => {
    const r = massBalance([
      { id: 'a', label: 'a', side: 'in', massFlow: value(100, 'g/min', [{ name: 'u', effect: 0.5 }]) },
      { id: 'b', label: 'b', side: 'out', massFlow: value(95, 'g/min', [{ name: 'u', effect: 0.5 }]) },
    ]);
    expect(r.pass).toBe(false);
    expect(r.normalisedError).toBeGreaterThan(1);
  });

  it('refuses balances without both sides, repeated ids, non-mass units and a zero inflow', () => {
    const a: MassStream = { id: 'a', label: 'a', side: 'in', massFlow: value(1, 'g/min') };
    const b: MassStream = { id: 'b', label: 'b', side: 'out', massFlow: value(1, 'g/min') };
    expect(() => massBalance([a])).toThrow(/no stream out/);
    expect(() => massBalance([b])).toThrow(/no stream in/);
    expect(() => massBalance([a, { ...b, id: 'a' }])).toThrow(/"a" is used twice/);
    expect(() => massBalance([a, { ...b, massFlow: value(1, 'L/min') }])).toThrow(/stream "b" mass flow: cannot convert L\/min to kg\/s/);
    expect(() => massBalance([{ ...a, massFlow: value(0, 'g/min') }, b])).toThrow(/streams in add up to 0 kg\/s/);
  });

  // A meter moved between the ports of one stream from run to run: its ±1.5 % FS bound is a fixed
  // offset of that one meter, shared by every reading it gave (common practice). Kept as one
  // source, it nearly cancels in R; taken as independent per run, it would swamp the closure.
  it('one meter moved from run to run is one shared source and almost cancels in the ratio', () => {
    const meterFs = { sourceId: 'meter-1/accuracy', name: 'mass-flow meter ±1.5 % FS', effect: (0.015 * 1670) / Math.sqrt(3) };
    const run = (id: string, side: 'in' | 'out', v: number, own: number, shared = true): MassStream => ({
      id,
      label: id,
      side,
      massFlow: value(v, 'g/min', [shared ? meterFs : { ...meterFs, sourceId: null }, { name: `${id} fit`, effect: own }]),
    });
    const correlated = massBalance([run('in', 'in', 1000, 2), run('out', 'out', 990, 2)]);
    const independent = massBalance([run('in', 'in', 1000, 2, false), run('out', 'out', 990, 2, false)]);
    expect(correlated.ratio).toBeCloseTo(0.99, 12);
    expect(correlated.standardUncertainty).toBeLessThan(independent.standardUncertainty / 4);
    const shared = correlated.budget.find((l) => l.sourceId === 'meter-1/accuracy')!;
    expect(shared.streams).toEqual(['in', 'out']);
    // ∂R/∂offset = (Σin − Σout)/Σin² per unit offset.
    expect(shared.effect).toBeCloseTo(((1000 - 990) / 1000 ** 2) * meterFs.effect, 12);
    // A careful air-stream test closes its mass balance to about 1 % (common practice): here
    // −1.0 % with U_R ≈ 0.4 %, so this one would fail and the engineer looks for a leak.
    expect(correlated.closurePercent).toBeCloseTo(-1, 9);
    expect(correlated.pass).toBe(false);
    expect(independent.pass).toBe(true);
  });

  it('takes stable-value budgets as measured values (effect = c·u, source ids kept)', () => {
    const budget = combineBudget(500, 'g/min', [
      { name: 'instrument accuracy', sourceId: 'm/accuracy', value: 0.075, unit: 'V', distribution: 'rectangular', divisor: Math.sqrt(3), sensitivity: 334 },
      { name: 'trend fit at t*', value: 0.8, unit: 'g/min', distribution: 'normal', divisor: 1, sensitivity: 1 },
    ]);
    const m = measuredFromBudget(budget);
    expect(m.value).toBe(500);
    expect(m.components[0]).toMatchObject({ sourceId: 'm/accuracy', name: 'instrument accuracy' });
    expect(m.components[0].effect).toBeCloseTo((334 * 0.075) / Math.sqrt(3), 12);
    expect(m.components[1].sourceId).toBeNull();
  });
});

describe('energy balance', () => {
  // The demo rig: an air-to-air heat-recovery core; heat given up by the warm stream against heat
  // taken up by the cool one (duty terms ṁ·(h(T) − h(T_minus))).
  const warm: EnergyStream = {
    id: 'warm',
    label: 'warm stream',
    side: 'in',
    massFlow: value(1200, 'g/min', [{ sourceId: 'meter', name: 'meter FS', effect: 12 }]),
    temperature: value(45, '°C', [{ sourceId: 'tc-warm-in', name: 'warm in T', effect: 0.1 }]),
    minusTemperature: value(28, 'degC', [{ sourceId: 'tc-warm-out', name: 'warm out T', effect: 0.1 }]),
  };
  const cool: EnergyStream = {
    id: 'cool',
    label: 'cool stream',
    side: 'out',
    massFlow: value(1180, 'g/min', [{ sourceId: 'meter', name: 'meter FS', effect: 12 }]),
    temperature: value(26.5, '°C', [{ sourceId: 'tc-cool-out', name: 'cool out T', effect: 0.1 }]),
    minusTemperature: value(10, '°C', [{ sourceId: 'tc-cool-in', name: 'cool in T', effect: 0.1 }]),
  };

  it('with constant cp: Q = ṁ·cp·ΔT, R = Q_cool/Q_warm', () => {
    const r = energyBalance([warm, cool], { kind: 'constant-cp', cp: 1006 });
    const qWarm = (1.2 / 60) * 1006 * 17;
    const qCool = (1.18 / 60) * 1006 * 16.5;
    expect(r.unit).toBe('W');
    expect(r.sumIn).toBeCloseTo(qWarm, 9);
    expect(r.sumOut).toBeCloseTo(qCool, 9);
    expect(r.ratio).toBeCloseTo(qCool / qWarm, 12);
    // Hand propagation: sources independent except the meter, shared by both streams.
    const dWarm = -r.ratio / qWarm;
    const dCool = 1 / qWarm;
    const meter = dWarm * (0.012 / 60) * 1006 * 17 + dCool * (0.012 / 60) * 1006 * 16.5;
    const temps = [dWarm * (1.2 / 60) * 1006 * 0.1, dWarm * (1.2 / 60) * 1006 * 0.1, dCool * (1.18 / 60) * 1006 * 0.1, dCool * (1.18 / 60) * 1006 * 0.1];
    expect(r.standardUncertainty).toBeCloseTo(Math.hypot(meter, ...temps), 12);
    // About 2 % closure on energy is what a careful air-stream test reaches (common practice).
    expect(Math.abs(r.closurePercent)).toBeLessThan(5);
    expect(r.pass).toBe(r.normalisedError <= 1);
  });

  it('duty terms do not depend on the reference state; the table agrees with constant cp to 0.3 %', () => {
    const a = energyBalance([warm, cool], { kind: 'constant-cp', referenceTemperatureC: 0 });
    const b = energyBalance([warm, cool], { kind: 'constant-cp', referenceTemperatureC: 25 });
    expect(b.ratio).toBeCloseTo(a.ratio, 12);
    const table = energyBalance([warm, cool], { kind: 'ideal-gas-table' });
    expect(Math.abs(table.ratio - a.ratio)).toBeLessThan(0.003);
    expect(Math.abs(table.sumIn - a.sumIn) / a.sumIn).toBeLessThan(0.003);
  });

  it('port terms ṁ·h(T) depend on the reference state, which one model keeps common to all streams', () => {
    const ports: EnergyStream[] = [
      { id: 'i', label: 'in', side: 'in', massFlow: value(1, 'kg/s'), temperature: value(40, '°C') },
      { id: 'o', label: 'out', side: 'out', massFlow: value(1, 'kg/s'), temperature: value(30, '°C') },
    ];
    const from0C = energyBalance(ports, { kind: 'constant-cp' });
    const from0K = energyBalance(ports, { kind: 'ideal-gas-table' });
    expect(from0C.ratio).toBeCloseTo(30 / 40, 12);
    expect(from0K.ratio).toBeCloseTo(airEnthalpyFromTable(303.15) / airEnthalpyFromTable(313.15), 12);
  });
});

describe('properties', () => {
  const positive = fc.double({ min: 1e-3, max: 1e4, noNaN: true });

  it('exactly balanced synthetic streams close to R = 1', () => {
    fc.assert(
      fc.property(fc.array(positive, { minLength: 1, maxLength: 6 }), fc.array(fc.double({ min: 0.05, max: 1, noNaN: true }), { minLength: 1, maxLength: 6 }), (ins, weights) => {
        const total = ins.reduce((s, v) => s + v, 0);
        const wSum = weights.reduce((s, v) => s + v, 0);
        const streams: MassStream[] = [
          ...ins.map((v, i): MassStream => ({ id: `in${i}`, label: `in ${i}`, side: 'in', massFlow: value(v, 'g/s', [{ name: 'reading', effect: 0.005 * v }]) })),
          ...weights.map((w, i): MassStream => {
            const v = (total * w) / wSum;
            return { id: `out${i}`, label: `out ${i}`, side: 'out', massFlow: value(v, 'g/s', [{ name: 'reading', effect: 0.005 * v }]) };
          }),
        ];
        const r = massBalance(streams);
        expect(Math.abs(r.ratio - 1)).toBeLessThan(1e-12);
        expect(Math.abs(r.closurePercent)).toBeLessThan(1e-10);
        expect(r.pass).toBe(true);
        expect(r.normalisedError).toBeLessThan(1e-9);
      }),
      { numRuns: 300 },
    );
  });

  it('the uncertainty of the ratio does not depend on a shared calibration factor applied to every stream', () => {
    fc.assert(
      fc.property(
        fc.array(positive, { minLength: 1, maxLength: 4 }),
        fc.array(positive, { minLength: 1, maxLength: 4 }),
        fc.double({ min: 0, max: 0.2, noNaN: true }),
        (ins, outs, relativeU) => {
          // Every stream m = K·V: the factor K's relative uncertainty moves each by m·u_rel.
          const make = (withFactor: boolean) =>
            massBalance([
              ...ins.map((v, i): MassStream => ({
                id: `in${i}`,
                label: `in ${i}`,
                side: 'in',
                massFlow: value(v, 'g/s', [{ name: 'reading', effect: 0.01 * v }, ...(withFactor ? [{ sourceId: 'K', name: 'factor K', effect: v * relativeU }] : [])]),
              })),
              ...outs.map((v, i): MassStream => ({
                id: `out${i}`,
                label: `out ${i}`,
                side: 'out',
                massFlow: value(v, 'g/s', [{ name: 'reading', effect: 0.01 * v }, ...(withFactor ? [{ sourceId: 'K', name: 'factor K', effect: v * relativeU }] : [])]),
              })),
            ]);
          const without = make(false);
          const withK = make(true);
          expect(Math.abs(withK.standardUncertainty - without.standardUncertainty)).toBeLessThanOrEqual(1e-12 * Math.max(1, withK.ratio));
          const line = withK.budget.find((l) => l.sourceId === 'K')!;
          expect(Math.abs(line.effect)).toBeLessThanOrEqual(1e-12 * Math.max(1, withK.ratio) * Math.max(relativeU, 1e-300));
        },
      ),
      { numRuns: 300 },
    );
  });
});
