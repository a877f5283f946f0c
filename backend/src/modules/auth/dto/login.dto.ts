import type { LoginRequest } from '@dialsheet/common';
import { ApiProperty } from '@nestjs/swagger';
import { IsNotEmpty, IsString, MaxLength } from 'class-validator';

export class LoginDto implements LoginRequest {
  @ApiProperty({ example: 'lead@demo.test' })
  @IsString()
  @IsNotEmpty()
  @MaxLength(254)
  email: string;

  @ApiProperty({ example: 'dialsheet-demo' })
  @IsString()
  @IsNotEmpty()
  @MaxLength(200)
  password: string;
}
