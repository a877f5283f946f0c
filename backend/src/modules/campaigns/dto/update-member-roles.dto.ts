import { CAMPAIGN_ROLES, type CampaignRole, type UpdateMemberRolesRequest } from '@dialsheet/common';
import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { ArrayNotEmpty, ArrayUnique, IsArray, IsIn, IsOptional, IsString, MaxLength } from 'class-validator';

export class UpdateMemberRolesDto implements UpdateMemberRolesRequest {
  @ApiProperty({ enum: CAMPAIGN_ROLES, isArray: true, example: ['reader', 'checker'] })
  @IsArray()
  @ArrayNotEmpty()
  @ArrayUnique()
  @IsIn(CAMPAIGN_ROLES, { each: true })
  roles: CampaignRole[];

  @ApiPropertyOptional({ maxLength: 1000 })
  @IsOptional()
  @IsString()
  @MaxLength(1000)
  reason?: string;
}
