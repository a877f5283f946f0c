import type { CreateStabilityRuleRequest, UpdateStabilityRuleRequest } from '@dialsheet/common';
import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { Transform } from 'class-transformer';
import { IsInt, IsNotEmpty, IsNumber, IsOptional, IsString, IsUUID, MaxLength, Min, ValidateIf } from 'class-validator';
import { trim } from '../../campaigns/dto/create-campaign.dto';
import { given } from './set-calibration.dto';

const finite = { allowNaN: false, allowInfinity: false };

export class CreateStabilityRuleDto implements CreateStabilityRuleRequest {
  @ApiProperty({ maxLength: 200, example: 'Steady outlet' })
  @Transform(trim)
  @IsString({ message: 'name must be text' })
  @IsNotEmpty({ message: 'name is required' })
  @MaxLength(200, { message: 'name must be at most 200 characters' })
  name: string;

  @ApiProperty({ example: 300, description: 'The window ends at the chosen time and reaches back this far, s' })
  @IsNumber(finite, { message: 'windowSeconds must be a number of seconds' })
  windowSeconds: number;

  @ApiPropertyOptional({ nullable: true, example: 0.05, description: '|slope| limit, channel units per minute' })
  @ValidateIf(given)
  @IsNumber(finite, { message: 'slopeLimitPerMinute must be a number' })
  slopeLimitPerMinute?: number | null;

  @ApiPropertyOptional({ nullable: true, description: 'max − min limit over the window, channel units' })
  @ValidateIf(given)
  @IsNumber(finite, { message: 'bandLimit must be a number' })
  bandLimit?: number | null;

  @ApiPropertyOptional({ nullable: true, description: '|slope| × window length limit, channel units' })
  @ValidateIf(given)
  @IsNumber(finite, { message: 'driftLimit must be a number' })
  driftLimit?: number | null;

  @ApiPropertyOptional({ nullable: true, description: 'A channel of the campaign; null: any channel' })
  @ValidateIf(given)
  @IsUUID('all', { message: 'channelId must be a channel id' })
  channelId?: string | null;
}

export class UpdateStabilityRuleDto implements UpdateStabilityRuleRequest {
  @ApiPropertyOptional({ maxLength: 200 })
  @IsOptional()
  @Transform(trim)
  @IsString({ message: 'name must be text' })
  @IsNotEmpty({ message: 'name must not be empty' })
  @MaxLength(200, { message: 'name must be at most 200 characters' })
  name?: string;

  @ApiPropertyOptional()
  @IsOptional()
  @IsNumber(finite, { message: 'windowSeconds must be a number of seconds' })
  windowSeconds?: number;

  @ApiPropertyOptional({ nullable: true })
  @IsOptional()
  @ValidateIf(given)
  @IsNumber(finite, { message: 'slopeLimitPerMinute must be a number' })
  slopeLimitPerMinute?: number | null;

  @ApiPropertyOptional({ nullable: true })
  @IsOptional()
  @ValidateIf(given)
  @IsNumber(finite, { message: 'bandLimit must be a number' })
  bandLimit?: number | null;

  @ApiPropertyOptional({ nullable: true })
  @IsOptional()
  @ValidateIf(given)
  @IsNumber(finite, { message: 'driftLimit must be a number' })
  driftLimit?: number | null;

  @ApiPropertyOptional({ nullable: true })
  @IsOptional()
  @ValidateIf(given)
  @IsUUID('all', { message: 'channelId must be a channel id' })
  channelId?: string | null;

  @ApiProperty({ description: 'The stored version this change replaces' })
  @IsInt({ message: 'baseVersion must be a whole number' })
  @Min(1, { message: 'baseVersion must be 1 or more' })
  baseVersion: number;

  @ApiPropertyOptional({ maxLength: 500 })
  @IsOptional()
  @IsString({ message: 'reason must be text' })
  @MaxLength(500, { message: 'reason must be at most 500 characters' })
  reason?: string;
}
