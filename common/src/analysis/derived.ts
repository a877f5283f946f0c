// Derived channels: an expression over other channels' values, e.g. a heat rate
// "m_dot * cp * (T2 - T1)". Parsed and compiled by the mathjs expression library (it builds the
// evaluator from the syntax tree; no eval, no Function constructor), after we have walked the tree
// and allowed only arithmetic, a short list of functions and known symbols. Assignments, function
// definitions, property access, matrices, strings, units and everything else are refused.
import type { MathNode } from 'mathjs';
import type { UncertaintyBudget } from '../types/analysis';
import { math } from '../units/math';
import { AnalysisError, assertFiniteNumber } from './errors';
import { combineBudget, formatNumber, type ComponentInput } from './uncertainty';

/** Operators allowed: + − × ÷ ^ and unary ±. */
const ALLOWED_OPERATORS = new Set(['add', 'subtract', 'multiply', 'divide', 'pow', 'unaryMinus', 'unaryPlus']);

/** Functions allowed (all of one or two numbers, all from mathjs). log(x) is the natural log. */
export const ALLOWED_FUNCTIONS: readonly string[] = [
  'abs',
  'sqrt',
  'cbrt',
  'exp',
  'log',
  'log10',
  'log2',
  'pow',
  'min',
  'max',
  'sin',
  'cos',
  'tan',
  'asin',
  'acos',
  'atan',
  'atan2',
  'hypot',
  'square',
  'cube',
];
const ALLOWED_FUNCTION_SET = new Set(ALLOWED_FUNCTIONS);

/** Named constants always available. */
const BUILT_IN_CONSTANTS = new Set(['pi', 'e']);

export const MAX_EXPRESSION_LENGTH = 500;

export interface CompiledExpression {
  expression: string;
  /** Channel symbols and constants the expression uses, sorted, each once. */
  symbols: string[];
  /** Value for the given symbol values; AnalysisError when a symbol is missing or the result is not finite. */
  evaluate(values: Readonly<Record<string, number>>): number;
}

function describe(node: MathNode): string {
  switch (node.type) {
    case 'AssignmentNode':
      return 'an assignment (=)';
    case 'FunctionAssignmentNode':
      return 'a function definition';
    case 'AccessorNode':
      return 'property or element access';
    case 'IndexNode':
      return 'indexing';
    case 'ArrayNode':
      return 'a matrix or list';
    case 'ObjectNode':
      return 'an object';
    case 'BlockNode':
      return 'several statements (; or a new line)';
    case 'ConditionalNode':
      return 'a conditional (? :)';
    case 'RangeNode':
      return 'a range (:)';
    case 'RelationalNode':
      return 'a comparison';
    default:
      return `"${node.toString()}"`;
  }
}

/**
 * Parses and checks an expression. `symbols` are the channel symbols it may use, `constants`
 * named numbers (e.g. {cp: 1006}). Refuses anything that is not plain arithmetic over them.
 */
export function compileExpression(
  expression: string,
  symbols: readonly string[],
  constants: Readonly<Record<string, number>> = {},
): CompiledExpression {
  if (typeof expression !== 'string' || expression.trim() === '') throw new AnalysisError('the expression is empty');
  if (expression.length > MAX_EXPRESSION_LENGTH) {
    throw new AnalysisError(`the expression is ${expression.length} characters long (at most ${MAX_EXPRESSION_LENGTH}); split it into several derived channels`);
  }
  for (const [name, value] of Object.entries(constants)) assertFiniteNumber(value, `constant ${name}`);
  let root: MathNode;
  try {
    root = math.parse(expression);
  } catch (error) {
    throw new AnalysisError(`cannot read the expression "${expression}": ${(error as Error).message}`);
  }
  const known = new Set([...symbols, ...Object.keys(constants), ...BUILT_IN_CONSTANTS]);
  const used = new Set<string>();
  const problems: string[] = [];
  root.traverse((node, path, parent) => {
    switch (node.type) {
      case 'ConstantNode': {
        const value = (node as unknown as { value: unknown }).value;
        if (typeof value !== 'number') problems.push(`${JSON.stringify(value)} is not a number`);
        return;
      }
      case 'ParenthesisNode':
        return;
      case 'OperatorNode': {
        const fn = (node as unknown as { fn: string }).fn;
        if (!ALLOWED_OPERATORS.has(fn)) problems.push(`the operator "${(node as unknown as { op: string }).op}" is not allowed (use + − * / ^)`);
        return;
      }
      case 'FunctionNode': {
        const fnNode = (node as unknown as { fn: MathNode }).fn;
        const name = fnNode.type === 'SymbolNode' ? (fnNode as unknown as { name: string }).name : null;
        if (name === null || !ALLOWED_FUNCTION_SET.has(name)) {
          problems.push(`the function ${name ? `"${name}"` : describe(fnNode)} is not allowed; use one of ${ALLOWED_FUNCTIONS.join(', ')}`);
        }
        return;
      }
      case 'SymbolNode': {
        // A function's name is checked with the function.
        if (parent?.type === 'FunctionNode' && path === 'fn') return;
        const name = (node as unknown as { name: string }).name;
        if (!known.has(name)) {
          problems.push(`unknown symbol "${name}"; known symbols: ${[...symbols, ...Object.keys(constants)].join(', ') || 'none'}`);
        } else {
          used.add(name);
        }
        return;
      }
      default:
        problems.push(`${describe(node)} is not allowed; an expression is arithmetic over channel symbols`);
    }
  });
  if (problems.length) {
    throw new AnalysisError(`expression "${expression}": ${[...new Set(problems)].join('; ')}`);
  }
  const code = root.compile();
  // Values to be supplied on each evaluation: the channel symbols (a channel may be called "e").
  const needed = [...used].filter((s) => !Object.hasOwn(constants, s) && (symbols.includes(s) || !BUILT_IN_CONSTANTS.has(s)));
  return {
    expression,
    symbols: [...used].sort(),
    evaluate(values) {
      const scope = new Map<string, number>();
      for (const [name, value] of Object.entries(constants)) scope.set(name, value);
      for (const name of needed) {
        const v = values[name];
        if (typeof v !== 'number' || !Number.isFinite(v)) {
          throw new AnalysisError(`expression "${expression}": ${name} has no value (${String(v)})`);
        }
        scope.set(name, v);
      }
      const result: unknown = code.evaluate(scope);
      if (typeof result !== 'number' || !Number.isFinite(result)) {
        const at = needed.map((n) => `${n} = ${formatNumber(scope.get(n)!)}`).join(', ');
        throw new AnalysisError(
          `expression "${expression}" gives ${typeof result === 'number' ? String(result) : 'no number'}${at ? ` at ${at}` : ''}; check for a division by zero or the root or log of a negative value`,
        );
      }
      return result;
    },
  };
}

/** The channel symbols and constants an expression uses (it must compile against `symbols`). */
export function expressionSymbols(expression: string, symbols: readonly string[], constants: Readonly<Record<string, number>> = {}): string[] {
  return compileExpression(expression, symbols, constants).symbols;
}

/** One input of a derived value: its value and standard uncertainty. */
export interface DerivedInput {
  value: number;
  /** Standard uncertainty u (k = 1), in the input's unit; 0 for an exact input. */
  standardUncertainty: number;
  unit?: string;
  sourceId?: string | null;
}

export interface Correlation {
  a: string;
  b: string;
  /** Correlation coefficient, −1…1. */
  r: number;
}

export interface DerivedUncertaintyOptions {
  unit?: string;
  correlations?: readonly Correlation[];
  coverageFactor?: number;
}

/**
 * The derived value and its budget: sensitivity coefficients c_i = ∂f/∂x_i by central
 * differences, combined per GUM 5.1.2 (independent) and 5.2.2 (correlated pairs, optional).
 * The step is a thousandth of the input's uncertainty (small against any curvature the
 * uncertainty spans) but not below 1e-8 of its value (to keep clear of rounding).
 */
export function derivedUncertainty(
  compiled: CompiledExpression,
  inputs: Readonly<Record<string, DerivedInput>>,
  options: DerivedUncertaintyOptions = {},
): UncertaintyBudget {
  const values: Record<string, number> = {};
  const variables = compiled.symbols.filter((s) => Object.hasOwn(inputs, s));
  for (const name of variables) {
    const input = inputs[name];
    assertFiniteNumber(input.value, `${name} value`);
    assertFiniteNumber(input.standardUncertainty, `${name} standard uncertainty`);
    if (input.standardUncertainty < 0) throw new AnalysisError(`${name}: standard uncertainty must not be negative, got ${input.standardUncertainty}`);
    values[name] = input.value;
  }
  const value = compiled.evaluate(values);
  const sensitivity: Record<string, number> = {};
  const components: ComponentInput[] = variables.map((name) => {
    const { value: x, standardUncertainty: u, unit, sourceId } = inputs[name];
    const h = u > 0 ? Math.max(u * 1e-3, Math.abs(x) * 1e-8) : Math.max(Math.abs(x) * 1e-6, 1e-9);
    const up = compiled.evaluate({ ...values, [name]: x + h });
    const down = compiled.evaluate({ ...values, [name]: x - h });
    const c = (up - down) / (2 * h);
    sensitivity[name] = c;
    return {
      name,
      sourceId: sourceId ?? null,
      value: u,
      unit: unit ?? '',
      distribution: 'normal',
      divisor: 1,
      sensitivity: c,
      note: `standard uncertainty of ${name}; c = ∂f/∂${name} by central difference`,
    };
  });
  let covarianceTerm = 0;
  const seen = new Set<string>();
  for (const { a, b, r } of options.correlations ?? []) {
    for (const s of [a, b]) {
      if (!variables.includes(s)) throw new AnalysisError(`correlation names "${s}", which the expression does not use as an input`);
    }
    if (a === b) throw new AnalysisError(`a correlation needs two different inputs, got ${a} twice`);
    assertFiniteNumber(r, `correlation ${a}–${b}`);
    if (r < -1 || r > 1) throw new AnalysisError(`correlation ${a}–${b} must lie in −1…1, got ${r}`);
    const key = [a, b].sort().join('\u0000');
    if (seen.has(key)) throw new AnalysisError(`the correlation ${a}–${b} is given twice`);
    seen.add(key);
    covarianceTerm += 2 * sensitivity[a] * sensitivity[b] * r * inputs[a].standardUncertainty * inputs[b].standardUncertainty;
  }
  return combineBudget(value, options.unit ?? '', components, { coverageFactor: options.coverageFactor, covarianceTerm });
}
