// `npm run bench [-- NAME]`: runs bench/<name>.bench.ts (all, or the one named) and checks that
// each one ends with the one-line JSON result described in bench/README.md; at the end, a table of
// every figure DESIGN.md §8 names with its target and whether it was met (scripts/lib/bench-targets.ts).
import fs from 'node:fs';
import path from 'node:path';
import { repoRoot } from './lib/config';
import { formatSummary, summarise, type BenchResult } from './lib/bench-targets';
import { describeExit, Proc, stopAll, succeeded } from './lib/processes';

const benchDir = path.join(repoRoot, 'bench');
const suffix = '.bench.ts';
/** A benchmark bounds its own run time; this only catches one that hangs. */
const hardLimitMs = Number(process.env.BENCH_TIMEOUT_S ?? 1800) * 1000;

function available(): string[] {
  if (!fs.existsSync(benchDir)) return [];
  return fs
    .readdirSync(benchDir)
    .filter((file) => file.endsWith(suffix))
    .map((file) => file.slice(0, -suffix.length))
    .sort();
}

function parseResult(line: string | undefined): BenchResult | string {
  if (!line) return 'printed nothing';
  let value: unknown;
  try {
    value = JSON.parse(line);
  } catch {
    return `its last line is not JSON: ${line.slice(0, 120)}`;
  }
  const r = value as Partial<BenchResult>;
  if (typeof r !== 'object' || r === null) return 'its last line is not a JSON object';
  const problems: string[] = [];
  if (typeof r.name !== 'string') problems.push('name (string)');
  if (typeof r.value !== 'number' || !Number.isFinite(r.value)) problems.push('value (number)');
  if (typeof r.unit !== 'string') problems.push('unit (string)');
  if (typeof r.stat !== 'string') problems.push('stat (string)');
  if (typeof r.target !== 'string') problems.push('target (string)');
  if (r.ratio !== undefined && typeof r.ratio !== 'number') problems.push('ratio (number)');
  if (r.memory_mb !== undefined && typeof r.memory_mb !== 'number') problems.push('memory_mb (number)');
  return problems.length ? `its JSON result lacks or mistypes ${problems.join(', ')}` : (r as BenchResult);
}

async function runBench(name: string): Promise<BenchResult | string> {
  process.stdout.write(`\n━━ bench ${name} ━━\n`);
  let last: string | undefined;
  const proc = new Proc(name, path.join(repoRoot, 'node_modules', '.bin', 'tsx'), [path.join(benchDir, `${name}${suffix}`)], {
    cwd: repoRoot,
    output: {
      prefix: '',
      onLine: (line) => {
        if (line.trim()) last = line.trim();
      },
    },
  });
  const timer = setTimeout(() => {
    process.stderr.write(`bench ${name}: still running after ${hardLimitMs / 1000} s; stopping it\n`);
    void proc.stop();
  }, hardLimitMs);
  const exit = await proc.exited;
  clearTimeout(timer);
  if (!succeeded(exit)) return `it ${describeExit(exit)}`;
  return parseResult(last);
}

async function main(): Promise<number> {
  const names = available();
  const wanted = process.argv.slice(2).filter((arg) => arg !== '--');
  if (names.length === 0) {
    console.log('No benchmark is present yet (bench/*.bench.ts).');
    return wanted.length ? 1 : 0;
  }
  const unknown = wanted.filter((name) => !names.includes(name));
  if (unknown.length) {
    console.error(`Unknown benchmark ${unknown.join(', ')}. Available: ${names.join(', ')}`);
    return 1;
  }
  const selected = wanted.length ? wanted : names;
  const outcomes: Array<[string, BenchResult | string]> = [];
  for (const name of selected) {
    if (stopping) break;
    outcomes.push([name, await runBench(name)]);
  }
  console.log('\nresults:');
  let failed = 0;
  for (const [name, outcome] of outcomes) {
    if (typeof outcome === 'string') {
      failed++;
      console.log(`${name}: FAILED, ${outcome}`);
    } else {
      console.log(JSON.stringify(outcome));
    }
  }
  // Every figure DESIGN.md §8 names, beside its target. A missed target does not change the exit
  // status: that says whether the measurements ran (bench/README.md).
  const rows = summarise(outcomes);
  if (rows.length > 0) {
    console.log('\nfigures against their targets (DESIGN.md §8):');
    console.log(formatSummary(rows));
    const judged = rows.filter((r) => r.verdict === 'met' || r.verdict === 'MISSED');
    const missed = rows.filter((r) => r.verdict === 'MISSED');
    const unknown = rows.filter((r) => r.verdict === 'bench failed' || r.verdict === 'not measured' || r.verdict === 'not reported');
    console.log(
      `${judged.length - missed.length} of ${judged.length} targets met` +
        (missed.length ? `; missed: ${missed.map((r) => `${r.bench} ${r.figure}`).join(', ')}` : '') +
        (unknown.length ? `; ${unknown.length} figure(s) without a value` : ''),
    );
  }
  return failed || stopping ? 1 : 0;
}

let stopping = false;
for (const signal of ['SIGINT', 'SIGTERM', 'SIGHUP'] as const) {
  process.on(signal, () => {
    if (stopping) return;
    stopping = true;
    void stopAll();
  });
}

main().then(
  (code) => process.exit(code),
  (error: unknown) => {
    console.error((error as Error).message);
    process.exit(1);
  },
);
