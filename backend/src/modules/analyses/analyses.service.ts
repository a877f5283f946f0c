import type {
  Analysis,
  AnalysisKind,
  BalanceInput,
  BalanceOutput,
  ChannelSpec,
  EnergyStream,
  MassStream,
  MeasuredValue,
  ChannelSeries,
  StableValue,
  StableValueInput,
  StableValueOptions,
  StableValueOutput,
  TrendPoint,
} from '@dialsheet/common';
import {
  combineBudget,
  compileChain,
  compileExpression,
  derivedUncertainty,
  energyBalance,
  evaluateStability,
  FIT_COMPONENT_NAME,
  formatNumber,
  massBalance,
  measuredFromBudget,
  stableValue,
  type ComponentInput,
  type DerivedInput,
} from '@dialsheet/common/dist/analysis';
import { BadRequestException, ConflictException, HttpException, Injectable, Logger, NotFoundException } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource, EntityManager, QueryFailedError } from 'typeorm';
import type { AuthUser } from '../../core/auth-user';
import { AuditService } from '../audit/audit.service';
import { asBadRequest, checkBaseVersion, iso } from '../calibrations/analysis-input';
import { AnalysisSetupAccess } from '../calibrations/analysis-setup-access';
import type { DerivedChannelRow } from '../calibrations/calibration-records';
import { loadContext, type CampaignContext } from './analysis-context';
import { changesSince, channelKeys, currentState, digestOf, type CurrentState, type Digest } from './analysis-digest';
import { balanceInputProblems, cleanBalanceInput, cleanStableValueInput, stableValueInputProblems } from './analysis-input-rules';
import { AnalysesQueryDto, CreateAnalysisDto, UpdateAnalysisDto } from './dto/analysis.dto';
import { blindSheetsOf, SeriesService } from './series.service';

export const ANALYSIS_NOT_FOUND = 'Analysis not found';
const duplicateName = (name: string) => `An analysis named “${name}” already exists in this campaign`;

export interface AnalysisRow {
  id: string;
  campaign_id: string;
  name: string;
  kind: AnalysisKind;
  input: StableValueInput | BalanceInput;
  result: StableValueOutput | BalanceOutput | null;
  status: 'current' | 'failed';
  error: string | null;
  inputs_digest: Digest;
  computed_at: Date | null;
  computed_by: string | null;
  computed_by_name: string | null;
  run_ids: string[];
  uses: string[];
  rule_id: string | null;
  note: string | null;
  version: number;
  created_at: Date;
  updated_at: Date;
}

const ROW_SELECT = `SELECT a.*, u.name AS computed_by_name FROM analyses a LEFT JOIN users u ON u.id = a.computed_by`;

interface Computed {
  input: StableValueInput | BalanceInput;
  result: StableValueOutput | BalanceOutput;
  digest: Digest;
  runIds: string[];
  uses: string[];
  ruleId: string | null;
}

/** A few numbers for the audit trail (the stored result with residuals would swamp it). */
export function resultSummary(kind: AnalysisKind, result: StableValueOutput | BalanceOutput | null): Record<string, unknown> | null {
  if (!result) return null;
  if (kind === 'stable-value') {
    const r = result as StableValueOutput;
    return { value: r.stable.value, unit: r.stable.unit, expandedUncertainty: r.stable.expandedUncertainty, stable: r.stability?.pass ?? null };
  }
  const r = result as BalanceOutput;
  return { massClosurePercent: r.mass.closurePercent, massPass: r.mass.pass, energyClosurePercent: r.energy?.closurePercent ?? null, energyPass: r.energy?.pass ?? null };
}

function isUniqueViolation(error: unknown): boolean {
  const e = error instanceof QueryFailedError ? (error.driverError as { code?: string; constraint?: string }) : null;
  return e?.code === '23505' && e.constraint === 'analyses_campaign_name_key';
}

/** The message of a refused computation (a 400 from asBadRequest or a lookup). */
function refusal(error: unknown): string | null {
  if (error instanceof HttpException && error.getStatus() < 500) {
    const body = error.getResponse();
    const message = typeof body === 'string' ? body : (body as { message?: unknown }).message;
    return Array.isArray(message) ? message.join('; ') : String(message ?? error.message);
  }
  return null;
}

@Injectable()
export class AnalysesService {
  private readonly logger = new Logger('Analyses');

  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly setup: AnalysisSetupAccess,
    private readonly audit: AuditService,
    private readonly series: SeriesService,
  ) {}

  // ── Reads ──────────────────────────────────────────────────────────────────────────────────

  async list(user: AuthUser, campaignId: string, query: AnalysesQueryDto): Promise<Analysis[]> {
    await this.setup.read(user, campaignId);
    const manager = this.dataSource.manager;
    const params: unknown[] = [campaignId];
    let where = 'a.campaign_id = $1';
    if (query.runId) {
      params.push(query.runId);
      where += ` AND $${params.length}::uuid = ANY (a.run_ids)`;
    }
    if (query.kind) {
      params.push(query.kind);
      where += ` AND a.kind = $${params.length}`;
    }
    const rows = (await manager.query(`${ROW_SELECT} WHERE ${where} ORDER BY a.created_at, a.id`, params)) as AnalysisRow[];
    return this.describe(manager, campaignId, rows, user);
  }

  async get(user: AuthUser, id: string): Promise<Analysis> {
    const manager = this.dataSource.manager;
    const { row } = await this.setup.row<AnalysisRow>(user, manager, id, `${ROW_SELECT} WHERE a.id = $1`, ANALYSIS_NOT_FOUND, 'read');
    const [analysis] = await this.describe(manager, row.campaign_id, [row], user);
    return analysis;
  }

  // ── Changes ────────────────────────────────────────────────────────────────────────────────

  async create(user: AuthUser, campaignId: string, dto: CreateAnalysisDto): Promise<Analysis> {
    return this.withNameGuard(dto.name, () =>
      this.dataSource.transaction(async (manager) => {
        await this.setup.writable(user, campaignId, manager);
        await this.refuseDuplicateName(manager, campaignId, dto.name, null);
        const ctx = await loadContext(manager, campaignId);
        const state = await currentState(manager, ctx);
        const computed = await this.compute(manager, ctx, state, dto.kind, dto.input, null);
        const [row] = (await manager.query(
          `INSERT INTO analyses (campaign_id, name, kind, input, result, status, error, inputs_digest, computed_at, computed_by,
                                 run_ids, uses, rule_id, note, created_by)
           VALUES ($1, $2, $3, $4, $5, 'current', NULL, $6, now(), $7, $8, $9, $10, $11, $7) RETURNING id`,
          [
            campaignId,
            dto.name,
            dto.kind,
            JSON.stringify(computed.input),
            JSON.stringify(computed.result),
            JSON.stringify(computed.digest),
            user.id,
            computed.runIds,
            computed.uses,
            computed.ruleId,
            dto.note?.trim() || null,
          ],
        )) as Array<{ id: string }>;
        await this.audit.record(manager, {
          campaignId,
          actorId: user.id,
          entityType: 'analysis',
          entityId: row.id,
          action: 'create',
          after: { name: dto.name, kind: dto.kind, input: computed.input, result: resultSummary(dto.kind, computed.result) },
        });
        return this.reload(manager, row.id, user);
      }),
    );
  }

  async update(user: AuthUser, id: string, dto: UpdateAnalysisDto): Promise<Analysis> {
    return this.withNameGuard(dto.name ?? '', () =>
      this.dataSource.transaction(async (manager) => {
        const { row } = await this.setup.row<AnalysisRow>(user, manager, id, `${ROW_SELECT} WHERE a.id = $1`, ANALYSIS_NOT_FOUND, 'write');
        if (dto.baseVersion !== row.version) {
          const [current] = await this.describe(manager, row.campaign_id, [row], user);
          checkBaseVersion('analysis', row, dto.baseVersion, current);
        }
        const name = dto.name ?? row.name;
        if (name.toLowerCase() !== row.name.toLowerCase()) await this.refuseDuplicateName(manager, row.campaign_id, name, row.id);
        const note = dto.note === undefined ? row.note : dto.note?.trim() || null;
        const before: Record<string, unknown> = {};
        const after: Record<string, unknown> = {};
        if (name !== row.name) {
          before.name = row.name;
          after.name = name;
        }
        if (note !== row.note) {
          before.note = row.note;
          after.note = note;
        }
        if (dto.input !== undefined) {
          const ctx = await loadContext(manager, row.campaign_id);
          const state = await currentState(manager, ctx);
          const computed = await this.compute(manager, ctx, state, row.kind, dto.input, row.id);
          if (JSON.stringify(computed.input) !== JSON.stringify(row.input)) {
            before.input = row.input;
            after.input = computed.input;
          }
          before.result = resultSummary(row.kind, row.result);
          after.result = resultSummary(row.kind, computed.result);
          await manager.query(
            `UPDATE analyses SET input = $2, result = $3, status = 'current', error = NULL, inputs_digest = $4, computed_at = now(),
                    computed_by = $5, run_ids = $6, uses = $7, rule_id = $8
              WHERE id = $1`,
            [row.id, JSON.stringify(computed.input), JSON.stringify(computed.result), JSON.stringify(computed.digest), user.id, computed.runIds, computed.uses, computed.ruleId],
          );
        }
        if (Object.keys(after).length === 0) return this.reload(manager, row.id, user);
        await manager.query('UPDATE analyses SET name = $2, note = $3, version = version + 1, updated_at = now() WHERE id = $1', [row.id, name, note]);
        await this.audit.record(manager, {
          campaignId: row.campaign_id,
          actorId: user.id,
          entityType: 'analysis',
          entityId: row.id,
          action: 'update',
          before,
          after,
          reason: dto.reason,
        });
        return this.reload(manager, row.id, user);
      }),
    );
  }

  async remove(user: AuthUser, id: string): Promise<void> {
    await this.dataSource.transaction(async (manager) => {
      const { row } = await this.setup.row<AnalysisRow>(user, manager, id, `${ROW_SELECT} WHERE a.id = $1`, ANALYSIS_NOT_FOUND, 'write');
      const [user1] = (await manager.query('SELECT name FROM analyses WHERE $1::uuid = ANY (uses) ORDER BY created_at LIMIT 1', [row.id])) as Array<{
        name: string;
      }>;
      if (user1) throw new ConflictException(`Balance “${user1.name}” takes a stream from this analysis; change or delete that balance first`);
      await manager.query('DELETE FROM analyses WHERE id = $1', [row.id]);
      await this.audit.record(manager, {
        campaignId: row.campaign_id,
        actorId: user.id,
        entityType: 'analysis',
        entityId: row.id,
        action: 'delete',
        before: { name: row.name, kind: row.kind, input: row.input, result: resultSummary(row.kind, row.result) },
      });
    });
  }

  /** Recompute now from the data as it is (engineer). A refusal is stored as status 'failed'. */
  async recompute(user: AuthUser, id: string): Promise<Analysis> {
    return this.dataSource.transaction(async (manager) => {
      const { row } = await this.setup.row<AnalysisRow>(user, manager, id, `${ROW_SELECT} WHERE a.id = $1`, ANALYSIS_NOT_FOUND, 'write');
      await this.recomputeRow(manager, row, user.id, 'Recomputed on request');
      return this.reload(manager, row.id, user);
    });
  }

  /**
   * The scheduled job: every stale analysis of every open campaign is recomputed, stable values
   * first so the balances that use them see their new results in the same pass. Returns how many
   * were recomputed (failures included).
   */
  async recomputeStale(): Promise<number> {
    const campaigns = (await this.dataSource.query(
      `SELECT DISTINCT a.campaign_id FROM analyses a JOIN campaigns c ON c.id = a.campaign_id WHERE c.status <> 'archived'`,
    )) as Array<{ campaign_id: string }>;
    let count = 0;
    for (const { campaign_id: campaignId } of campaigns) {
      for (const kind of ['stable-value', 'balance'] as const) {
        const rows = (await this.dataSource.query(`${ROW_SELECT} WHERE a.campaign_id = $1 ORDER BY a.created_at, a.id`, [campaignId])) as AnalysisRow[];
        const reasons = await this.staleReasons(this.dataSource.manager, campaignId, rows);
        for (const row of rows) {
          const reason = reasons.get(row.id);
          if (row.kind !== kind || !reason) continue;
          try {
            await this.dataSource.transaction(async (manager) => {
              // The campaign lock every writer takes: no edit of this analysis runs in between.
              await manager.query('SELECT id FROM campaigns WHERE id = $1 FOR UPDATE', [campaignId]);
              const [fresh] = (await manager.query(`${ROW_SELECT} WHERE a.id = $1`, [row.id])) as AnalysisRow[];
              if (!fresh) return;
              await this.recomputeRow(manager, fresh, null, `Recomputed automatically: ${reason}`);
            });
            count += 1;
          } catch (error) {
            this.logger.error(`recompute of analysis ${row.id}: ${error instanceof Error ? error.message : String(error)}`);
          }
        }
      }
    }
    return count;
  }

  // ── Computation ────────────────────────────────────────────────────────────────────────────

  private async recomputeRow(manager: EntityManager, row: AnalysisRow, actorId: string | null, reason: string): Promise<void> {
    const ctx = await loadContext(manager, row.campaign_id);
    const state = await currentState(manager, ctx);
    let computed: Computed | null = null;
    let failure: string | null = null;
    try {
      computed = await this.compute(manager, ctx, state, row.kind, row.input, row.id);
    } catch (error) {
      failure = refusal(error);
      if (failure === null) throw error;
    }
    if (computed) {
      await manager.query(
        `UPDATE analyses SET result = $2, status = 'current', error = NULL, inputs_digest = $3, computed_at = now(), computed_by = $4,
                run_ids = $5, uses = $6, rule_id = $7, updated_at = now()
          WHERE id = $1`,
        [row.id, JSON.stringify(computed.result), JSON.stringify(computed.digest), actorId, computed.runIds, computed.uses, computed.ruleId],
      );
    } else {
      // The old result stays (marked failed); the digest moves on so the job does not retry the
      // same refusal every minute: the next change of its inputs makes it stale again.
      await manager.query(`UPDATE analyses SET status = 'failed', error = $2, inputs_digest = $3, updated_at = now() WHERE id = $1`, [
        row.id,
        failure,
        JSON.stringify(digestOf(Object.keys(row.inputs_digest), state)),
      ]);
    }
    await this.audit.record(manager, {
      campaignId: row.campaign_id,
      actorId,
      entityType: 'analysis',
      entityId: row.id,
      action: 'update',
      before: { status: row.status, computedAt: row.computed_at ? iso(row.computed_at) : null, result: resultSummary(row.kind, row.result) },
      after: computed ? { status: 'current', result: resultSummary(row.kind, computed.result) } : { status: 'failed', error: failure },
      reason,
    });
  }

  private async compute(
    manager: EntityManager,
    ctx: CampaignContext,
    state: CurrentState,
    kind: AnalysisKind,
    input: unknown,
    selfId: string | null,
  ): Promise<Computed> {
    return kind === 'stable-value' ? this.computeStableValue(manager, ctx, state, input) : this.computeBalance(manager, ctx, state, input, selfId);
  }

  private async computeStableValue(manager: EntityManager, ctx: CampaignContext, state: CurrentState, raw: unknown): Promise<Computed> {
    const problems = stableValueInputProblems(raw);
    if (problems.length > 0) throw new BadRequestException(problems);
    const input = cleanStableValueInput(raw as StableValueInput);
    const [run] = (await manager.query('SELECT id FROM runs WHERE id = $1 AND campaign_id = $2', [input.runId, ctx.campaignId])) as unknown[];
    if (!run) throw new BadRequestException('input.runId must be a run of this campaign');
    const channel = ctx.channels.get(input.channelId);
    const derived = ctx.derived.get(input.channelId);
    if (!channel && !derived) throw new BadRequestException('input.channelId must be a channel or derived channel of this campaign');
    const rule = input.ruleId ? ctx.rules.get(input.ruleId) : null;
    if (input.ruleId && !rule) throw new BadRequestException('input.ruleId must be a stability rule of this campaign');
    if (rule?.channel_id && rule.channel_id !== input.channelId) {
      const owner = ctx.channels.get(rule.channel_id);
      throw new BadRequestException(`stability rule “${rule.name}” is for channel ${owner?.symbol ?? rule.channel_id}, not this one`);
    }
    const series = await this.series.build(manager, ctx, input.runId, input.channelId);
    const options = {
      confidence: input.confidence,
      allowExtrapolation: input.allowExtrapolation,
      coverageFactor: input.coverageFactor,
      includeResolution: input.includeResolution,
    };
    let stable;
    if (channel) {
      const spec: ChannelSpec = {
        id: channel.id,
        name: channel.name,
        rawUnit: channel.raw_unit,
        resolution: channel.resolution,
        fullScale: channel.full_scale,
        accuracy: channel.accuracy,
      };
      const points: TrendPoint[] = series.t.map((t, i) => ({ t, y: series.raw[i], unchecked: series.unchecked[i] }));
      const chain = asBadRequest(() => compileChain(ctx.calibrations.get(channel.id)?.chain ?? null, channel.raw_unit));
      stable = asBadRequest(() => stableValue(points, input.window, input.tStar, spec, chain, options));
    } else {
      stable = await this.derivedStableValue(manager, ctx, derived!, series, input, options);
    }
    let stability = null;
    if (rule) {
      const engineering: TrendPoint[] = series.t.map((t, i) => ({ t, y: series.value[i], unchecked: series.unchecked[i] }));
      const ruleShape = {
        name: rule.name,
        windowSeconds: rule.window_seconds,
        slopeLimitPerMinute: rule.slope_limit_per_minute,
        bandLimit: rule.band_limit,
        driftLimit: rule.drift_limit,
      };
      // The rule's window ends at the chosen time t* (where the value is taken) and reaches back.
      stability = asBadRequest(() => evaluateStability(ruleShape, engineering, { end: input.tStar, unit: series.unit }));
    }
    const keys = channelKeys(ctx, input.channelId);
    keys.add(`run:${input.runId}`);
    if (rule) keys.add(`rule:${rule.id}`);
    return {
      input,
      result: { stable, stability },
      digest: digestOf(keys, state),
      runIds: [input.runId],
      uses: [],
      ruleId: rule?.id ?? null,
    };
  }

  /**
   * A derived value has no display of its own. Its budget is the fit of the derived series (the
   * scatter of its inputs is in that series already) plus its inputs' instrument uncertainties at
   * t* (spec, resolution, calibration steps: each input channel's budget without its fit line),
   * propagated through the expression with sensitivity coefficients (GUM 5.1.2, inputs taken as
   * independent). An input that is itself derived adds its fit only, and the budget says so.
   */
  private async derivedStableValue(
    manager: EntityManager,
    ctx: CampaignContext,
    derived: DerivedChannelRow,
    series: ChannelSeries,
    input: StableValueInput,
    options: StableValueOptions,
  ): Promise<StableValue> {
    const spec: ChannelSpec = { id: derived.id, name: derived.name, rawUnit: series.unit, resolution: 0 };
    const points: TrendPoint[] = series.t.map((t, i) => ({ t, y: series.value[i], unchecked: series.unchecked[i] }));
    const base = asBadRequest(() => stableValue(points, input.window, input.tStar, spec, null, { ...options, includeResolution: false }));
    const inputs: Record<string, DerivedInput> = {};
    const warnings = [...base.warnings];
    for (const symbol of derived.inputs) {
      const channel = [...ctx.channels.values()].find((c) => c.symbol === symbol);
      if (!channel) {
        warnings.push(`${symbol} is itself a derived channel: its instruments are not carried into this budget`);
        continue;
      }
      const inputSeries = await this.series.build(manager, ctx, input.runId, channel.id);
      const inputPoints: TrendPoint[] = inputSeries.t.map((t, i) => ({ t, y: inputSeries.raw[i], unchecked: inputSeries.unchecked[i] }));
      const chain = asBadRequest(() => compileChain(ctx.calibrations.get(channel.id)?.chain ?? null, channel.raw_unit));
      const inputSpec: ChannelSpec = {
        id: channel.id,
        name: channel.name,
        rawUnit: channel.raw_unit,
        resolution: channel.resolution,
        fullScale: channel.full_scale,
        accuracy: channel.accuracy,
      };
      const at = asBadRequest(() =>
        stableValue(inputPoints, input.window, input.tStar, inputSpec, chain, { ...options, includeResiduals: false, coverageFactor: undefined }),
      );
      const instrument = at.budget.components.filter((c) => c.name !== FIT_COMPONENT_NAME);
      const u = Math.sqrt(instrument.reduce((sum, c) => sum + c.contribution * c.contribution, 0));
      inputs[symbol] = { value: at.value, standardUncertainty: u, unit: at.unit };
    }
    const compiled = asBadRequest(() => compileExpression(derived.expression, Object.keys(inputs), derived.constants));
    const propagated = asBadRequest(() => derivedUncertainty(compiled, inputs, { unit: series.unit }));
    const fitLine = base.budget.components.find((c) => c.name === FIT_COMPONENT_NAME);
    const lines: ComponentInput[] = [
      ...(fitLine ? [{ ...fitLine, note: fitLine.note ?? undefined }] : []),
      ...propagated.components.map((c) => ({
        name: `${c.name} instruments`,
        sourceId: `${ctx.symbols.get(c.name) ?? c.name}/instruments`,
        value: c.value,
        unit: c.unit,
        distribution: c.distribution,
        divisor: c.divisor,
        sensitivity: c.sensitivity,
        note: `${c.name} = ${formatNumber(inputs[c.name].value)} ${inputs[c.name].unit ?? ''} at t*: spec, resolution and calibration, u = ${formatNumber(c.standardUncertainty)}; c = ∂f/∂${c.name}`,
      })),
    ];
    const budget = asBadRequest(() => combineBudget(base.value, series.unit, lines, { coverageFactor: options.coverageFactor }));
    return { ...base, budget, expandedUncertainty: budget.expandedUncertainty, warnings };
  }

  private async computeBalance(manager: EntityManager, ctx: CampaignContext, state: CurrentState, raw: unknown, selfId: string | null): Promise<Computed> {
    const problems = balanceInputProblems(raw);
    if (problems.length > 0) throw new BadRequestException(problems);
    const input = cleanBalanceInput(raw as BalanceInput);
    const ids = [
      ...new Set(input.streams.flatMap((s) => [s.massFlowAnalysisId, s.temperatureAnalysisId, s.minusTemperatureAnalysisId].filter((v): v is string => !!v))),
    ];
    if (selfId && ids.includes(selfId)) throw new BadRequestException('a balance cannot take a stream from itself');
    const sources = (await manager.query('SELECT id, name, kind, result, run_ids FROM analyses WHERE campaign_id = $1 AND id = ANY($2::uuid[])', [
      ctx.campaignId,
      ids,
    ])) as Array<Pick<AnalysisRow, 'id' | 'name' | 'kind' | 'result' | 'run_ids'>>;
    const byId = new Map(sources.map((s) => [s.id, s]));
    const measured = (id: string, what: string): MeasuredValue => {
      const source = byId.get(id);
      if (!source) throw new BadRequestException(`${what}: ${id} is not an analysis of this campaign`);
      if (source.kind !== 'stable-value') throw new BadRequestException(`${what}: analysis “${source.name}” is a balance; a stream takes a stable value`);
      const result = source.result as StableValueOutput | null;
      if (!result) throw new BadRequestException(`${what}: analysis “${source.name}” has no result yet`);
      return measuredFromBudget(result.stable.budget);
    };
    const mass: MassStream[] = input.streams.map((s, i) => ({
      id: s.id,
      label: s.label,
      side: s.side,
      massFlow: measured(s.massFlowAnalysisId, `input.streams.${i}.massFlowAnalysisId`),
    }));
    const coverage = { coverageFactor: input.coverageFactor };
    const massResult = asBadRequest(() => massBalance(mass, coverage));
    let energy = null;
    if (input.energy) {
      const streams: EnergyStream[] = input.streams.map((s, i) => ({
        id: s.id,
        label: s.label,
        side: s.side,
        massFlow: mass[i].massFlow,
        temperature: measured(s.temperatureAnalysisId as string, `input.streams.${i}.temperatureAnalysisId`),
        minusTemperature: s.minusTemperatureAnalysisId ? measured(s.minusTemperatureAnalysisId, `input.streams.${i}.minusTemperatureAnalysisId`) : null,
      }));
      energy = asBadRequest(() => energyBalance(streams, input.enthalpyModel ?? { kind: 'constant-cp' }, coverage));
    }
    const runIds = [...new Set(sources.flatMap((s) => s.run_ids))];
    return {
      input,
      result: { mass: massResult, energy },
      digest: digestOf(
        ids.map((id) => `analysis:${id}`),
        state,
      ),
      runIds,
      uses: ids,
      ruleId: null,
    };
  }

  // ── Status ─────────────────────────────────────────────────────────────────────────────────

  /** Why each analysis of the campaign is stale (absent when current); a balance also when a source is. */
  private async staleReasons(manager: EntityManager, campaignId: string, rows: readonly AnalysisRow[]): Promise<Map<string, string>> {
    const ctx = await loadContext(manager, campaignId);
    const state = await currentState(manager, ctx);
    const all = (await manager.query('SELECT id, name, kind, inputs_digest, uses FROM analyses WHERE campaign_id = $1', [campaignId])) as Array<
      Pick<AnalysisRow, 'id' | 'name' | 'kind' | 'inputs_digest' | 'uses'>
    >;
    const own = new Map(all.map((a) => [a.id, changesSince(a.inputs_digest, state)]));
    const byId = new Map(all.map((a) => [a.id, a]));
    const reasons = new Map<string, string>();
    for (const a of [...all, ...rows.filter((r) => !byId.has(r.id))]) {
      const changes = [...(own.get(a.id) ?? changesSince(a.inputs_digest, state))];
      for (const used of a.uses ?? []) {
        const source = byId.get(used);
        if (source && (own.get(used)?.length ?? 0) > 0) changes.push(`analysis “${source.name}” it uses is stale`);
      }
      if (changes.length > 0) reasons.set(a.id, [...new Set(changes)].join('; '));
    }
    return reasons;
  }

  private async describe(manager: EntityManager, campaignId: string, rows: readonly AnalysisRow[], user: AuthUser | null): Promise<Analysis[]> {
    const reasons = await this.staleReasons(manager, campaignId, rows);
    const runIds = [...new Set(rows.flatMap((r) => r.run_ids))];
    const blind = user ? await blindSheetsOf(manager, user.id, runIds) : [];
    const blindRuns = new Map(blind.map((b) => [b.run_id, b.name]));
    return rows.map((row): Analysis => {
      const staleReason = reasons.get(row.id) ?? null;
      const hiddenBy = row.run_ids.map((id) => blindRuns.get(id)).find((name) => name !== undefined);
      const base = {
        id: row.id,
        campaignId: row.campaign_id,
        name: row.name,
        note: row.note,
        runIds: row.run_ids,
        status: staleReason ? ('stale' as const) : row.status,
        staleReason,
        error: hiddenBy !== undefined ? `The result is hidden from you until you finish pass 2 of sheet “${hiddenBy}”` : row.error,
        computedAt: row.computed_at ? iso(row.computed_at) : null,
        computedBy: row.computed_by ? { id: row.computed_by, displayName: row.computed_by_name ?? 'Former member' } : null,
        version: row.version,
        createdAt: iso(row.created_at),
        updatedAt: iso(row.updated_at),
      };
      // The blind rule: a stable value's residuals and fit are pass-1 values in disguise.
      const result = hiddenBy !== undefined ? null : row.result;
      return row.kind === 'stable-value'
        ? { ...base, kind: 'stable-value', input: row.input as StableValueInput, result: result as StableValueOutput | null }
        : { ...base, kind: 'balance', input: row.input as BalanceInput, result: result as BalanceOutput | null };
    });
  }

  private async reload(manager: EntityManager, id: string, user: AuthUser | null): Promise<Analysis> {
    const [row] = (await manager.query(`${ROW_SELECT} WHERE a.id = $1`, [id])) as AnalysisRow[];
    if (!row) throw new NotFoundException(ANALYSIS_NOT_FOUND);
    const [analysis] = await this.describe(manager, row.campaign_id, [row], user);
    return analysis;
  }

  private async refuseDuplicateName(manager: EntityManager, campaignId: string, name: string, selfId: string | null): Promise<void> {
    const [clash] = (await manager.query('SELECT id FROM analyses WHERE campaign_id = $1 AND lower(name) = lower($2) AND ($3::uuid IS NULL OR id <> $3)', [
      campaignId,
      name,
      selfId,
    ])) as unknown[];
    if (clash) throw new ConflictException(duplicateName(name));
  }

  private async withNameGuard<T>(name: string, work: () => Promise<T>): Promise<T> {
    try {
      return await work();
    } catch (error) {
      if (isUniqueViolation(error)) throw new ConflictException(duplicateName(name));
      throw error;
    }
  }
}
