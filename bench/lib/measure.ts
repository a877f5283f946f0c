// Figures: percentiles of a sample, and the resident memory of another process over time.
import fs from 'node:fs';

/** Nearest-rank percentile (p in 0–100) of unsorted values. */
export function percentile(values: readonly number[], p: number): number {
  if (values.length === 0) throw new Error('percentile of an empty sample');
  const sorted = [...values].sort((a, b) => a - b);
  const rank = Math.ceil((p / 100) * sorted.length);
  return sorted[Math.min(sorted.length, Math.max(1, rank)) - 1];
}

export function median(values: readonly number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2;
}

export const round = (value: number, digits: number) => Number(value.toFixed(digits));

const KIB_PER_MIB = 1024;

/** VmRSS (now) and VmHWM (peak since start or the last reset) of a process, in MiB, from /proc. */
export function memoryOf(pid: number): { rssMiB: number; hwmMiB: number } {
  const status = fs.readFileSync(`/proc/${pid}/status`, 'utf8');
  const field = (name: string) => {
    const match = new RegExp(`^${name}:\\s+(\\d+) kB`, 'm').exec(status);
    if (!match) throw new Error(`/proc/${pid}/status has no ${name}`);
    return Number(match[1]) / KIB_PER_MIB;
  };
  return { rssMiB: field('VmRSS'), hwmMiB: field('VmHWM') };
}

/**
 * Resets the kernel's peak-RSS mark (VmHWM) of a process to its current RSS (Linux ≥ 4.0, own
 * processes). With it the peak between two samples is not missed. False when not permitted.
 */
export function resetPeak(pid: number): boolean {
  try {
    fs.writeFileSync(`/proc/${pid}/clear_refs`, '5');
    return true;
  } catch {
    return false;
  }
}

/** Samples a process's RSS every `intervalMs` until stopped; reports the highest value seen. */
export class RssSampler {
  private timer?: NodeJS.Timeout;
  private peak = 0;
  samples = 0;

  constructor(
    private readonly pid: number,
    private readonly intervalMs = 50,
  ) {}

  start(): void {
    this.sample();
    this.timer = setInterval(() => this.sample(), this.intervalMs);
  }

  /** Highest RSS seen, in MiB (one more sample is taken now). */
  stop(): number {
    clearInterval(this.timer);
    this.sample();
    return this.peak;
  }

  private sample(): void {
    try {
      this.peak = Math.max(this.peak, memoryOf(this.pid).rssMiB);
      this.samples += 1;
    } catch {
      // The process is gone; the benchmark notices through its requests failing.
    }
  }
}

/** Clock ticks per second of /proc/<pid>/stat times (USER_HZ); 100 on every common Linux build. */
const USER_HZ = 100;

/** CPU time (user + system) a process has used so far, in ms; undefined when it is gone. */
export function cpuMsOf(pid: number): number | undefined {
  let stat: string;
  try {
    stat = fs.readFileSync(`/proc/${pid}/stat`, 'utf8');
  } catch {
    return undefined;
  }
  // The command name (field 2) may hold spaces; the fields after its closing parenthesis do not.
  const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
  // utime and stime are fields 14 and 15 of the whole line, 12 and 13 after the name.
  return ((Number(fields[11]) + Number(fields[12])) * 1000) / USER_HZ;
}

/** Process ids whose parent is `pid` (e.g. the backends of a PostgreSQL postmaster). */
export function childPids(pid: number): number[] {
  const children: number[] = [];
  for (const entry of fs.readdirSync('/proc')) {
    if (!/^\d+$/.test(entry)) continue;
    try {
      const stat = fs.readFileSync(`/proc/${entry}/stat`, 'utf8');
      const ppid = Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[1]);
      if (ppid === pid) children.push(Number(entry));
    } catch {
      // Exited while we looked.
    }
  }
  return children;
}

/** CPU time of a process and all its children alive now, in ms. */
export function treeCpuMs(pid: number): number {
  return [pid, ...childPids(pid)].reduce((sum, p) => sum + (cpuMsOf(p) ?? 0), 0);
}
