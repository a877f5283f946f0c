import type { UpdateUserRequest } from '@dialsheet/common';
import { ApiPropertyOptional } from '@nestjs/swagger';
import { IsBoolean, IsOptional } from 'class-validator';

export class UpdateUserDto implements UpdateUserRequest {
  @ApiPropertyOptional({ description: 'A disabled account cannot sign in; its tokens stop working.' })
  @IsOptional()
  @IsBoolean()
  disabled?: boolean;

  @ApiPropertyOptional({ description: 'Platform administrators manage accounts.' })
  @IsOptional()
  @IsBoolean()
  isAdmin?: boolean;
}
