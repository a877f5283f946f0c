import { CAMPAIGN_ROLES, type CampaignRole, type CreateInvitationRequest } from '@dialsheet/common';
import { ApiProperty } from '@nestjs/swagger';
import { Transform } from 'class-transformer';
import { ArrayNotEmpty, ArrayUnique, IsArray, IsEmail, IsIn, MaxLength } from 'class-validator';

export class CreateInvitationDto implements CreateInvitationRequest {
  @ApiProperty({ example: 'new.reader@example.test' })
  @Transform(({ value }) => (typeof value === 'string' ? value.trim().toLowerCase() : value))
  @IsEmail({}, { message: 'email must be a valid e-mail address' })
  @MaxLength(254)
  email: string;

  @ApiProperty({ enum: CAMPAIGN_ROLES, isArray: true, example: ['reader'] })
  @IsArray()
  @ArrayNotEmpty()
  @ArrayUnique()
  @IsIn(CAMPAIGN_ROLES, { each: true })
  roles: CampaignRole[];
}
