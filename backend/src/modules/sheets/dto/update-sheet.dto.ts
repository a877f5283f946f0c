import type { UpdateSheetRequest } from '@dialsheet/common';
import { ApiPropertyOptional } from '@nestjs/swagger';
import { Transform } from 'class-transformer';
import {
  ArrayMaxSize,
  ArrayNotEmpty,
  ArrayUnique,
  IsArray,
  IsNotEmpty,
  IsNumber,
  IsOptional,
  IsString,
  IsUUID,
  MaxLength,
  Min,
  ValidateIf,
} from 'class-validator';
import { trim } from '../../campaigns/dto/create-campaign.dto';
import { finite } from '../../channels/dto/create-channel.dto';
import { MIN_SHEET_INTERVAL } from '../sheet-rules';

const present = (_o: object, value: unknown) => value !== undefined;

/** Absent fields stay as they are; none of them may be null. */
export class UpdateSheetDto implements UpdateSheetRequest {
  @ApiPropertyOptional({ maxLength: 200 })
  @ValidateIf(present)
  @Transform(trim)
  @IsString()
  @IsNotEmpty()
  @MaxLength(200)
  name?: string;

  @ApiPropertyOptional()
  @ValidateIf(present)
  @IsNumber(finite, { message: 'startTime must be a number of seconds' })
  @Min(0, { message: 'startTime must be 0 s or later' })
  startTime?: number;

  @ApiPropertyOptional()
  @ValidateIf(present)
  @IsNumber(finite, { message: 'endTime must be a number of seconds' })
  endTime?: number;

  @ApiPropertyOptional()
  @ValidateIf(present)
  @IsNumber(finite, { message: 'interval must be a number of seconds' })
  @Min(MIN_SHEET_INTERVAL, { message: `interval must be at least ${MIN_SHEET_INTERVAL} s` })
  interval?: number;

  @ApiPropertyOptional({ type: [String], format: 'uuid' })
  @ValidateIf(present)
  @IsArray({ message: 'channelIds must be an array of channel ids' })
  @ArrayNotEmpty({ message: 'channelIds must list at least one channel' })
  @ArrayMaxSize(200, { message: 'channelIds must list at most 200 channels' })
  @ArrayUnique({ message: 'channelIds must not list a channel twice' })
  @IsUUID('all', { each: true, message: 'channelIds must contain channel ids (UUIDs)' })
  channelIds?: string[];

  @ApiPropertyOptional({ description: 'Kept in the audit trail', maxLength: 1000 })
  @IsOptional()
  @IsString()
  @MaxLength(1000)
  reason?: string;
}
