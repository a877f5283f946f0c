import type { UpdateChannelRequest } from '@dialsheet/common';
import { ApiPropertyOptional } from '@nestjs/swagger';
import { Transform, Type } from 'class-transformer';
import { IsNotEmpty, IsNumber, IsObject, IsOptional, IsString, MaxLength, ValidateIf, ValidateNested } from 'class-validator';
import { trim } from '../../campaigns/dto/create-campaign.dto';
import { AccuracyDto } from './accuracy.dto';
import { finite, given } from './create-channel.dto';

/** Absent fields stay as they are; null clears an optional one. Required fields refuse null. */
export class UpdateChannelDto implements UpdateChannelRequest {
  @ApiPropertyOptional({ maxLength: 200 })
  @IsOptional()
  @Transform(trim)
  @IsString()
  @IsNotEmpty()
  @MaxLength(200)
  name?: string;

  @ApiPropertyOptional({ maxLength: 40 })
  @IsOptional()
  @Transform(trim)
  @IsString()
  @IsNotEmpty()
  @MaxLength(40)
  symbol?: string;

  @ApiPropertyOptional({ maxLength: 100 })
  @IsOptional()
  @Transform(trim)
  @IsString()
  @IsNotEmpty()
  @MaxLength(100)
  quantity?: string;

  @ApiPropertyOptional({ maxLength: 40 })
  @IsOptional()
  @Transform(trim)
  @IsString()
  @IsNotEmpty()
  @MaxLength(40)
  rawUnit?: string;

  @ApiPropertyOptional()
  @ValidateIf((_o, value) => value !== undefined)
  @IsNumber(finite, { message: 'resolution must be a number' })
  resolution?: number;

  @ApiPropertyOptional()
  @ValidateIf((_o, value) => value !== undefined)
  @IsNumber(finite, { message: 'rangeMin must be a number' })
  rangeMin?: number;

  @ApiPropertyOptional()
  @ValidateIf((_o, value) => value !== undefined)
  @IsNumber(finite, { message: 'rangeMax must be a number' })
  rangeMax?: number;

  @ApiPropertyOptional({ nullable: true })
  @ValidateIf(given)
  @IsNumber(finite, { message: 'fullScale must be a number or null' })
  fullScale?: number | null;

  @ApiPropertyOptional({ nullable: true })
  @ValidateIf(given)
  @IsNumber(finite, { message: 'operatingMin must be a number or null' })
  operatingMin?: number | null;

  @ApiPropertyOptional({ nullable: true })
  @ValidateIf(given)
  @IsNumber(finite, { message: 'operatingMax must be a number or null' })
  operatingMax?: number | null;

  @ApiPropertyOptional({ type: AccuracyDto, nullable: true })
  @ValidateIf(given)
  @IsObject({ message: 'accuracy must be an object {percentOfFullScale, percentOfReading, digits} or null' })
  @ValidateNested()
  @Type(() => AccuracyDto)
  accuracy?: AccuracyDto | null;

  @ApiPropertyOptional({ nullable: true })
  @ValidateIf(given)
  @IsNumber(finite, { message: 'plausibleMin must be a number or null' })
  plausibleMin?: number | null;

  @ApiPropertyOptional({ nullable: true })
  @ValidateIf(given)
  @IsNumber(finite, { message: 'plausibleMax must be a number or null' })
  plausibleMax?: number | null;

  @ApiPropertyOptional({ description: 'Kept in the audit trail', maxLength: 1000 })
  @IsOptional()
  @IsString()
  @MaxLength(1000)
  reason?: string;
}
