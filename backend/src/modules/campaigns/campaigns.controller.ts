import type { Campaign } from '@dialsheet/common';
import { Body, Controller, Get, HttpCode, Param, Patch, Post, Query } from '@nestjs/common';
import { ApiBearerAuth, ApiOperation, ApiTags } from '@nestjs/swagger';
import type { AuthUser } from '../../core/auth-user';
import { CurrentUser } from '../../core/decorators/current-user.decorator';
import { CampaignsService } from './campaigns.service';
import { CreateCampaignDto } from './dto/create-campaign.dto';
import { ListCampaignsQueryDto } from './dto/list-campaigns-query.dto';
import { ReasonDto } from './dto/reason.dto';
import { UpdateCampaignDto } from './dto/update-campaign.dto';

@ApiTags('campaigns')
@ApiBearerAuth()
@Controller('campaigns')
export class CampaignsController {
  constructor(private readonly campaigns: CampaignsService) {}

  @Get()
  @ApiOperation({ summary: 'Campaigns the caller belongs to (active unless ?status=archived)' })
  list(@CurrentUser() user: AuthUser, @Query() query: ListCampaignsQueryDto): Promise<Campaign[]> {
    return this.campaigns.list(user, query.status);
  }

  @Post()
  @ApiOperation({ summary: 'Create a campaign; the creator becomes its lead' })
  create(@CurrentUser() user: AuthUser, @Body() dto: CreateCampaignDto): Promise<Campaign> {
    return this.campaigns.create(user, dto);
  }

  @Get(':campaignId')
  @ApiOperation({ summary: 'One campaign (any member)' })
  get(@CurrentUser() user: AuthUser, @Param('campaignId') campaignId: string): Promise<Campaign> {
    return this.campaigns.get(user, campaignId);
  }

  @Patch(':campaignId')
  @ApiOperation({ summary: 'Rename or describe a campaign (lead)' })
  update(
    @CurrentUser() user: AuthUser,
    @Param('campaignId') campaignId: string,
    @Body() dto: UpdateCampaignDto,
  ): Promise<Campaign> {
    return this.campaigns.update(user, campaignId, dto);
  }

  @Post(':campaignId/archive')
  @HttpCode(200)
  @ApiOperation({ summary: 'Archive a campaign: it becomes read-only (lead)' })
  archive(
    @CurrentUser() user: AuthUser,
    @Param('campaignId') campaignId: string,
    @Body() dto: ReasonDto,
  ): Promise<Campaign> {
    return this.campaigns.archive(user, campaignId, dto.reason);
  }

  @Post(':campaignId/restore')
  @HttpCode(200)
  @ApiOperation({ summary: 'Bring an archived campaign back (lead)' })
  restore(
    @CurrentUser() user: AuthUser,
    @Param('campaignId') campaignId: string,
    @Body() dto: ReasonDto,
  ): Promise<Campaign> {
    return this.campaigns.restore(user, campaignId, dto.reason);
  }
}
