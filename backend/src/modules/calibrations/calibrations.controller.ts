import type { ChannelCalibration, DerivedChannel, StoredStabilityRule } from '@dialsheet/common';
import { BadRequestException, Body, Controller, Delete, Get, HttpCode, Param, Patch, Post, Put, Query } from '@nestjs/common';
import { ApiBearerAuth, ApiNoContentResponse, ApiOperation, ApiQuery, ApiTags } from '@nestjs/swagger';
import type { AuthUser } from '../../core/auth-user';
import { CurrentUser } from '../../core/decorators/current-user.decorator';
import { CalibrationsService } from './calibrations.service';
import { DerivedChannelsService } from './derived-channels.service';
import { CreateDerivedChannelDto, UpdateDerivedChannelDto } from './dto/derived-channel.dto';
import { SetCalibrationDto } from './dto/set-calibration.dto';
import { CreateStabilityRuleDto, UpdateStabilityRuleDto } from './dto/stability-rule.dto';
import { StabilityRulesService } from './stability-rules.service';

/** ?baseVersion=3 → 3; absent → undefined; anything else is a clear 400. */
export function versionQuery(value: string | undefined): number | undefined {
  if (value === undefined || value === '') return undefined;
  if (!/^\d+$/.test(value) || Number(value) < 1) throw new BadRequestException(`baseVersion must be a whole number of 1 or more, got "${value}"`);
  return Number(value);
}

@ApiTags('analysis set-up')
@ApiBearerAuth()
@Controller('campaigns/:campaignId')
export class CampaignAnalysisSetupController {
  constructor(
    private readonly calibrations: CalibrationsService,
    private readonly derived: DerivedChannelsService,
    private readonly rules: StabilityRulesService,
  ) {}

  @Get('calibrations')
  @ApiOperation({ summary: 'Calibration chains of the campaign’s channels, in channel order (any member)' })
  listCalibrations(@CurrentUser() user: AuthUser, @Param('campaignId') campaignId: string): Promise<ChannelCalibration[]> {
    return this.calibrations.list(user, campaignId);
  }

  @Get('derived-channels')
  @ApiOperation({ summary: 'Derived channels of the campaign (any member)' })
  listDerived(@CurrentUser() user: AuthUser, @Param('campaignId') campaignId: string): Promise<DerivedChannel[]> {
    return this.derived.list(user, campaignId);
  }

  @Post('derived-channels')
  @ApiOperation({ summary: 'Add a derived channel: an expression over channel symbols (engineer)' })
  createDerived(@CurrentUser() user: AuthUser, @Param('campaignId') campaignId: string, @Body() dto: CreateDerivedChannelDto): Promise<DerivedChannel> {
    return this.derived.create(user, campaignId, dto);
  }

  @Get('stability-rules')
  @ApiOperation({ summary: 'Named stability rules of the campaign (any member)' })
  listRules(@CurrentUser() user: AuthUser, @Param('campaignId') campaignId: string): Promise<StoredStabilityRule[]> {
    return this.rules.list(user, campaignId);
  }

  @Post('stability-rules')
  @ApiOperation({ summary: 'Add a stability rule: window, slope, band and drift limits (engineer)' })
  createRule(@CurrentUser() user: AuthUser, @Param('campaignId') campaignId: string, @Body() dto: CreateStabilityRuleDto): Promise<StoredStabilityRule> {
    return this.rules.create(user, campaignId, dto);
  }
}

@ApiTags('analysis set-up')
@ApiBearerAuth()
@Controller('channels/:channelId/calibration')
export class ChannelCalibrationController {
  constructor(private readonly calibrations: CalibrationsService) {}

  @Put()
  @ApiOperation({
    summary: 'Set the channel’s raw → engineering chain (engineer)',
    description: 'The first step must take the channel’s raw unit; a change names the stored version (409 with `current` otherwise).',
  })
  set(@CurrentUser() user: AuthUser, @Param('channelId') channelId: string, @Body() dto: SetCalibrationDto): Promise<ChannelCalibration> {
    return this.calibrations.set(user, channelId, dto);
  }

  @Delete()
  @HttpCode(204)
  @ApiQuery({ name: 'baseVersion', required: true, type: Number })
  @ApiNoContentResponse({ description: 'The channel is used in its raw unit again' })
  @ApiOperation({ summary: 'Remove the channel’s calibration (engineer)' })
  remove(@CurrentUser() user: AuthUser, @Param('channelId') channelId: string, @Query('baseVersion') baseVersion?: string): Promise<void> {
    return this.calibrations.remove(user, channelId, versionQuery(baseVersion));
  }
}

@ApiTags('analysis set-up')
@ApiBearerAuth()
@Controller('derived-channels/:id')
export class DerivedChannelController {
  constructor(private readonly derived: DerivedChannelsService) {}

  @Patch()
  @ApiOperation({ summary: 'Change a derived channel (engineer); baseVersion required' })
  update(@CurrentUser() user: AuthUser, @Param('id') id: string, @Body() dto: UpdateDerivedChannelDto): Promise<DerivedChannel> {
    return this.derived.update(user, id, dto);
  }

  @Delete()
  @HttpCode(204)
  @ApiQuery({ name: 'baseVersion', required: false, type: Number })
  @ApiNoContentResponse({ description: 'Refused (409) while another derived channel or an analysis uses it' })
  @ApiOperation({ summary: 'Delete a derived channel (engineer)' })
  remove(@CurrentUser() user: AuthUser, @Param('id') id: string, @Query('baseVersion') baseVersion?: string): Promise<void> {
    return this.derived.remove(user, id, versionQuery(baseVersion));
  }
}

@ApiTags('analysis set-up')
@ApiBearerAuth()
@Controller('stability-rules/:id')
export class StabilityRuleController {
  constructor(private readonly rules: StabilityRulesService) {}

  @Patch()
  @ApiOperation({ summary: 'Change a stability rule (engineer); baseVersion required' })
  update(@CurrentUser() user: AuthUser, @Param('id') id: string, @Body() dto: UpdateStabilityRuleDto): Promise<StoredStabilityRule> {
    return this.rules.update(user, id, dto);
  }

  @Delete()
  @HttpCode(204)
  @ApiQuery({ name: 'baseVersion', required: false, type: Number })
  @ApiNoContentResponse({ description: 'Refused (409) while an analysis is judged by it' })
  @ApiOperation({ summary: 'Delete a stability rule (engineer)' })
  remove(@CurrentUser() user: AuthUser, @Param('id') id: string, @Query('baseVersion') baseVersion?: string): Promise<void> {
    return this.rules.remove(user, id, versionQuery(baseVersion));
  }
}
