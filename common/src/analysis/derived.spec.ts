import { describe, expect, it } from 'vitest';
import { AnalysisError } from './errors';
import { compileExpression, derivedUncertainty, expressionSymbols } from './derived';

const channels = ['m_dot', 'T1', 'T2', 'p'];

describe('compileExpression', () => {
  it('evaluates a heat rate from mass flow, cp and a temperature difference', () => {
    const q = compileExpression('m_dot * cp * (T2 - T1)', channels, { cp: 1006 });
    expect(q.symbols).toEqual(['T1', 'T2', 'cp', 'm_dot']);
    // 0.02 kg/s × 1006 J/(kg K) × 15 K = 301.8 W.
    expect(q.evaluate({ m_dot: 0.02, T1: 20, T2: 35 })).toBeCloseTo(301.8, 10);
  });

  it('lists the symbols used, each once', () => {
    expect(expressionSymbols('(T1 + T2) / 2 + T1 * 0', channels)).toEqual(['T1', 'T2']);
    expect(expressionSymbols('sqrt(p) * pi', channels)).toEqual(['p', 'pi']);
  });

  it('allows the listed functions and implicit multiplication by a number', () => {
    const f = compileExpression('max(T1, T2) - abs(T1 - T2) + 2 p + log(exp(1))', channels);
    expect(f.evaluate({ T1: 3, T2: 5, p: 1 })).toBeCloseTo(5 - 2 + 2 + 1, 12);
  });

  it.each([
    ['T1 = 3', /an assignment \(=\) is not allowed/],
    ['f(x) = x^2', /a function definition is not allowed/],
    ['T1; T2', /several statements/],
    ['[T1, T2]', /a matrix or list is not allowed/],
    ['T1 > T2 ? T1 : T2', /a conditional/],
    ['T1 == T2', /operator "==" is not allowed/],
    ['T3 + T1', /unknown symbol "T3"; known symbols: m_dot, T1, T2, p/],
    ['evaluate("1+1")', /the function "evaluate" is not allowed; use one of abs, sqrt/],
    ['import({a: 1})', /the function "import" is not allowed/],
    ['T1 + "abc"', /"abc" is not a number/],
    ['T1.constructor', /property or element access is not allowed/],
    ['2 cm', /unknown symbol "cm"/],
    ['T1 mod 2', /operator "mod" is not allowed/],
    ['T1 +', /cannot read the expression "T1 \+": Unexpected end of expression/],
  ])('refuses %s with a clear message', (expression, message) => {
    expect(() => compileExpression(expression, channels)).toThrow(AnalysisError);
    expect(() => compileExpression(expression, channels)).toThrow(message);
  });

  it('refuses an empty or overlong expression', () => {
    expect(() => compileExpression('  ', channels)).toThrow(/empty/);
    expect(() => compileExpression('T1+'.repeat(200) + 'T1', channels)).toThrow(/at most 500/);
  });

  it('says which input is missing and when the result is not a number', () => {
    const f = compileExpression('p / (T2 - T1)', channels);
    expect(() => f.evaluate({ p: 1, T1: 2 })).toThrow(/T2 has no value \(undefined\)/);
    expect(() => f.evaluate({ p: 1, T1: 2, T2: 2 })).toThrow(/gives Infinity at p = 1, T2 = 2, T1 = 2; check for a division by zero/);
    expect(() => compileExpression('sqrt(p)', channels).evaluate({ p: -1 })).toThrow(/gives NaN/);
  });
});

describe('derivedUncertainty', () => {
  it('matches the analytic sensitivities of a heat rate (GUM 5.1.2)', () => {
    const q = compileExpression('m_dot * cp * (T2 - T1)', channels, { cp: 1006 });
    const budget = derivedUncertainty(
      q,
      {
        m_dot: { value: 0.02, standardUncertainty: 0.0004, unit: 'kg/s' },
        T1: { value: 20, standardUncertainty: 0.1, unit: 'degC' },
        T2: { value: 35, standardUncertainty: 0.1, unit: 'degC' },
      },
      { unit: 'W' },
    );
    const byName = Object.fromEntries(budget.components.map((c) => [c.name, c]));
    expect(byName.m_dot.sensitivity).toBeCloseTo(1006 * 15, 6);
    expect(byName.T1.sensitivity).toBeCloseTo(-0.02 * 1006, 8);
    expect(byName.T2.sensitivity).toBeCloseTo(0.02 * 1006, 8);
    const uc = Math.hypot(1006 * 15 * 0.0004, 0.02 * 1006 * 0.1, 0.02 * 1006 * 0.1);
    expect(budget.value).toBeCloseTo(301.8, 10);
    expect(budget.combinedStandardUncertainty).toBeCloseTo(uc, 8);
    expect(budget.expandedUncertainty).toBeCloseTo(2 * uc, 8);
    expect(budget.unit).toBe('W');
    const shares = budget.components.reduce((s, c) => s + c.percentOfVariance, 0);
    expect(shares).toBeCloseTo(100, 9);
  });

  it('adds the covariance term for correlated inputs: one thermometer pair fully correlated cancels in ΔT', () => {
    const dt = compileExpression('T2 - T1', channels);
    const inputs = { T1: { value: 20, standardUncertainty: 0.1 }, T2: { value: 35, standardUncertainty: 0.1 } };
    // Central differences with a step of u/1000 on a value of 35 carry ~1e-11 relative rounding.
    expect(derivedUncertainty(dt, inputs).combinedStandardUncertainty).toBeCloseTo(0.1 * Math.SQRT2, 10);
    const correlated = derivedUncertainty(dt, inputs, { correlations: [{ a: 'T1', b: 'T2', r: 1 }] });
    expect(correlated.combinedStandardUncertainty).toBeLessThan(1e-7);
    expect(correlated.covarianceTerm).toBeCloseTo(-0.02, 9);
    const sum = derivedUncertainty(compileExpression('T2 + T1', channels), inputs, { correlations: [{ a: 'T1', b: 'T2', r: 1 }] });
    expect(sum.combinedStandardUncertainty).toBeCloseTo(0.2, 9);
  });

  it('refuses bad correlations', () => {
    const dt = compileExpression('T2 - T1', channels);
    const inputs = { T1: { value: 20, standardUncertainty: 0.1 }, T2: { value: 35, standardUncertainty: 0.1 } };
    expect(() => derivedUncertainty(dt, inputs, { correlations: [{ a: 'T1', b: 'p', r: 0.5 }] })).toThrow(/"p", which the expression does not use/);
    expect(() => derivedUncertainty(dt, inputs, { correlations: [{ a: 'T1', b: 'T2', r: 1.5 }] })).toThrow(/must lie in −1…1, got 1.5/);
    expect(() => derivedUncertainty(dt, { ...inputs, T1: { value: 20, standardUncertainty: -1 } })).toThrow(/must not be negative/);
  });
});
