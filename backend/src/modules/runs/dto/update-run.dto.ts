import type { UpdateRunRequest } from '@dialsheet/common';
import { ApiPropertyOptional } from '@nestjs/swagger';
import { Transform } from 'class-transformer';
import { IsISO8601, IsNotEmpty, IsOptional, IsString, Matches, MaxLength, ValidateIf } from 'class-validator';
import { trim } from '../../campaigns/dto/create-campaign.dto';
import { RUN_DATE_MESSAGE } from './create-run.dto';
import { IsOmittable } from '../../../core/decorators/is-omittable.decorator';

export class UpdateRunDto implements UpdateRunRequest {
  @ApiPropertyOptional({ maxLength: 200 })
  @IsOmittable()
  @Transform(trim)
  @IsString()
  @IsNotEmpty()
  @MaxLength(200)
  name?: string;

  @ApiPropertyOptional({ example: '2025-03-14', nullable: true, description: 'null clears the date' })
  @ValidateIf((_o, value) => value !== null && value !== undefined)
  @IsISO8601({ strict: true }, { message: RUN_DATE_MESSAGE })
  @Matches(/^\d{4}-\d{2}-\d{2}$/, { message: RUN_DATE_MESSAGE })
  runDate?: string | null;

  @ApiPropertyOptional({ maxLength: 1000 })
  @IsOmittable()
  @Transform(trim)
  @IsString()
  @MaxLength(1000)
  configuration?: string;

  @ApiPropertyOptional({ maxLength: 200 })
  @IsOmittable()
  @Transform(trim)
  @IsString()
  @MaxLength(200)
  operator?: string;

  @ApiPropertyOptional({ maxLength: 10000 })
  @IsOmittable()
  @IsString()
  @MaxLength(10000)
  notes?: string;

  @ApiPropertyOptional({ description: 'Kept in the audit trail', maxLength: 1000 })
  @IsOptional()
  @IsString()
  @MaxLength(1000)
  reason?: string;
}
