import type { Analysis, ChannelSeries } from '@dialsheet/common';
import { Body, Controller, Delete, Get, HttpCode, Param, Post, Put, Query } from '@nestjs/common';
import { ApiBearerAuth, ApiNoContentResponse, ApiOperation, ApiTags } from '@nestjs/swagger';
import type { AuthUser } from '../../core/auth-user';
import { CurrentUser } from '../../core/decorators/current-user.decorator';
import { AnalysesService } from './analyses.service';
import { AnalysesQueryDto, CreateAnalysisDto, UpdateAnalysisDto } from './dto/analysis.dto';
import { SeriesService } from './series.service';

@ApiTags('analyses')
@ApiBearerAuth()
@Controller('runs/:runId/series')
export class RunSeriesController {
  constructor(private readonly series: SeriesService) {}

  @Get(':channelId')
  @ApiOperation({
    summary: 'A channel’s or derived channel’s resolved values over the run’s sheets, in engineering units (lead, engineer)',
    description:
      'Agreed or resolved values; a value typed in one pass only is marked unchecked; unresolved mismatches and flags are listed as skipped. ' +
      'Lead and engineer only, and not to the checker of a sheet of this run whose pass 2 is unfinished (403): the series shows pass-1 values.',
  })
  get(@CurrentUser() user: AuthUser, @Param('runId') runId: string, @Param('channelId') channelId: string): Promise<ChannelSeries> {
    return this.series.series(user, runId, channelId);
  }
}

@ApiTags('analyses')
@ApiBearerAuth()
@Controller('campaigns/:campaignId/analyses')
export class CampaignAnalysesController {
  constructor(private readonly analyses: AnalysesService) {}

  @Get()
  @ApiOperation({ summary: 'Named analyses of the campaign, each marked current, stale (with why) or failed (any member)' })
  list(@CurrentUser() user: AuthUser, @Param('campaignId') campaignId: string, @Query() query: AnalysesQueryDto): Promise<Analysis[]> {
    return this.analyses.list(user, campaignId, query);
  }

  @Post()
  @ApiOperation({
    summary: 'Compute and store a stable value or a balance (engineer)',
    description: 'A computation the numbers refuse (fewer than 3 readings, t* outside without allowExtrapolation, units that do not match…) is a 400 and nothing is stored.',
  })
  create(@CurrentUser() user: AuthUser, @Param('campaignId') campaignId: string, @Body() dto: CreateAnalysisDto): Promise<Analysis> {
    return this.analyses.create(user, campaignId, dto);
  }
}

@ApiTags('analyses')
@ApiBearerAuth()
@Controller('analyses/:id')
export class AnalysesController {
  constructor(private readonly analyses: AnalysesService) {}

  @Get()
  @ApiOperation({ summary: 'One analysis with its result (any member)' })
  get(@CurrentUser() user: AuthUser, @Param('id') id: string): Promise<Analysis> {
    return this.analyses.get(user, id);
  }

  @Put()
  @ApiOperation({ summary: 'Rename, note, or new inputs (recomputed) (engineer); baseVersion required' })
  update(@CurrentUser() user: AuthUser, @Param('id') id: string, @Body() dto: UpdateAnalysisDto): Promise<Analysis> {
    return this.analyses.update(user, id, dto);
  }

  @Delete()
  @HttpCode(204)
  @ApiNoContentResponse({ description: 'Refused (409) while a balance takes a stream from it' })
  @ApiOperation({ summary: 'Delete an analysis (engineer)' })
  remove(@CurrentUser() user: AuthUser, @Param('id') id: string): Promise<void> {
    return this.analyses.remove(user, id);
  }

  @Post('recompute')
  @HttpCode(200)
  @ApiOperation({ summary: 'Recompute from the data as it is now (engineer); a refusal is stored as status failed, the old result kept' })
  recompute(@CurrentUser() user: AuthUser, @Param('id') id: string): Promise<Analysis> {
    return this.analyses.recompute(user, id);
  }
}
