import type { UpdateCampaignRequest } from '@dialsheet/common';
import { ApiPropertyOptional } from '@nestjs/swagger';
import { Transform } from 'class-transformer';
import { IsBoolean, IsNotEmpty, IsOptional, IsString, MaxLength } from 'class-validator';
import { trim } from './create-campaign.dto';
import { IsOmittable } from '../../../core/decorators/is-omittable.decorator';

export class UpdateCampaignDto implements UpdateCampaignRequest {
  @ApiPropertyOptional({ maxLength: 200 })
  @IsOmittable()
  @Transform(trim)
  @IsString()
  @IsNotEmpty()
  @MaxLength(200)
  name?: string;

  @ApiPropertyOptional({ maxLength: 5000 })
  @IsOmittable()
  @IsString()
  @MaxLength(5000)
  description?: string;

  @ApiPropertyOptional()
  @IsOmittable()
  @IsBoolean()
  decimalComma?: boolean;

  @ApiPropertyOptional({ description: 'Kept in the audit trail', maxLength: 1000 })
  @IsOptional()
  @IsString()
  @MaxLength(1000)
  reason?: string;
}
