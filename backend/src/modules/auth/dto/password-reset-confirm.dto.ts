import type { PasswordResetConfirmRequest } from '@dialsheet/common';
import { ApiProperty } from '@nestjs/swagger';
import { IsNotEmpty, IsString, MaxLength } from 'class-validator';
import { NewPassword } from './new-password';

export class PasswordResetConfirmDto implements PasswordResetConfirmRequest {
  @ApiProperty({ description: 'The token from the e-mailed link' })
  @IsString()
  @IsNotEmpty()
  @MaxLength(200)
  token: string;

  @NewPassword()
  newPassword: string;
}
