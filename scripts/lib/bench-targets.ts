// The figures DESIGN.md §8 (and issue 7's load and scale-out figures) set for the benchmarks, and
// the comparison of a benchmark's result line against them, for the table `npm run bench` prints
// at the end. Pure: no files, no processes.

/** A benchmark's last line (bench/README.md). */
export interface BenchResult {
  name: string;
  value: number;
  unit: string;
  stat: string;
  target: string;
  ratio?: number;
  memory_mb?: number;
  [figure: string]: string | number | undefined;
}

export type Comparison = '<=' | '>=' | '<' | '>' | '==';

export interface Target {
  op: Comparison;
  limit: number;
}

const OPERATORS: Record<string, Comparison> = { '<=': '<=', '≤': '<=', '>=': '>=', '≥': '>=', '<': '<', '>': '>', '==': '==', '=': '==' };

/**
 * Reads a target such as "<= 50", "≥ 0.3" or ">= 0.5 × disk copy" (words after the number say
 * what it is relative to and are not part of the comparison). Null when it is not of that form.
 */
export function parseTarget(target: string): Target | null {
  const match = /^\s*(<=|>=|==|≤|≥|<|>|=)\s*([-+]?(?:\d+(?:\.\d*)?|\.\d+)(?:e[-+]?\d+)?)(?:\s|$)/i.exec(target);
  if (!match) return null;
  const limit = Number(match[2]);
  return Number.isFinite(limit) ? { op: OPERATORS[match[1]], limit } : null;
}

/** Whether `value` reaches `target`; null when the target cannot be read or the value is not a finite number. */
export function meetsTarget(value: number, target: string): boolean | null {
  const parsed = parseTarget(target);
  if (!parsed || !Number.isFinite(value)) return null;
  const { op, limit } = parsed;
  switch (op) {
    case '<=':
      return value <= limit;
    case '>=':
      return value >= limit;
    case '<':
      return value < limit;
    case '>':
      return value > limit;
    case '==':
      return value === limit;
  }
}

/** One figure a benchmark reports and what the design asks of it. */
export interface FigureSpec {
  bench: string;
  /** What it is, for people. */
  figure: string;
  /** The field of the result line: "value", "ratio", "memory_mb" or a further figure. */
  field: string;
  /** The design's target, e.g. "<= 50"; null where the design names a figure without a number. */
  target: string | null;
}

/**
 * DESIGN.md §8, row by row (and issue 7 part 5 for save-row: zero lost rows, and the same load
 * across two API processes and a worker). Ratios the design names without a number are listed
 * with no target so that they are still printed.
 */
export const DESIGN_TARGETS: readonly FigureSpec[] = [
  { bench: 'step', figure: 'step to the next row, correct frame on screen', field: 'value', target: '<= 50' },
  { bench: 'step', figure: 'frames shown that were not the row’s', field: 'wrong_frames', target: '== 0' },
  { bench: 'step', figure: 'ratio to a plain seek in the camera file', field: 'ratio', target: null },
  { bench: 'upload', figure: 'server memory growth, 1 GB upload', field: 'memory_mb', target: '<= 64' },
  { bench: 'upload', figure: 'throughput ÷ raw disk copy', field: 'ratio', target: '>= 0.5' },
  { bench: 'range', figure: 'range request first byte', field: 'value', target: '<= 20' },
  { bench: 'range', figure: 'ratio to a plain static file server', field: 'ratio', target: '<= 1.5' },
  { bench: 'save-row', figure: 'save one row, 50 readers, one API process', field: 'value', target: '<= 50' },
  { bench: 'save-row', figure: 'errors (all phases)', field: 'errors', target: '== 0' },
  { bench: 'save-row', figure: 'lost rows (all phases)', field: 'lost', target: '== 0' },
  { bench: 'save-row', figure: 'save one row, 50 readers, 2 API processes + worker', field: 'two_api_p99', target: '<= 50' },
  { bench: 'save-row', figure: 'errors, 2 API processes + worker', field: 'two_api_errors', target: '== 0' },
  { bench: 'save-row', figure: 'lost rows, 2 API processes + worker', field: 'two_api_lost', target: '== 0' },
  { bench: 'fit', figure: 'trend fit + stable value + uncertainty, 100 000 readings', field: 'value', target: '<= 50' },
  { bench: 'fit', figure: 'ratio to a bare sum loop', field: 'ratio', target: null },
  { bench: 'export', figure: 'memory growth, CSV of 1 000 000 readings', field: 'memory_mb', target: '<= 100' },
  { bench: 'export', figure: 'rows/s ÷ PostgreSQL COPY', field: 'ratio', target: '>= 0.3' },
  { bench: 'table', figure: 'sheet table of 10 000 rows, first render', field: 'value', target: '<= 500' },
  // "Virtualised": the table benchmark's own test is fewer than 1000 row elements in the page.
  { bench: 'table', figure: 'row elements in the page (virtualised)', field: 'row_elements', target: '< 1000' },
];

export type Verdict = 'met' | 'MISSED' | 'no target' | 'not measured' | 'not reported' | 'bench failed';

export interface SummaryRow {
  bench: string;
  figure: string;
  /** The figure as printed (value and unit), or "-". */
  shown: string;
  target: string;
  verdict: Verdict;
  /** Something a reader should know: the benchmark's stat, a different target it declared, why it failed. */
  note: string;
}

function unitOf(spec: FigureSpec, result: BenchResult): string {
  if (spec.field === 'value') return result.unit;
  if (spec.field === 'memory_mb') return 'MB';
  if (spec.field === 'ratio') return '×';
  if (spec.field.endsWith('_p99') || spec.field.endsWith('_p50')) return 'ms';
  return '';
}

/** One row per figure of the design, for each benchmark that ran or was asked for. */
export function summarise(outcomes: ReadonlyArray<readonly [string, BenchResult | string]>, specs: readonly FigureSpec[] = DESIGN_TARGETS): SummaryRow[] {
  const rows: SummaryRow[] = [];
  const ran = new Map(outcomes);
  for (const spec of specs) {
    if (!ran.has(spec.bench)) continue;
    const outcome = ran.get(spec.bench)!;
    const target = spec.target ?? '-';
    if (typeof outcome === 'string') {
      rows.push({ bench: spec.bench, figure: spec.figure, shown: '-', target, verdict: 'bench failed', note: outcome });
      continue;
    }
    const raw = outcome[spec.field];
    const notes: string[] = [];
    if (spec.field === 'value') {
      notes.push(outcome.stat);
      if (spec.target && outcome.target.replace(/\s+/g, ' ') !== spec.target) notes.push(`the benchmark declares ${outcome.target}`);
    } else if (/_p\d+$/.test(spec.field)) {
      notes.push(spec.field.slice(spec.field.lastIndexOf('_') + 1));
    }
    // A benchmark that could not measure says so with value -1 and a stat that says why (bench/README.md).
    if (spec.field === 'value' && outcome.value === -1 && /not measured/i.test(outcome.stat)) {
      const why = typeof outcome.skipped === 'string' ? outcome.skipped : outcome.stat;
      rows.push({ bench: spec.bench, figure: spec.figure, shown: '-', target, verdict: 'not measured', note: why });
      continue;
    }
    if (typeof raw !== 'number') {
      rows.push({ bench: spec.bench, figure: spec.figure, shown: '-', target, verdict: 'not reported', note: `no "${spec.field}" in its result line` });
      continue;
    }
    const unit = unitOf(spec, outcome);
    const shown = unit === '×' ? `${raw} ×` : unit ? `${raw} ${unit}` : String(raw);
    let verdict: Verdict;
    if (spec.target === null) verdict = 'no target';
    else {
      const met = meetsTarget(raw, spec.target);
      if (met === null) throw new Error(`the design target "${spec.target}" of ${spec.bench} ${spec.field} cannot be read`);
      verdict = met ? 'met' : 'MISSED';
    }
    rows.push({ bench: spec.bench, figure: spec.figure, shown, target, verdict, note: notes.join('; ') });
  }
  return rows;
}

/** The rows as a plain-text table with a header, columns padded to their widest cell. */
export function formatSummary(rows: readonly SummaryRow[]): string {
  const header = ['bench', 'figure', 'value', 'target', 'verdict', 'note'];
  const cells = rows.map((r) => [r.bench, r.figure, r.shown, r.target, r.verdict, r.note]);
  const widths = header.map((h, i) => Math.max(h.length, ...cells.map((c) => c[i].length)));
  const line = (row: string[]) =>
    row
      .map((cell, i) => (i === 2 ? cell.padStart(widths[i]) : i === row.length - 1 ? cell : cell.padEnd(widths[i])))
      .join('  ')
      .trimEnd();
  return [line(header), line(widths.map((w) => '-'.repeat(w))), ...cells.map(line)].join('\n');
}
