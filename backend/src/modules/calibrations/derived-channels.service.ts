import type { DerivedChannel } from '@dialsheet/common';
import { compileExpression } from '@dialsheet/common/dist/analysis';
import { BadRequestException, ConflictException, Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource, EntityManager } from 'typeorm';
import type { AuthUser } from '../../core/auth-user';
import { AuditService } from '../audit/audit.service';
import { asBadRequest, checkBaseVersion, isPlainObject } from './analysis-input';
import { AnalysisSetupAccess } from './analysis-setup-access';
import { campaignDerivedChannels, toDerivedChannel, type DerivedChannelRow } from './calibration-records';
import { CreateDerivedChannelDto, UpdateDerivedChannelDto } from './dto/derived-channel.dto';

export const DERIVED_NOT_FOUND = 'Derived channel not found';
const DERIVED_SQL = 'SELECT * FROM derived_channels WHERE id = $1';
const CONSTANT_NAME = /^[A-Za-z_][A-Za-z0-9_]*$/;
const MAX_CONSTANTS = 50;

interface Definition {
  name: string;
  symbol: string;
  unit: string;
  expression: string;
  constants: Record<string, number>;
}

function checkConstants(constants: unknown): Record<string, number> {
  if (constants === undefined || constants === null) return {};
  if (!isPlainObject(constants)) throw new BadRequestException('constants must be an object of names and numbers');
  const entries = Object.entries(constants);
  if (entries.length > MAX_CONSTANTS) throw new BadRequestException(`constants holds ${entries.length} names; at most ${MAX_CONSTANTS}`);
  for (const [name, value] of entries) {
    if (!CONSTANT_NAME.test(name)) throw new BadRequestException(`constant name "${name}" must start with a letter or _ and hold only letters, digits and _`);
    if (typeof value !== 'number' || !Number.isFinite(value)) throw new BadRequestException(`constant ${name} must be a finite number, got ${JSON.stringify(value)}`);
  }
  return constants as Record<string, number>;
}

/** The path of derived symbols from `start` back to itself through their inputs, or null. */
export function findCycle(start: string, inputsOf: ReadonlyMap<string, readonly string[]>): string[] | null {
  const path: string[] = [start];
  const seen = new Set<string>();
  const visit = (symbol: string): boolean => {
    for (const next of inputsOf.get(symbol) ?? []) {
      if (next === start) {
        path.push(next);
        return true;
      }
      if (seen.has(next) || !inputsOf.has(next)) continue;
      seen.add(next);
      path.push(next);
      if (visit(next)) return true;
      path.pop();
    }
    return false;
  };
  return visit(start) ? path : null;
}

@Injectable()
export class DerivedChannelsService {
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly setup: AnalysisSetupAccess,
    private readonly audit: AuditService,
  ) {}

  async list(user: AuthUser, campaignId: string): Promise<DerivedChannel[]> {
    await this.setup.read(user, campaignId);
    return (await campaignDerivedChannels(this.dataSource.manager, campaignId)).map(toDerivedChannel);
  }

  async create(user: AuthUser, campaignId: string, dto: CreateDerivedChannelDto): Promise<DerivedChannel> {
    return this.dataSource.transaction(async (manager) => {
      await this.setup.writable(user, campaignId, manager);
      const definition: Definition = {
        name: dto.name,
        symbol: dto.symbol,
        unit: dto.unit,
        expression: dto.expression,
        constants: checkConstants(dto.constants),
      };
      const inputs = await this.check(manager, campaignId, definition, null);
      const [row] = (await manager.query(
        `INSERT INTO derived_channels (campaign_id, name, symbol, unit, expression, constants, inputs)
         VALUES ($1, $2, $3, $4, $5, $6, $7) RETURNING *`,
        [campaignId, definition.name, definition.symbol, definition.unit, definition.expression, JSON.stringify(definition.constants), inputs],
      )) as DerivedChannelRow[];
      await this.audit.record(manager, {
        campaignId,
        actorId: user.id,
        entityType: 'derived-channel',
        entityId: row.id,
        action: 'create',
        after: { ...definition, inputs },
      });
      return toDerivedChannel(row);
    });
  }

  async update(user: AuthUser, id: string, dto: UpdateDerivedChannelDto): Promise<DerivedChannel> {
    return this.dataSource.transaction(async (manager) => {
      const { row } = await this.setup.row<DerivedChannelRow>(user, manager, id, DERIVED_SQL, DERIVED_NOT_FOUND, 'write');
      checkBaseVersion('derived channel', row, dto.baseVersion, toDerivedChannel(row));
      const definition: Definition = {
        name: dto.name ?? row.name,
        symbol: dto.symbol ?? row.symbol,
        unit: dto.unit ?? row.unit,
        expression: dto.expression ?? row.expression,
        constants: dto.constants !== undefined ? checkConstants(dto.constants) : row.constants,
      };
      const inputs = await this.check(manager, row.campaign_id, definition, row);
      const before: Record<string, unknown> = {};
      const after: Record<string, unknown> = {};
      for (const key of ['name', 'symbol', 'unit', 'expression', 'constants'] as const) {
        if (JSON.stringify(row[key]) !== JSON.stringify(definition[key])) {
          before[key] = row[key];
          after[key] = definition[key];
        }
      }
      if (Object.keys(after).length === 0) return toDerivedChannel(row);
      // An UPDATE through manager.query answers [rows, affected].
      const [rows] = (await manager.query(
        `UPDATE derived_channels SET name = $2, symbol = $3, unit = $4, expression = $5, constants = $6, inputs = $7,
                version = version + 1, updated_at = now()
          WHERE id = $1 RETURNING *`,
        [row.id, definition.name, definition.symbol, definition.unit, definition.expression, JSON.stringify(definition.constants), inputs],
      )) as [DerivedChannelRow[], number];
      const updated = rows[0];
      await this.audit.record(manager, {
        campaignId: row.campaign_id,
        actorId: user.id,
        entityType: 'derived-channel',
        entityId: row.id,
        action: 'update',
        before,
        after,
        reason: dto.reason,
      });
      return toDerivedChannel(updated);
    });
  }

  async remove(user: AuthUser, id: string, baseVersion: number | undefined): Promise<void> {
    await this.dataSource.transaction(async (manager) => {
      const { row } = await this.setup.row<DerivedChannelRow>(user, manager, id, DERIVED_SQL, DERIVED_NOT_FOUND, 'write');
      if (baseVersion !== undefined) checkBaseVersion('derived channel', row, baseVersion, toDerivedChannel(row));
      const [user1] = (await manager.query('SELECT name FROM derived_channels WHERE campaign_id = $1 AND $2 = ANY (inputs) AND id <> $3 LIMIT 1', [
        row.campaign_id,
        row.symbol,
        row.id,
      ])) as Array<{ name: string }>;
      if (user1) throw new ConflictException(`Derived channel “${user1.name}” uses ${row.symbol}; change its expression before deleting this one`);
      const [analysis] = (await manager.query(`SELECT name FROM analyses WHERE campaign_id = $1 AND input ->> 'channelId' = $2 LIMIT 1`, [
        row.campaign_id,
        row.id,
      ])) as Array<{ name: string }>;
      if (analysis) throw new ConflictException(`Analysis “${analysis.name}” is a stable value of ${row.symbol}; delete it before deleting this derived channel`);
      await manager.query('DELETE FROM derived_channels WHERE id = $1', [row.id]);
      await this.audit.record(manager, {
        campaignId: row.campaign_id,
        actorId: user.id,
        entityType: 'derived-channel',
        entityId: row.id,
        action: 'delete',
        before: toDerivedChannel(row) as unknown as Record<string, unknown>,
      });
    });
  }

  /**
   * Name and symbol free, expression compiles against the campaign's channel and derived symbols,
   * no cycle through other derived channels. Returns the channel symbols the expression uses.
   */
  private async check(manager: EntityManager, campaignId: string, d: Definition, self: DerivedChannelRow | null): Promise<string[]> {
    const channels = (await manager.query('SELECT symbol FROM channels WHERE campaign_id = $1', [campaignId])) as Array<{ symbol: string }>;
    const others = (await campaignDerivedChannels(manager, campaignId)).filter((r) => r.id !== self?.id);
    if (others.some((r) => r.name.toLowerCase() === d.name.toLowerCase())) {
      throw new ConflictException(`A derived channel named “${d.name}” already exists in this campaign`);
    }
    if (channels.some((c) => c.symbol === d.symbol)) throw new ConflictException(`${d.symbol} is already the symbol of a channel; choose another symbol`);
    if (others.some((r) => r.symbol === d.symbol)) throw new ConflictException(`${d.symbol} is already the symbol of a derived channel; choose another symbol`);
    if (self && self.symbol !== d.symbol) {
      const user = others.find((r) => r.inputs.includes(self.symbol));
      if (user) throw new ConflictException(`Derived channel “${user.name}” uses ${self.symbol}; change its expression before renaming this symbol`);
    }
    const clash = Object.keys(d.constants).find((name) => channels.some((c) => c.symbol === name) || others.some((r) => r.symbol === name));
    if (clash) throw new BadRequestException(`constant ${clash} has the name of a channel symbol; rename the constant`);
    const symbols = [...new Set([...channels.map((c) => c.symbol), ...others.map((r) => r.symbol)])];
    const compiled = asBadRequest(() => compileExpression(d.expression, symbols, d.constants));
    const inputs = compiled.symbols.filter((s) => symbols.includes(s) && !Object.hasOwn(d.constants, s));
    if (inputs.length === 0) throw new BadRequestException(`expression "${d.expression}" uses no channel; a derived channel is computed from other channels`);
    const inputsOf = new Map<string, readonly string[]>(others.map((r) => [r.symbol, r.inputs]));
    inputsOf.set(d.symbol, inputs);
    const cycle = findCycle(d.symbol, inputsOf);
    if (cycle) throw new BadRequestException(`expression "${d.expression}" makes a cycle: ${cycle.join(' → ')}; a derived channel cannot depend on itself`);
    return inputs;
  }
}
