// Readers saving rows over real HTTP, shared by the save-row benchmark and the load browser test
// (e2e/scale-out.e2e.ts): one client per sheet with its own keep-alive connection, PUTting
// successive rows of readings (/api/sheets/:id/rows/:rowIndex, pass 1), and the check that the
// database holds every acknowledged row exactly once, as typed, each reading with its audit entry.
import http from 'node:http';
import type { Channel, SaveRowRequest, SaveRowResponse } from '@dialsheet/common';

export interface Outcome {
  /** Index of the client (one sheet each). */
  sheet: number;
  row: number;
  ms: number;
  ok: boolean;
  /** Paced rows: how long the row waited in the reader's queue behind the previous one (part of ms). */
  queuedMs?: number;
  /** Paced rows: when the row was due, in ms from the start of the phase. */
  dueAt?: number;
}

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

/** The six values typed for a row of the demo panel (T1–T4, V, P): plausible, different from row to row, exact as text. */
export function rowTexts(row: number): string[] {
  const t = (base: number) => (base + (row % 200) / 10).toFixed(1);
  return [t(20), t(30), t(15), t(25), (2.5 + (row % 100) / 1000).toFixed(3), (5 + (row % 8) * 0.5).toFixed(1)];
}

export class SaveClient {
  readonly agent = new http.Agent({ keepAlive: true, maxSockets: 1 });
  nextRow = 0;
  readonly errors: string[] = [];

  /**
   * `url` is the API process this reader talks to; `timeoutMs` how long a save may take before it
   * counts as an error (the browser's queue would retry it).
   */
  constructor(
    readonly index: number,
    readonly sheetId: string,
    private readonly channels: readonly Channel[],
    private readonly authorization: string,
    readonly url: URL,
    readonly rowCount: number,
    private readonly timeoutMs = 10_000,
  ) {}

  /** PUTs the next row; resolves with its latency and whether the answer was the promised one. */
  save(): Promise<Outcome> {
    const row = this.nextRow++;
    const texts = rowTexts(row);
    const body: SaveRowRequest = {
      pass: 1,
      readings: this.channels.map((channel, i) => ({ channelId: channel.id, rawText: texts[i], frameTime: Math.floor(row * 0.1 * 2) / 2 })),
    };
    const payload = Buffer.from(JSON.stringify(body));
    const url = new URL(`/api/sheets/${this.sheetId}/rows/${row}`, this.url);
    return new Promise((resolve) => {
      const started = process.hrtime.bigint();
      let settled = false;
      const done = (ok: boolean, problem?: string) => {
        if (settled) return;
        settled = true;
        const ms = Number(process.hrtime.bigint() - started) / 1e6;
        if (problem && this.errors.length < 5) this.errors.push(`row ${row}: ${problem}`);
        resolve({ sheet: this.index, row, ms, ok });
      };
      const request = http.request(
        url,
        {
          method: 'PUT',
          agent: this.agent,
          headers: { authorization: this.authorization, 'content-type': 'application/json', 'content-length': String(payload.length) },
        },
        (response) => {
          const chunks: Buffer[] = [];
          response.on('data', (chunk: Buffer) => chunks.push(chunk));
          response.on('error', (error) => done(false, error.message));
          response.on('end', () => {
            const text = Buffer.concat(chunks).toString('utf8');
            if (response.statusCode !== 200) return done(false, `HTTP ${response.statusCode} ${text.slice(0, 200)}`);
            try {
              const answer = JSON.parse(text) as SaveRowResponse;
              const good = answer.readings.length === texts.length && answer.readings.every((r, i) => r.rawText === texts[i] && r.rowIndex === row);
              done(good, good ? undefined : `the answer does not echo the row: ${text.slice(0, 200)}`);
            } catch {
              done(false, `the answer is not JSON: ${text.slice(0, 200)}`);
            }
          });
        },
      );
      request.setTimeout(this.timeoutMs, () => request.destroy(new Error(`no answer within ${this.timeoutMs / 1000} s`)));
      request.on('error', (error) => done(false, error.message));
      request.end(payload);
    });
  }

  /** Saves rows back to back until `untilMs` (performance.now()). */
  async loop(untilMs: number, out: Outcome[]): Promise<void> {
    while (performance.now() < untilMs && this.nextRow < this.rowCount) out.push(await this.save());
  }

  /**
   * A reader: the next row is due `pause()` ms after the last one was due; it is sent when due, or
   * when the previous answer came if that is later (the entry screen's queue), and its latency is
   * counted from when it was due. Rows due from `untilMs` on are not sent.
   */
  async paced(start: number, firstDue: number, untilMs: number, out: Outcome[], pause: () => number): Promise<void> {
    let due = firstDue;
    while (due < untilMs && this.nextRow < this.rowCount) {
      const wait = due - performance.now();
      if (wait > 0) await sleep(wait);
      const late = Math.max(0, performance.now() - due);
      const outcome = await this.save();
      out.push({ ...outcome, ms: outcome.ms + late, queuedMs: late, dueAt: due - start });
      due += pause();
    }
  }
}

/** Enough of a pg client (pg.Client or pg.Pool) to run the check. */
export interface Queryable {
  query<R extends object>(text: string, values?: unknown[]): Promise<{ rows: R[] }>;
}

export interface StoredCheck {
  /** Rows answered 200 with the row echoed back. */
  acknowledged: number;
  /** Rows the database holds (any reading of pass 1) on these sheets. */
  stored: number;
  /** Acknowledged rows the database does not hold. */
  lost: number;
  /** Stored rows that are not exactly the texts typed for them, or lack a channel. */
  wrong: number;
  /** Stored rows never acknowledged (a save that timed out on the client but went through). */
  unacknowledged: number;
  /** Readings beyond one per sheet, row, channel and pass. */
  duplicates: number;
  readings: number;
  /** 'create' audit entries of the readings of these sheets. */
  audits: number;
}

/**
 * What the database holds for `sheetIds` (client i saved to sheetIds[i]) against the outcomes:
 * every acknowledged row must be there once, as `rowTexts` made it, with one audit entry per
 * reading. Counts, so the caller decides (a test asserts, the benchmark prints and fails).
 */
export async function checkStored(db: Queryable, sheetIds: readonly string[], channelCount: number, outcomes: readonly Outcome[]): Promise<StoredCheck> {
  const saved = new Set<string>();
  for (const o of outcomes) if (o.ok) saved.add(`${o.sheet}:${o.row}`);
  const sheetIndex = new Map(sheetIds.map((id, i) => [id, i]));
  const { rows: stored } = await db.query<{ sheet_id: string; row_index: number; n: number; texts: string[] }>(
    `SELECT r.sheet_id, r.row_index, count(*)::int AS n, array_agg(r.raw_text ORDER BY sc.position) AS texts
       FROM readings r JOIN sheet_channels sc ON sc.sheet_id = r.sheet_id AND sc.channel_id = r.channel_id
      WHERE r.pass = 1 AND r.sheet_id = ANY($1::uuid[])
      GROUP BY r.sheet_id, r.row_index`,
    [sheetIds],
  );
  let wrong = 0;
  const found = new Set<string>();
  for (const row of stored) {
    const key = `${sheetIndex.get(row.sheet_id)}:${row.row_index}`;
    found.add(key);
    if (row.n !== channelCount || row.texts.join('|') !== rowTexts(row.row_index).join('|')) wrong++;
  }
  let lost = 0;
  for (const key of saved) if (!found.has(key)) lost++;
  const unacknowledged = [...found].filter((key) => !saved.has(key)).length;
  const { rows: counts } = await db.query<{ readings: number; distinct_cells: number; audits: number }>(
    `SELECT (SELECT count(*)::int FROM readings WHERE sheet_id = ANY($1::uuid[])) AS readings,
            (SELECT count(DISTINCT (sheet_id, row_index, channel_id, pass))::int FROM readings WHERE sheet_id = ANY($1::uuid[])) AS distinct_cells,
            (SELECT count(*)::int FROM audit_entries a JOIN readings r ON r.id = a.entity_id
              WHERE a.entity_type = 'reading' AND a.action = 'create' AND r.sheet_id = ANY($1::uuid[])) AS audits`,
    [sheetIds],
  );
  const c = counts[0];
  return {
    acknowledged: saved.size,
    stored: stored.length,
    lost,
    wrong,
    unacknowledged,
    duplicates: c.readings - c.distinct_cells,
    readings: c.readings,
    audits: c.audits,
  };
}
