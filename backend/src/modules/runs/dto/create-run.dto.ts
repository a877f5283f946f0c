import type { CreateRunRequest } from '@dialsheet/common';
import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { Transform } from 'class-transformer';
import { IsISO8601, IsNotEmpty, IsOptional, IsString, Matches, MaxLength, ValidateIf } from 'class-validator';
import { trim } from '../../campaigns/dto/create-campaign.dto';

export const RUN_DATE_MESSAGE = 'runDate must be a date written YYYY-MM-DD';

export class CreateRunDto implements CreateRunRequest {
  @ApiProperty({ example: 'Run 1 — meter on warm stream', maxLength: 200 })
  @Transform(trim)
  @IsString()
  @IsNotEmpty()
  @MaxLength(200)
  name: string;

  @ApiPropertyOptional({ example: '2025-03-14', nullable: true, description: 'Day of the test (YYYY-MM-DD)' })
  @ValidateIf((_o, value) => value !== null && value !== undefined)
  @IsISO8601({ strict: true }, { message: RUN_DATE_MESSAGE })
  @Matches(/^\d{4}-\d{2}-\d{2}$/, { message: RUN_DATE_MESSAGE })
  runDate?: string | null;

  @ApiPropertyOptional({ example: 'flow meter on warm stream', maxLength: 1000 })
  @IsOptional()
  @Transform(trim)
  @IsString()
  @MaxLength(1000)
  configuration?: string;

  @ApiPropertyOptional({ example: 'E. Engineer', maxLength: 200 })
  @IsOptional()
  @Transform(trim)
  @IsString()
  @MaxLength(200)
  operator?: string;

  @ApiPropertyOptional({ maxLength: 10000 })
  @IsOptional()
  @IsString()
  @MaxLength(10000)
  notes?: string;
}
