import type { CreateSheetRequest } from '@dialsheet/common';
import { ApiProperty } from '@nestjs/swagger';
import { Transform } from 'class-transformer';
import { ArrayMaxSize, ArrayNotEmpty, ArrayUnique, IsArray, IsNotEmpty, IsNumber, IsString, IsUUID, MaxLength, Min } from 'class-validator';
import { trim } from '../../campaigns/dto/create-campaign.dto';
import { finite } from '../../channels/dto/create-channel.dto';
import { MIN_SHEET_INTERVAL } from '../sheet-rules';

export class CreateSheetDto implements CreateSheetRequest {
  @ApiProperty({ example: 'Warm-up, every 2 s', maxLength: 200 })
  @Transform(trim)
  @IsString()
  @IsNotEmpty()
  @MaxLength(200)
  name: string;

  @ApiProperty({ example: 0, description: 'Test time of the first row, seconds (≥ 0)' })
  @IsNumber(finite, { message: 'startTime must be a number of seconds' })
  @Min(0, { message: 'startTime must be 0 s or later' })
  startTime: number;

  @ApiProperty({ example: 600, description: 'Test time the last row may not pass, seconds (> startTime)' })
  @IsNumber(finite, { message: 'endTime must be a number of seconds' })
  endTime: number;

  @ApiProperty({ example: 2, description: `Seconds between rows (≥ ${MIN_SHEET_INTERVAL})` })
  @IsNumber(finite, { message: 'interval must be a number of seconds' })
  @Min(MIN_SHEET_INTERVAL, { message: `interval must be at least ${MIN_SHEET_INTERVAL} s` })
  interval: number;

  @ApiProperty({ type: [String], format: 'uuid', description: 'Channels of the campaign, in entry order, each once' })
  @IsArray({ message: 'channelIds must be an array of channel ids' })
  @ArrayNotEmpty({ message: 'channelIds must list at least one channel' })
  @ArrayMaxSize(200, { message: 'channelIds must list at most 200 channels' })
  @ArrayUnique({ message: 'channelIds must not list a channel twice' })
  @IsUUID('all', { each: true, message: 'channelIds must contain channel ids (UUIDs)' })
  channelIds: string[];
}
