import { MIN_PASSWORD_LENGTH } from '@dialsheet/common';
import { applyDecorators } from '@nestjs/common';
import { ApiProperty } from '@nestjs/swagger';
import { IsString, MaxLength, MinLength } from 'class-validator';

/** bcrypt only looks at the first 72 bytes, so longer passwords would be silently cut. */
export const MAX_PASSWORD_LENGTH = 72;

/** Rules for every field that sets a password. */
export function NewPassword(): PropertyDecorator {
  return applyDecorators(
    ApiProperty({ minLength: MIN_PASSWORD_LENGTH, maxLength: MAX_PASSWORD_LENGTH }),
    IsString(),
    MinLength(MIN_PASSWORD_LENGTH, {
      message: ({ property }) => `${property} must be at least ${MIN_PASSWORD_LENGTH} characters long`,
    }),
    MaxLength(MAX_PASSWORD_LENGTH, {
      message: ({ property }) => `${property} must be at most ${MAX_PASSWORD_LENGTH} characters long`,
    }),
  );
}
