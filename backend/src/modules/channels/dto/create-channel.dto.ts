import type { CreateChannelRequest } from '@dialsheet/common';
import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { Transform, Type } from 'class-transformer';
import { IsNotEmpty, IsNumber, IsObject, IsString, MaxLength, ValidateIf, ValidateNested } from 'class-validator';
import { trim } from '../../campaigns/dto/create-campaign.dto';
import { AccuracyDto } from './accuracy.dto';

export const given = (_o: object, value: unknown) => value !== null && value !== undefined;
export const finite = { allowNaN: false, allowInfinity: false } as const;

export class CreateChannelDto implements CreateChannelRequest {
  @ApiProperty({ example: 'Warm stream inlet temperature', maxLength: 200 })
  @Transform(trim)
  @IsString()
  @IsNotEmpty()
  @MaxLength(200)
  name: string;

  @ApiProperty({ example: 'T1', maxLength: 40 })
  @Transform(trim)
  @IsString()
  @IsNotEmpty()
  @MaxLength(40)
  symbol: string;

  @ApiProperty({ example: 'temperature', maxLength: 100 })
  @Transform(trim)
  @IsString()
  @IsNotEmpty()
  @MaxLength(100)
  quantity: string;

  @ApiProperty({ example: '°C', maxLength: 40, description: 'Unit shown on the display' })
  @Transform(trim)
  @IsString()
  @IsNotEmpty()
  @MaxLength(40)
  rawUnit: string;

  @ApiProperty({ example: 0.1, description: 'Step of the last displayed digit (> 0)' })
  @IsNumber(finite, { message: 'resolution must be a number' })
  resolution: number;

  @ApiProperty({ example: -50 })
  @IsNumber(finite, { message: 'rangeMin must be a number' })
  rangeMin: number;

  @ApiProperty({ example: 200 })
  @IsNumber(finite, { message: 'rangeMax must be a number' })
  rangeMax: number;

  @ApiPropertyOptional({ example: 200, nullable: true, description: 'What "% of full scale" refers to (> 0)' })
  @ValidateIf(given)
  @IsNumber(finite, { message: 'fullScale must be a number or null' })
  fullScale?: number | null;

  @ApiPropertyOptional({ example: -40, nullable: true, description: 'Rated operating limit of the instrument' })
  @ValidateIf(given)
  @IsNumber(finite, { message: 'operatingMin must be a number or null' })
  operatingMin?: number | null;

  @ApiPropertyOptional({ example: 180, nullable: true })
  @ValidateIf(given)
  @IsNumber(finite, { message: 'operatingMax must be a number or null' })
  operatingMax?: number | null;

  @ApiPropertyOptional({ type: AccuracyDto, nullable: true })
  @ValidateIf(given)
  @IsObject({ message: 'accuracy must be an object {percentOfFullScale, percentOfReading, digits} or null' })
  @ValidateNested()
  @Type(() => AccuracyDto)
  accuracy?: AccuracyDto | null;

  @ApiPropertyOptional({ example: 5, nullable: true, description: 'Lowest value this rig can plausibly show' })
  @ValidateIf(given)
  @IsNumber(finite, { message: 'plausibleMin must be a number or null' })
  plausibleMin?: number | null;

  @ApiPropertyOptional({ example: 90, nullable: true })
  @ValidateIf(given)
  @IsNumber(finite, { message: 'plausibleMax must be a number or null' })
  plausibleMax?: number | null;
}
