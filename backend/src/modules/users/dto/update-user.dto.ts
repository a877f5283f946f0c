import type { UpdateUserRequest } from '@dialsheet/common';
import { ApiPropertyOptional } from '@nestjs/swagger';
import { IsBoolean } from 'class-validator';
import { IsOmittable } from '../../../core/decorators/is-omittable.decorator';

export class UpdateUserDto implements UpdateUserRequest {
  @ApiPropertyOptional({ description: 'A disabled account cannot sign in; its tokens stop working.' })
  @IsOmittable()
  @IsBoolean()
  disabled?: boolean;

  @ApiPropertyOptional({ description: 'Platform administrators manage accounts.' })
  @IsOmittable()
  @IsBoolean()
  isAdmin?: boolean;
}
