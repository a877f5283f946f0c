// What an analysis's result depends on, as a digest stored at compute time: one entry per input
// (the readings of a run, a channel's spec, its calibration, a derived channel, a rule, another
// analysis's computation). On every read the same entries are taken from the data as it is now;
// any entry that differs makes the analysis stale, and its phrase says why.
import type { EntityManager } from 'typeorm';
import type { CampaignContext } from './analysis-context';

export type Digest = Record<string, string>;

export interface CurrentState {
  values: Map<string, string>;
  /** Why an entry changed, as the stale reason says it. */
  phrases: Map<string, string>;
}

const iso = (d: Date | string) => new Date(d).toISOString();
const stamp = (version: number, updatedAt: Date | string) => `v${version}@${iso(updatedAt)}`;

/** The current value of every entry an analysis of this campaign can depend on. */
export async function currentState(manager: EntityManager, ctx: CampaignContext): Promise<CurrentState> {
  const values = new Map<string, string>();
  const phrases = new Map<string, string>();
  // Readings are never deleted; an edit bumps updated_at: count + latest change covers both.
  const runs = (await manager.query(
    `SELECT ru.id, ru.name,
            (SELECT count(*) || '/' || coalesce(max(r.updated_at)::text, '-')
               FROM readings r JOIN sheets s ON s.id = r.sheet_id WHERE s.run_id = ru.id) AS readings,
            (SELECT count(*) || '/' || coalesce(max(x.updated_at)::text, '-')
               FROM resolutions x JOIN sheets s ON s.id = x.sheet_id WHERE s.run_id = ru.id) AS resolutions,
            (SELECT count(*) || '/' || coalesce(max(s.updated_at)::text, '-') || '/' || count(s.pass2_finished_at)
               FROM sheets s WHERE s.run_id = ru.id) AS sheets
       FROM runs ru WHERE ru.campaign_id = $1`,
    [ctx.campaignId],
  )) as Array<{ id: string; name: string; readings: string; resolutions: string; sheets: string }>;
  for (const r of runs) {
    values.set(`run:${r.id}`, `${r.readings}|${r.resolutions}|${r.sheets}`);
    phrases.set(`run:${r.id}`, `readings of run “${r.name}” changed`);
  }
  for (const c of ctx.channels.values()) {
    values.set(`channel:${c.id}`, iso(c.updated_at));
    phrases.set(`channel:${c.id}`, `the spec of channel ${c.symbol} changed`);
    const cal = ctx.calibrations.get(c.id);
    values.set(`cal:${c.id}`, cal ? stamp(cal.version, cal.updated_at) : 'none');
    phrases.set(`cal:${c.id}`, `the calibration of ${c.symbol} changed`);
  }
  for (const d of ctx.derived.values()) {
    values.set(`derived:${d.id}`, stamp(d.version, d.updated_at));
    phrases.set(`derived:${d.id}`, `derived channel ${d.symbol} changed`);
  }
  for (const r of ctx.rules.values()) {
    values.set(`rule:${r.id}`, stamp(r.version, r.updated_at));
    phrases.set(`rule:${r.id}`, `stability rule “${r.name}” changed`);
  }
  const analyses = (await manager.query('SELECT id, name, computed_at FROM analyses WHERE campaign_id = $1', [ctx.campaignId])) as Array<{
    id: string;
    name: string;
    computed_at: Date | null;
  }>;
  for (const a of analyses) {
    values.set(`analysis:${a.id}`, a.computed_at ? iso(a.computed_at) : 'never');
    phrases.set(`analysis:${a.id}`, `analysis “${a.name}” was recomputed`);
  }
  return { values, phrases };
}

/** The entries a channel's or derived channel's values depend on, through derived inputs. */
export function channelKeys(ctx: CampaignContext, channelId: string, into: Set<string> = new Set()): Set<string> {
  if (ctx.channels.has(channelId)) {
    into.add(`channel:${channelId}`);
    into.add(`cal:${channelId}`);
    return into;
  }
  const d = ctx.derived.get(channelId);
  if (!d || into.has(`derived:${d.id}`)) return into;
  into.add(`derived:${d.id}`);
  for (const symbol of d.inputs) {
    const id = ctx.symbols.get(symbol);
    if (id) channelKeys(ctx, id, into);
  }
  return into;
}

export function digestOf(keys: Iterable<string>, state: CurrentState): Digest {
  const digest: Digest = {};
  for (const key of [...keys].sort()) digest[key] = state.values.get(key) ?? 'gone';
  return digest;
}

/** What changed since the digest was taken, as phrases; [] when nothing did. */
export function changesSince(digest: Digest, state: CurrentState): string[] {
  const changes: string[] = [];
  for (const [key, value] of Object.entries(digest)) {
    const now = state.values.get(key) ?? 'gone';
    if (now === value) continue;
    changes.push(now === 'gone' ? `${state.phrases.get(key)?.replace(/ (changed|was recomputed)$/, '') ?? key} was deleted` : (state.phrases.get(key) ?? `${key} changed`));
  }
  return changes;
}
