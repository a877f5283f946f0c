import { describe, expect, it } from 'vitest';
import { DESIGN_TARGETS, formatSummary, meetsTarget, parseTarget, summarise, type BenchResult } from './bench-targets';

describe('parseTarget', () => {
  it('reads the operator and the number of the targets the benchmarks print', () => {
    expect(parseTarget('<= 50')).toEqual({ op: '<=', limit: 50 });
    expect(parseTarget('>= 0.3')).toEqual({ op: '>=', limit: 0.3 });
    expect(parseTarget('< 1000')).toEqual({ op: '<', limit: 1000 });
    expect(parseTarget('== 0')).toEqual({ op: '==', limit: 0 });
    expect(parseTarget('≤ 1.5')).toEqual({ op: '<=', limit: 1.5 });
    expect(parseTarget('≥.5')).toEqual({ op: '>=', limit: 0.5 });
    // Words after the number say what it is relative to (upload's "× disk copy").
    expect(parseTarget('>= 0.5 × disk copy')).toEqual({ op: '>=', limit: 0.5 });
  });

  it('refuses what is not a comparison with a number', () => {
    expect(parseTarget('50')).toBeNull();
    expect(parseTarget('fast')).toBeNull();
    expect(parseTarget('<= fifty')).toBeNull();
    expect(parseTarget('<= 50ms')).toBeNull();
    expect(parseTarget('')).toBeNull();
  });
});

describe('meetsTarget', () => {
  it('compares at the boundary as the operator says', () => {
    expect(meetsTarget(50, '<= 50')).toBe(true);
    expect(meetsTarget(50.1, '<= 50')).toBe(false);
    expect(meetsTarget(0.3, '>= 0.3')).toBe(true);
    expect(meetsTarget(0.29, '>= 0.3')).toBe(false);
    expect(meetsTarget(1000, '< 1000')).toBe(false);
    expect(meetsTarget(999, '< 1000')).toBe(true);
    expect(meetsTarget(0, '== 0')).toBe(true);
    expect(meetsTarget(1, '== 0')).toBe(false);
    expect(meetsTarget(2, '> 1')).toBe(true);
    expect(meetsTarget(1, '> 1')).toBe(false);
  });

  it('gives no verdict for an unreadable target or a value that is not a number', () => {
    expect(meetsTarget(10, 'soon')).toBeNull();
    expect(meetsTarget(Number.NaN, '<= 50')).toBeNull();
    expect(meetsTarget(Number.POSITIVE_INFINITY, '>= 1')).toBeNull();
  });
});

describe('summarise', () => {
  const range: BenchResult = { name: 'range', value: 7.1, unit: 'ms', stat: 'p95', target: '<= 20', ratio: 1.8 };

  it('judges the headline and the ratio of a benchmark against the design', () => {
    const rows = summarise([['range', range]]);
    expect(rows.map((r) => [r.figure, r.shown, r.target, r.verdict])).toEqual([
      ['range request first byte', '7.1 ms', '<= 20', 'met'],
      ['ratio to a plain static file server', '1.8 ×', '<= 1.5', 'MISSED'],
    ]);
  });

  it('lists only the benchmarks that were run, each figure of the design for them', () => {
    const rows = summarise([['range', range]]);
    expect(new Set(rows.map((r) => r.bench))).toEqual(new Set(['range']));
    expect(rows).toHaveLength(DESIGN_TARGETS.filter((s) => s.bench === 'range').length);
  });

  it('says so when a benchmark failed, did not measure, or left a figure out', () => {
    const table: BenchResult = { name: 'table', value: -1, unit: 'ms', stat: 'not measured', target: '<= 500', skipped: 'no entry page' };
    const saveRow: BenchResult = { name: 'save-row', value: 61.5, unit: 'ms', stat: 'p99', target: '<= 50', errors: 0, lost: 0 };
    const rows = summarise([
      ['fit', 'it exited with code 1'],
      ['table', table],
      ['save-row', saveRow],
    ]);
    const verdict = (bench: string, field: string) => {
      const figure = DESIGN_TARGETS.find((s) => s.bench === bench && s.field === field)!.figure;
      return rows.find((r) => r.bench === bench && r.figure === figure)?.verdict;
    };
    expect(verdict('fit', 'value')).toBe('bench failed');
    expect(verdict('fit', 'ratio')).toBe('bench failed');
    expect(verdict('table', 'value')).toBe('not measured');
    expect(verdict('save-row', 'value')).toBe('MISSED');
    expect(verdict('save-row', 'errors')).toBe('met');
    expect(verdict('save-row', 'lost')).toBe('met');
    expect(verdict('save-row', 'two_api_p99')).toBe('not reported');
  });

  it('prints a ratio the design names without a number, with no verdict', () => {
    const fit: BenchResult = { name: 'fit', value: 12.3, unit: 'ms', stat: 'median', target: '<= 50', ratio: 40.2 };
    const rows = summarise([['fit', fit]]);
    expect(rows.map((r) => r.verdict)).toEqual(['met', 'no target']);
    expect(rows[1].shown).toBe('40.2 ×');
  });

  it('notes a headline target the benchmark declares that differs from the design', () => {
    const rows = summarise([['range', { ...range, target: '<= 25' }]]);
    expect(rows[0].note).toContain('the benchmark declares <= 25');
    expect(rows[0].verdict).toBe('met');
  });

  it('every design target can be read', () => {
    for (const spec of DESIGN_TARGETS) if (spec.target !== null) expect(parseTarget(spec.target), `${spec.bench} ${spec.field}`).not.toBeNull();
  });
});

describe('formatSummary', () => {
  it('lines the columns up under a header', () => {
    const text = formatSummary(summarise([['range', { name: 'range', value: 7.1, unit: 'ms', stat: 'p95', target: '<= 20', ratio: 1.2 }]]));
    const lines = text.split('\n');
    expect(lines[0]).toMatch(/^bench\s+figure\s+value\s+target\s+verdict\s+note$/);
    expect(lines).toHaveLength(4);
    const verdictColumn = lines[0].indexOf('verdict');
    expect(lines[2].slice(verdictColumn, verdictColumn + 3)).toBe('met');
    expect(lines[3].slice(verdictColumn, verdictColumn + 3)).toBe('met');
  });
});
