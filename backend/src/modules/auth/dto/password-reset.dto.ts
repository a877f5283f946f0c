import type { PasswordResetRequest } from '@dialsheet/common';
import { ApiProperty } from '@nestjs/swagger';
import { IsEmail, MaxLength } from 'class-validator';

export class PasswordResetDto implements PasswordResetRequest {
  @ApiProperty({ example: 'reader@demo.test' })
  @IsEmail({}, { message: 'email must be a valid e-mail address' })
  @MaxLength(254)
  email: string;
}
