import type { AcceptInvitationRequest } from '@dialsheet/common';
import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { Transform } from 'class-transformer';
import { IsNotEmpty, IsOptional, IsString, MaxLength } from 'class-validator';

export class AcceptInvitationDto implements AcceptInvitationRequest {
  @ApiProperty({ description: 'The token from the e-mailed link' })
  @IsString()
  @IsNotEmpty()
  @MaxLength(200)
  token: string;

  @ApiPropertyOptional({ description: 'Required when no account exists for the invited e-mail', maxLength: 100 })
  @IsOptional()
  @Transform(({ value }) => (typeof value === 'string' ? value.trim() : value))
  @IsString()
  @IsNotEmpty()
  @MaxLength(100)
  name?: string;

  @ApiPropertyOptional({
    description: 'New account: the password to set. Existing account: its current password.',
    maxLength: 72,
  })
  @IsOptional()
  @IsString()
  @MaxLength(72)
  password?: string;
}
