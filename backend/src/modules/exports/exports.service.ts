import { EXPORT_FORMATS, type Analysis, type ExportFormat, type ExportProvenance } from '@dialsheet/common';
import { BadRequestException, ConflictException, Injectable, InternalServerErrorException, Logger } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { isUUID } from 'class-validator';
import type { Response } from 'express';
import { createHash } from 'node:crypto';
import { createInterface } from 'node:readline';
import { DataSource } from 'typeorm';
import type { AuthUser } from '../../core/auth-user';
import { StorageService } from '../../storage/storage.service';
import { CampaignAccessService } from '../campaigns/campaign-access.service';
import { ReleasesService } from '../releases/releases.service';
import type { ReleaseRow } from '../releases/release.mapper';
import { openDataset, writeCsvLong, writeCsvWide, writeJson, writeXlsx, type DatasetContext, type OpenDataset } from './export-writers';
import { parseSnapshot, readSnapshot, type SnapshotAnalysis, type SnapshotItem } from './snapshot';
import { SOFTWARE_VERSION } from './software-version';

const CONTENT_TYPES: Record<ExportFormat, string> = {
  'csv-long': 'text/csv; charset=utf-8',
  'csv-wide': 'text/csv; charset=utf-8',
  xlsx: 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet',
  json: 'application/json; charset=utf-8',
};

const EXTENSIONS: Record<ExportFormat, string> = { 'csv-long': 'long.csv', 'csv-wide': 'wide.csv', xlsx: 'xlsx', json: 'json' };

export function parseFormat(value: string | undefined): ExportFormat {
  if (!value) throw new BadRequestException([`format is required: one of ${EXPORT_FORMATS.join(', ')}`]);
  if (!(EXPORT_FORMATS as readonly string[]).includes(value)) {
    throw new BadRequestException([`format must be one of ${EXPORT_FORMATS.join(', ')}, got "${value.slice(0, 40)}"`]);
  }
  return value as ExportFormat;
}

/** Lower-case letters, digits and hyphens only: safe in any file system and in a header. */
export function fileSlug(text: string): string {
  const slug = text
    .normalize('NFKD')
    // The accents split off by NFKD, so "Ä" becomes "a" rather than a hyphen.
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 60)
    .replace(/-+$/, '');
  return slug || 'campaign';
}

export function exportFileName(campaignName: string, format: ExportFormat, release: { number: number } | null, at: Date): string {
  const stamp = at.toISOString().slice(0, 16).replace(/[-:]/g, '').replace('T', '-');
  const what = release ? `release-${release.number}` : `DRAFT-${stamp}`;
  return `dialsheet-${fileSlug(campaignName)}-${what}.${EXTENSIONS[format]}`;
}

function provenanceOf(ctx: DatasetContext, user: AuthUser, release: ReleaseRow | null, at: Date): ExportProvenance {
  return {
    kind: release ? 'release' : 'draft',
    campaign: { id: ctx.header.campaign.id, name: ctx.header.campaign.name },
    release:
      release && release.number !== null && release.content_hash && release.signed_at
        ? {
            id: release.id,
            number: release.number,
            contentHash: release.content_hash,
            signedBy: release.signed_by_name ?? '',
            signedAt: new Date(release.signed_at).toISOString(),
          }
        : null,
    runs: ctx.runs.map((r) => ({
      id: r.id,
      name: r.name,
      recording: r.recording ? { fileName: r.recording.fileName, sha256: r.recording.sha256 } : null,
      sync: r.syncSummary,
    })),
    software: { name: 'Dialsheet', version: SOFTWARE_VERSION },
    exportedAt: at.toISOString(),
    exportedBy: user.name,
  };
}

/** An analysis record of a snapshot in the wire shape; as frozen, it is never stale. */
function frozenAnalysis(a: SnapshotAnalysis, campaignId: string, signedAt: string): Analysis {
  return {
    id: a.id,
    campaignId,
    name: a.name,
    note: a.note,
    runIds: a.runIds,
    status: a.status === 'failed' ? 'failed' : 'current',
    staleReason: null,
    error: a.error,
    computedAt: a.computedAt,
    computedBy: null,
    version: 0,
    createdAt: a.computedAt ?? signedAt,
    updatedAt: signedAt,
    kind: a.kind,
    input: a.input,
    result: a.result,
  } as Analysis;
}

/**
 * Exports of a published release (from its frozen snapshot, any member) and drafts of live data
 * (Leads and Engineers only: a draft holds pass-1 entries that a checker must not see before
 * finishing pass 2). Every file says what it is: a draft is marked DRAFT in its name and inside.
 */
@Injectable()
export class ExportsService {
  private readonly logger = new Logger(ExportsService.name);

  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly access: CampaignAccessService,
    private readonly releases: ReleasesService,
    private readonly storage: StorageService,
  ) {}

  async exportRelease(user: AuthUser, releaseId: string, formatText: string | undefined, res: Response): Promise<void> {
    const format = parseFormat(formatText);
    const { row } = await this.releases.requireRelease(user, releaseId);
    if (row.status !== 'published' || !row.snapshot_key || !row.content_hash) {
      throw new ConflictException('Only a published release can be exported; export a draft of the campaign’s live data instead');
    }
    const expected = row.content_hash;
    const input = await this.storage.openRead(row.snapshot_key);
    const logger = this.logger;
    // The stored lines are hashed again as they are read: bytes that no longer match the signed
    // hash end the download with an error rather than pass for the release (a 500 when the whole
    // snapshot fits in the first batch, a cut connection once the file has started).
    async function* lines(): AsyncGenerator<string> {
      const hash = createHash('sha256');
      const reader = createInterface({ input, crlfDelay: Infinity });
      try {
        for await (const line of reader) {
          hash.update(`${line}\n`);
          yield line;
        }
      } finally {
        reader.close();
        input.destroy();
      }
      const actual = hash.digest('hex');
      if (actual !== expected) {
        logger.error(`Snapshot of release ${row.id} hashes to ${actual}, signed as ${expected}`);
        throw new InternalServerErrorException(`The stored snapshot of release ${row.number} does not match its signed hash, so it is not exported`);
      }
    }
    const data = await openDataset(parseSnapshot(lines()));
    res.setHeader('X-Dialsheet-Content-Hash', expected);
    await this.send(res, format, data, provenanceOf(data.context, user, row, new Date()), { number: row.number as number });
  }

  /**
   * The stable values and balances as the release froze them (its report shows these, not the
   * campaign's live analyses). The whole snapshot is read so its hash is checked; only the
   * analysis records are kept.
   */
  async releaseAnalyses(user: AuthUser, releaseId: string): Promise<Analysis[]> {
    const { row } = await this.releases.requireRelease(user, releaseId);
    if (row.status !== 'published' || !row.snapshot_key || !row.content_hash) {
      throw new ConflictException('Only a published release has frozen analyses; see the campaign’s analyses for live ones');
    }
    const input = await this.storage.openRead(row.snapshot_key);
    const hash = createHash('sha256');
    const found: SnapshotAnalysis[] = [];
    const reader = createInterface({ input, crlfDelay: Infinity });
    try {
      for await (const line of reader) {
        hash.update(`${line}\n`);
        // Analysis records come before the cells; a cheap test skips parsing each cell line.
        if (line.startsWith('{"type":"analysis"')) found.push(JSON.parse(line) as SnapshotAnalysis);
      }
    } finally {
      reader.close();
      input.destroy();
    }
    if (hash.digest('hex') !== row.content_hash) {
      this.logger.error(`Snapshot of release ${row.id} no longer matches its signed hash`);
      throw new InternalServerErrorException(`The stored snapshot of release ${row.number} does not match its signed hash`);
    }
    const signedAt = row.signed_at ? new Date(row.signed_at).toISOString() : new Date(0).toISOString();
    return found.map((a) => frozenAnalysis(a, row.campaign_id, signedAt));
  }

  async exportDraft(user: AuthUser, campaignId: string, formatText: string | undefined, runIdsText: string | undefined, res: Response): Promise<void> {
    const format = parseFormat(formatText);
    await this.access.require(user, campaignId, ['lead', 'engineer']);
    const runIds = await this.draftRuns(campaignId, runIdsText);
    const data = await openDataset(this.draftRecords(campaignId, runIds));
    await this.send(res, format, data, provenanceOf(data.context, user, null, new Date()), null);
  }

  private async draftRuns(campaignId: string, text: string | undefined): Promise<string[]> {
    const all = (await this.dataSource.query('SELECT id FROM runs WHERE campaign_id = $1', [campaignId])) as Array<{ id: string }>;
    if (text === undefined || text.trim() === '') {
      if (all.length === 0) throw new BadRequestException(['The campaign has no runs to export yet']);
      return all.map((r) => r.id);
    }
    const asked = [...new Set(text.split(',').map((s) => s.trim()).filter(Boolean))];
    const bad = asked.filter((id) => !isUUID(id));
    if (bad.length > 0) throw new BadRequestException([`runIds must be run ids separated by commas; not a run id: ${bad.slice(0, 5).join(', ')}`]);
    const known = new Set(all.map((r) => r.id));
    const unknown = asked.filter((id) => !known.has(id));
    if (unknown.length > 0) throw new BadRequestException([`runIds: ${unknown.join(', ')} not a run of this campaign`]);
    return asked;
  }

  /** Live records in one read-only, repeatable-read transaction: the file is one consistent state. */
  private async *draftRecords(campaignId: string, runIds: string[]): AsyncGenerator<SnapshotItem> {
    const runner = this.dataSource.createQueryRunner();
    await runner.connect();
    let open = false;
    try {
      await runner.query('BEGIN ISOLATION LEVEL REPEATABLE READ READ ONLY');
      open = true;
      yield* readSnapshot(runner, campaignId, runIds);
      await runner.query('COMMIT');
      open = false;
    } finally {
      if (open) {
        try {
          await runner.query('ROLLBACK');
        } catch (error) {
          this.logger.warn(`draft export rollback failed: ${String(error)}`);
        }
      }
      await runner.release();
    }
  }

  private async send(res: Response, format: ExportFormat, data: OpenDataset, prov: ExportProvenance, release: { number: number } | null): Promise<void> {
    const name = exportFileName(prov.campaign.name, format, release, new Date(prov.exportedAt));
    res.status(200);
    res.setHeader('Content-Type', CONTENT_TYPES[format]);
    res.setHeader('Content-Disposition', `attachment; filename="${name}"`);
    res.setHeader('Cache-Control', 'no-store');
    res.setHeader('X-Dialsheet-Export-Kind', prov.kind);
    try {
      if (format === 'csv-long') await writeCsvLong(res, prov, data);
      else if (format === 'csv-wide') await writeCsvWide(res, prov, data);
      else if (format === 'json') await writeJson(res, prov, data);
      else await writeXlsx(res, prov, data);
    } catch (error) {
      // Headers are gone: the only honest signal left is a cut connection, not a complete-looking file.
      this.logger.error(`export (${format}) failed mid-stream: ${error instanceof Error ? error.message : String(error)}`);
      res.destroy(error instanceof Error ? error : new Error(String(error)));
      await data.cells.return(undefined);
    }
  }
}
