import type { Run } from '@dialsheet/common';
import { Body, Controller, Delete, Get, HttpCode, Param, Patch, Post, Put } from '@nestjs/common';
import { ApiBearerAuth, ApiNoContentResponse, ApiOperation, ApiTags } from '@nestjs/swagger';
import type { AuthUser } from '../../core/auth-user';
import { CurrentUser } from '../../core/decorators/current-user.decorator';
import { CreateRunDto } from './dto/create-run.dto';
import { SetSyncDto } from './dto/set-sync.dto';
import { UpdateRunDto } from './dto/update-run.dto';
import { RunsService } from './runs.service';

@ApiTags('runs')
@ApiBearerAuth()
@Controller('campaigns/:campaignId/runs')
export class CampaignRunsController {
  constructor(private readonly runs: RunsService) {}

  @Get()
  @ApiOperation({ summary: 'Runs of a campaign with their recordings, oldest first (any member)' })
  list(@CurrentUser() user: AuthUser, @Param('campaignId') campaignId: string): Promise<Run[]> {
    return this.runs.list(user, campaignId);
  }

  @Post()
  @ApiOperation({ summary: 'Create a run (lead, engineer)' })
  create(@CurrentUser() user: AuthUser, @Param('campaignId') campaignId: string, @Body() dto: CreateRunDto): Promise<Run> {
    return this.runs.create(user, campaignId, dto);
  }
}

@ApiTags('runs')
@ApiBearerAuth()
@Controller('runs')
export class RunsController {
  constructor(private readonly runs: RunsService) {}

  @Get(':runId')
  @ApiOperation({ summary: 'One run with its recording (any member)' })
  get(@CurrentUser() user: AuthUser, @Param('runId') runId: string): Promise<Run> {
    return this.runs.get(user, runId);
  }

  @Patch(':runId')
  @ApiOperation({ summary: 'Change a run’s name, date, configuration, operator or notes (lead, engineer)' })
  update(@CurrentUser() user: AuthUser, @Param('runId') runId: string, @Body() dto: UpdateRunDto): Promise<Run> {
    return this.runs.update(user, runId, dto);
  }

  @Delete(':runId')
  @HttpCode(204)
  @ApiNoContentResponse({ description: 'The run, its recording and the recording’s files are gone' })
  @ApiOperation({ summary: 'Delete a run and its recording (lead, engineer)' })
  remove(@CurrentUser() user: AuthUser, @Param('runId') runId: string): Promise<void> {
    return this.runs.remove(user, runId);
  }

  @Put(':runId/sync')
  @ApiOperation({
    summary: 'Set the sync marks that turn video time into test time (lead, engineer)',
    description: 'test time = video time − offset at the first mark; a second, later mark corrects clock drift.',
  })
  setSync(@CurrentUser() user: AuthUser, @Param('runId') runId: string, @Body() dto: SetSyncDto): Promise<Run> {
    return this.runs.setSync(user, runId, dto);
  }
}
