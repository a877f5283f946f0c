import type { ChannelSeries } from '@dialsheet/common';
import { compileChain, compileExpression } from '@dialsheet/common/dist/analysis';
import { BadRequestException, ForbiddenException, Injectable, NotFoundException } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { isUUID } from 'class-validator';
import { DataSource, EntityManager } from 'typeorm';
import type { AuthUser } from '../../core/auth-user';
import { CampaignAccessService } from '../campaigns/campaign-access.service';
import { asBadRequest } from '../calibrations/analysis-input';
import { RUN_NOT_FOUND } from '../runs/run-access.service';
import { loadContext, type CampaignContext } from './analysis-context';
import { resolveCells, timeKey, type SeriesEntry, type SeriesResolution, type SeriesSheet } from './series-builder';

/** Series show pass-1 values before pass 2 exists: the roles that oversee every pass only. */
export const SERIES_READERS = ['lead', 'engineer'] as const;

export const SERIES_CHANNEL_NOT_FOUND = 'Channel not found in this run’s campaign';

interface RunRow {
  id: string;
  campaign_id: string;
  name: string;
}

/**
 * The checker of a sheet never sees pass-1 values before finishing pass 2, whatever other roles
 * they hold: a member with such a sheet in the run gets no series (nor results) of that run.
 */
export async function blindSheetsOf(manager: EntityManager, userId: string, runIds: readonly string[]): Promise<Array<{ run_id: string; name: string }>> {
  if (runIds.length === 0) return [];
  return (await manager.query(
    `SELECT run_id, name FROM sheets WHERE checker_id = $1 AND pass2_finished_at IS NULL AND run_id = ANY($2::uuid[]) ORDER BY created_at`,
    [userId, runIds],
  )) as Array<{ run_id: string; name: string }>;
}

@Injectable()
export class SeriesService {
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly access: CampaignAccessService,
  ) {}

  async series(user: AuthUser, runId: string, channelId: string): Promise<ChannelSeries> {
    const manager = this.dataSource.manager;
    const run = await this.findRun(manager, runId);
    try {
      await this.access.require(user, run.campaign_id, SERIES_READERS);
    } catch (error) {
      if (error instanceof NotFoundException) throw new NotFoundException(RUN_NOT_FOUND);
      throw error;
    }
    const [blind] = await blindSheetsOf(manager, user.id, [run.id]);
    if (blind) throw new ForbiddenException(`Pass 1 of this run is hidden from you until you finish pass 2 of sheet “${blind.name}”`);
    const ctx = await loadContext(manager, run.campaign_id);
    if (!isUUID(channelId) || (!ctx.channels.has(channelId) && !ctx.derived.has(channelId))) throw new NotFoundException(SERIES_CHANNEL_NOT_FOUND);
    return this.build(manager, ctx, run.id, channelId);
  }

  async findRun(manager: EntityManager, runId: string): Promise<RunRow> {
    if (!isUUID(runId)) throw new NotFoundException(RUN_NOT_FOUND);
    const [run] = (await manager.query('SELECT id, campaign_id, name FROM runs WHERE id = $1', [runId])) as RunRow[];
    if (!run) throw new NotFoundException(RUN_NOT_FOUND);
    return run;
  }

  /** A channel's or derived channel's series in one run, in engineering units. */
  async build(manager: EntityManager, ctx: CampaignContext, runId: string, channelId: string, visiting: string[] = []): Promise<ChannelSeries> {
    const channel = ctx.channels.get(channelId);
    if (channel) return this.buildChannel(manager, ctx, runId, channelId);
    const derived = ctx.derived.get(channelId);
    if (!derived) throw new BadRequestException(`channelId ${channelId} is neither a channel nor a derived channel of this campaign`);
    if (visiting.includes(derived.id)) throw new BadRequestException(`derived channel ${derived.symbol} depends on itself`);
    const allSymbols = [...ctx.symbols.keys()].filter((s) => s !== derived.symbol);
    const compiled = asBadRequest(() => compileExpression(derived.expression, allSymbols, derived.constants));
    const inputs = compiled.symbols.filter((s) => ctx.symbols.has(s) && !Object.hasOwn(derived.constants, s));
    const inputSeries: Array<{ symbol: string; values: Map<string, { t: number; v: number; unchecked: boolean }>; skipped: Map<string, string> }> = [];
    for (const symbol of inputs) {
      const s = await this.build(manager, ctx, runId, ctx.symbols.get(symbol) as string, [...visiting, derived.id]);
      const values = new Map<string, { t: number; v: number; unchecked: boolean }>();
      s.t.forEach((t, i) => {
        if (!values.has(timeKey(t))) values.set(timeKey(t), { t, v: s.value[i], unchecked: s.unchecked[i] });
      });
      const skipped = new Map<string, string>();
      for (const k of s.skipped) if (!skipped.has(timeKey(k.t))) skipped.set(timeKey(k.t), k.reason);
      inputSeries.push({ symbol, values, skipped });
    }
    const times = new Map<string, number>();
    for (const s of inputSeries) {
      for (const [k, p] of s.values) times.set(k, p.t);
      for (const k of s.skipped.keys()) if (!times.has(k)) times.set(k, Number(k));
    }
    const out: ChannelSeries = {
      runId,
      channelId,
      derived: true,
      symbol: derived.symbol,
      rawUnit: derived.unit,
      unit: derived.unit,
      t: [],
      raw: [],
      value: [],
      unchecked: [],
      uncheckedCount: 0,
      skipped: [],
      calibrationVersion: null,
    };
    for (const [k, t] of [...times].sort((a, b) => a[1] - b[1])) {
      const scope: Record<string, number> = {};
      const missing: string[] = [];
      let unchecked = false;
      for (const s of inputSeries) {
        const p = s.values.get(k);
        if (p) {
          scope[s.symbol] = p.v;
          unchecked ||= p.unchecked;
        } else {
          missing.push(s.skipped.has(k) ? `${s.symbol}: ${s.skipped.get(k)}` : `no ${s.symbol} reading at this time`);
        }
      }
      if (missing.length > 0) {
        out.skipped.push({ t, reason: missing.join('; ') });
        continue;
      }
      try {
        const v = compiled.evaluate(scope);
        out.t.push(t);
        out.raw.push(v);
        out.value.push(v);
        out.unchecked.push(unchecked);
        if (unchecked) out.uncheckedCount += 1;
      } catch (error) {
        if (!(error instanceof RangeError)) throw error;
        out.skipped.push({ t, reason: error.message });
      }
    }
    return out;
  }

  private async buildChannel(manager: EntityManager, ctx: CampaignContext, runId: string, channelId: string): Promise<ChannelSeries> {
    const channel = ctx.channels.get(channelId)!;
    const sheets = (
      (await manager.query(
        `SELECT s.id, s.name, s.start_time, s.end_time, s.interval
           FROM sheets s JOIN sheet_channels sc ON sc.sheet_id = s.id AND sc.channel_id = $2
          WHERE s.run_id = $1 ORDER BY s.start_time, s.created_at, s.id`,
        [runId, channelId],
      )) as Array<{ id: string; name: string; start_time: number; end_time: number; interval: number }>
    ).map((s): SeriesSheet => ({ id: s.id, name: s.name, startTime: s.start_time, endTime: s.end_time, interval: s.interval }));
    const sheetIds = sheets.map((s) => s.id);
    const entries = sheetIds.length
      ? (
          (await manager.query(
            `SELECT sheet_id, row_index, pass, value, flag, canonical FROM readings WHERE channel_id = $2 AND sheet_id = ANY($1::uuid[])`,
            [sheetIds, channelId],
          )) as Array<{ sheet_id: string; row_index: number; pass: number; value: number | null; flag: SeriesEntry['flag']; canonical: string | null }>
        ).map((r): SeriesEntry => ({ sheetId: r.sheet_id, rowIndex: r.row_index, pass: r.pass, value: r.value, flag: r.flag, canonical: r.canonical }))
      : [];
    const resolutions = sheetIds.length
      ? (
          (await manager.query(`SELECT sheet_id, row_index, value, flag FROM resolutions WHERE channel_id = $2 AND sheet_id = ANY($1::uuid[])`, [
            sheetIds,
            channelId,
          ])) as Array<{ sheet_id: string; row_index: number; value: number | null; flag: SeriesResolution['flag'] }>
        ).map((r): SeriesResolution => ({ sheetId: r.sheet_id, rowIndex: r.row_index, value: r.value, flag: r.flag }))
      : [];
    const cells = resolveCells(sheets, entries, resolutions);
    const calibration = ctx.calibrations.get(channelId) ?? null;
    const chain = asBadRequest(() => compileChain(calibration?.chain ?? null, channel.raw_unit));
    const out: ChannelSeries = {
      runId,
      channelId,
      derived: false,
      symbol: channel.symbol,
      rawUnit: channel.raw_unit,
      unit: chain.unit,
      t: [],
      raw: [],
      value: [],
      unchecked: [],
      uncheckedCount: 0,
      skipped: [...cells.skipped],
      calibrationVersion: calibration?.version ?? null,
    };
    cells.t.forEach((t, i) => {
      let value: number;
      try {
        value = chain.apply(cells.raw[i]);
      } catch (error) {
        // A table calibration refuses values outside its points: that reading has no number.
        if (!(error instanceof RangeError)) throw error;
        out.skipped.push({ t, reason: error.message });
        return;
      }
      out.t.push(t);
      out.raw.push(cells.raw[i]);
      out.value.push(value);
      out.unchecked.push(cells.unchecked[i]);
      if (cells.unchecked[i]) out.uncheckedCount += 1;
    });
    out.skipped.sort((a, b) => a.t - b.t);
    return out;
  }
}
