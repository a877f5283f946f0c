import type { Analysis } from '@dialsheet/common';
import { Controller, Get, Param, Query, Res } from '@nestjs/common';
import { ApiBearerAuth, ApiOperation, ApiProduces, ApiQuery, ApiTags } from '@nestjs/swagger';
import type { Response } from 'express';
import type { AuthUser } from '../../core/auth-user';
import { CurrentUser } from '../../core/decorators/current-user.decorator';
import { ExportsService } from './exports.service';

const FORMAT_QUERY = { name: 'format', enum: ['csv-long', 'csv-wide', 'xlsx', 'json'], required: true } as const;

@ApiTags('exports')
@ApiBearerAuth()
@Controller()
export class ExportsController {
  constructor(private readonly exports: ExportsService) {}

  @Get('releases/:releaseId/export')
  @ApiOperation({ summary: 'Download a published release (any member): CSV long or wide, XLSX or JSON, with provenance' })
  @ApiQuery(FORMAT_QUERY)
  @ApiProduces('text/csv', 'application/json', 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet')
  exportRelease(
    @CurrentUser() user: AuthUser,
    @Param('releaseId') releaseId: string,
    @Query('format') format: string | undefined,
    @Res() res: Response,
  ): Promise<void> {
    return this.exports.exportRelease(user, releaseId, format, res);
  }

  @Get('releases/:releaseId/analyses')
  @ApiOperation({ summary: 'Stable values and balance checks as the published release froze them (any member)' })
  releaseAnalyses(@CurrentUser() user: AuthUser, @Param('releaseId') releaseId: string): Promise<Analysis[]> {
    return this.exports.releaseAnalyses(user, releaseId);
  }

  @Get('campaigns/:campaignId/export')
  @ApiOperation({ summary: 'Download live data marked DRAFT (Lead, Engineer); runIds=a,b limits it to those runs' })
  @ApiQuery(FORMAT_QUERY)
  @ApiQuery({ name: 'runIds', required: false, description: 'Run ids separated by commas; all runs when left out' })
  exportDraft(
    @CurrentUser() user: AuthUser,
    @Param('campaignId') campaignId: string,
    @Query('format') format: string | undefined,
    @Query('runIds') runIds: string | undefined,
    @Res() res: Response,
  ): Promise<void> {
    return this.exports.exportDraft(user, campaignId, format, runIds, res);
  }
}
