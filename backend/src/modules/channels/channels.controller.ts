import type { Channel, DisplayRegion } from '@dialsheet/common';
import { Body, Controller, Delete, Get, HttpCode, Param, Patch, Post, Put } from '@nestjs/common';
import { ApiBearerAuth, ApiNoContentResponse, ApiOperation, ApiTags } from '@nestjs/swagger';
import type { AuthUser } from '../../core/auth-user';
import { CurrentUser } from '../../core/decorators/current-user.decorator';
import { ChannelsService } from './channels.service';
import { DisplayRegionsService } from './display-regions.service';
import { CreateChannelDto } from './dto/create-channel.dto';
import { ReorderChannelsDto } from './dto/reorder-channels.dto';
import { SetDisplayRegionsDto } from './dto/set-display-regions.dto';
import { UpdateChannelDto } from './dto/update-channel.dto';

@ApiTags('channels')
@ApiBearerAuth()
@Controller('campaigns/:campaignId/channels')
export class CampaignChannelsController {
  constructor(private readonly channels: ChannelsService) {}

  @Get()
  @ApiOperation({ summary: 'Channels of a campaign in their order (any member)' })
  list(@CurrentUser() user: AuthUser, @Param('campaignId') campaignId: string): Promise<Channel[]> {
    return this.channels.list(user, campaignId);
  }

  @Post()
  @ApiOperation({ summary: 'Add a channel at the end of the order (lead, engineer)' })
  create(@CurrentUser() user: AuthUser, @Param('campaignId') campaignId: string, @Body() dto: CreateChannelDto): Promise<Channel> {
    return this.channels.create(user, campaignId, dto);
  }

  @Put('order')
  @ApiOperation({ summary: 'Put the channels in a new order; every channel once (lead, engineer)' })
  reorder(@CurrentUser() user: AuthUser, @Param('campaignId') campaignId: string, @Body() dto: ReorderChannelsDto): Promise<Channel[]> {
    return this.channels.reorder(user, campaignId, dto);
  }
}

@ApiTags('channels')
@ApiBearerAuth()
@Controller('channels')
export class ChannelsController {
  constructor(private readonly channels: ChannelsService) {}

  @Patch(':channelId')
  @ApiOperation({ summary: 'Change a channel’s description, limits or accuracy spec (lead, engineer)' })
  update(@CurrentUser() user: AuthUser, @Param('channelId') channelId: string, @Body() dto: UpdateChannelDto): Promise<Channel> {
    return this.channels.update(user, channelId, dto);
  }

  @Delete(':channelId')
  @HttpCode(204)
  @ApiNoContentResponse({ description: 'The channel and its display regions in every run are gone; refused (409) while a sheet reads it' })
  @ApiOperation({ summary: 'Delete a channel (lead, engineer)' })
  remove(@CurrentUser() user: AuthUser, @Param('channelId') channelId: string): Promise<void> {
    return this.channels.remove(user, channelId);
  }
}

@ApiTags('channels')
@ApiBearerAuth()
@Controller('runs/:runId/display-regions')
export class RunDisplayRegionsController {
  constructor(private readonly regions: DisplayRegionsService) {}

  @Get()
  @ApiOperation({ summary: 'Where each channel’s display sits in this run’s frame, in channel order (any member)' })
  list(@CurrentUser() user: AuthUser, @Param('runId') runId: string): Promise<DisplayRegion[]> {
    return this.regions.list(user, runId);
  }

  @Put()
  @ApiOperation({
    summary: 'Replace the run’s display regions (lead, engineer)',
    description: 'Fractions (0–1) of the displayed frame; each channel must belong to the run’s campaign.',
  })
  replace(@CurrentUser() user: AuthUser, @Param('runId') runId: string, @Body() dto: SetDisplayRegionsDto): Promise<DisplayRegion[]> {
    return this.regions.replace(user, runId, dto);
  }
}
