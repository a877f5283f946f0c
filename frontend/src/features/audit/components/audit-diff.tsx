import { Typography } from 'antd';

type Snapshot = Record<string, unknown> | null;

export interface DiffLine {
  key: string;
  kind: 'added' | 'removed' | 'changed';
  before?: unknown;
  after?: unknown;
}

function same(a: unknown, b: unknown): boolean {
  return JSON.stringify(a) === JSON.stringify(b);
}

/** The fields that differ between two snapshots, in a stable order. */
export function diffSnapshots(before: Snapshot, after: Snapshot): DiffLine[] {
  const keys = [...new Set([...Object.keys(before ?? {}), ...Object.keys(after ?? {})])].sort();
  const lines: DiffLine[] = [];
  for (const key of keys) {
    const hasBefore = before !== null && key in before;
    const hasAfter = after !== null && key in after;
    if (hasBefore && hasAfter) {
      if (!same(before[key], after[key])) lines.push({ key, kind: 'changed', before: before[key], after: after[key] });
    } else if (hasAfter) {
      lines.push({ key, kind: 'added', after: after![key] });
    } else if (hasBefore) {
      lines.push({ key, kind: 'removed', before: before![key] });
    }
  }
  return lines;
}

function show(value: unknown): string {
  if (value === null || value === undefined) return '—';
  if (typeof value === 'string') return value.length > 80 ? `“${value.slice(0, 77)}…”` : `“${value}”`;
  if (Array.isArray(value)) return value.map((v) => (typeof v === 'string' ? v : JSON.stringify(v))).join(', ') || '∅';
  return typeof value === 'object' ? JSON.stringify(value) : String(value);
}

/** Before → after for one audit row, one line per field that changed. */
export function AuditDiff({ before, after }: { before: Snapshot; after: Snapshot }) {
  const lines = diffSnapshots(before, after);
  if (lines.length === 0) return <Typography.Text type="secondary">No field changes</Typography.Text>;
  return (
    <ul className="audit-diff">
      {lines.map((line) => (
        <li key={line.key} className={`audit-diff-${line.kind}`}>
          <span className="audit-diff-key">{line.key}</span>
          {line.kind === 'changed' ? (
            <>
              <del>{show(line.before)}</del>
              <span className="audit-diff-arrow" aria-label="becomes">→</span>
              <ins>{show(line.after)}</ins>
            </>
          ) : line.kind === 'added' ? (
            <ins>{show(line.after)}</ins>
          ) : (
            <del>{show(line.before)}</del>
          )}
        </li>
      ))}
    </ul>
  );
}
