import type { CalibrationChain, SetCalibrationRequest } from '@dialsheet/common';
import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { IsInt, IsObject, IsOptional, IsString, MaxLength, Min, ValidateIf } from 'class-validator';

export const given = (_o: object, value: unknown) => value !== null && value !== undefined;

export class SetCalibrationDto implements SetCalibrationRequest {
  @ApiProperty({
    description: 'Raw → engineering steps (linear, two-point, table, unit, standard-to-mass); the first takes the channel’s raw unit',
    example: { steps: [{ kind: 'linear', a: 40, b: 0, inputUnit: 'V', outputUnit: 'SLPM' }] },
  })
  // The steps are checked by compileChain, whose messages name the step and what to change.
  @IsObject({ message: 'chain must be an object with a list of steps' })
  chain: CalibrationChain;

  @ApiPropertyOptional({ description: 'The stored version when changing one; omitted for the first' })
  @ValidateIf(given)
  @IsInt({ message: 'baseVersion must be a whole number' })
  @Min(1, { message: 'baseVersion must be 1 or more' })
  baseVersion?: number;

  @ApiPropertyOptional({ maxLength: 500 })
  @IsOptional()
  @IsString({ message: 'reason must be text' })
  @MaxLength(500, { message: 'reason must be at most 500 characters' })
  reason?: string;
}
