import type { CampaignDashboard, Release } from '@dialsheet/common';
import { Body, Controller, Get, HttpCode, Param, Post } from '@nestjs/common';
import { ApiBearerAuth, ApiOperation, ApiTags } from '@nestjs/swagger';
import type { AuthUser } from '../../core/auth-user';
import { CurrentUser } from '../../core/decorators/current-user.decorator';
import { DashboardService } from './dashboard.service';
import { CreateReleaseDto, DeclineReleaseDto, OpenCorrectionDto, SignReleaseDto } from './dto/release.dto';
import { ReleasesService } from './releases.service';

@ApiTags('releases')
@ApiBearerAuth()
@Controller()
export class ReleasesController {
  constructor(
    private readonly releases: ReleasesService,
    private readonly dashboards: DashboardService,
  ) {}

  @Post('campaigns/:campaignId/releases')
  @ApiOperation({ summary: 'Request a release of chosen runs (Engineer, Lead); a Lead may sign it at once with sign: true' })
  create(@CurrentUser() user: AuthUser, @Param('campaignId') campaignId: string, @Body() dto: CreateReleaseDto): Promise<Release> {
    return this.releases.create(user, campaignId, dto);
  }

  @Get('campaigns/:campaignId/releases')
  @ApiOperation({ summary: 'Releases of the campaign, requests first, then the newest number first (any member)' })
  list(@CurrentUser() user: AuthUser, @Param('campaignId') campaignId: string): Promise<Release[]> {
    return this.releases.list(user, campaignId);
  }

  @Get('campaigns/:campaignId/dashboard')
  @ApiOperation({ summary: 'Progress, open mismatches, mismatch rates, analyses and releases of the campaign (Lead, Engineer)' })
  dashboard(@CurrentUser() user: AuthUser, @Param('campaignId') campaignId: string): Promise<CampaignDashboard> {
    return this.dashboards.dashboard(user, campaignId);
  }

  @Get('releases/:releaseId')
  @ApiOperation({ summary: 'One release (any member of its campaign)' })
  get(@CurrentUser() user: AuthUser, @Param('releaseId') releaseId: string): Promise<Release> {
    return this.releases.get(user, releaseId);
  }

  @Post('releases/:releaseId/sign')
  @HttpCode(200)
  @ApiOperation({ summary: 'Sign a requested release (Lead): freezes, hashes, numbers it and locks its runs' })
  sign(@CurrentUser() user: AuthUser, @Param('releaseId') releaseId: string, @Body() dto: SignReleaseDto): Promise<Release> {
    return this.releases.sign(user, releaseId, dto);
  }

  @Post('releases/:releaseId/decline')
  @HttpCode(200)
  @ApiOperation({ summary: 'Decline a requested release with a reason (Lead)' })
  decline(@CurrentUser() user: AuthUser, @Param('releaseId') releaseId: string, @Body() dto: DeclineReleaseDto): Promise<Release> {
    return this.releases.decline(user, releaseId, dto);
  }

  @Post('runs/:runId/correction')
  @HttpCode(200)
  @ApiOperation({ summary: 'Lift the release lock of a run so its data can be corrected (Lead; reason goes to the audit trail)' })
  openCorrection(@CurrentUser() user: AuthUser, @Param('runId') runId: string, @Body() dto: OpenCorrectionDto): Promise<{ runId: string; releaseNumber: number }> {
    return this.releases.openCorrection(user, runId, dto);
  }
}
