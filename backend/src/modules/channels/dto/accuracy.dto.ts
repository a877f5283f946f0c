import type { ChannelAccuracy } from '@dialsheet/common';
import { ApiPropertyOptional } from '@nestjs/swagger';
import { IsInt, IsNumber, Max, Min, ValidateIf } from 'class-validator';

const given = (_o: object, value: unknown) => value !== null && value !== undefined;

/** Nest prefixes nested messages with the parent field, so these read "accuracy.digits …". */
export class AccuracyDto implements ChannelAccuracy {
  @ApiPropertyOptional({ example: 0.25, nullable: true, description: 'Percent of full scale' })
  @ValidateIf(given)
  @IsNumber({ allowNaN: false, allowInfinity: false }, { message: 'percentOfFullScale must be a number' })
  @Min(0, { message: 'percentOfFullScale must not be negative' })
  @Max(100, { message: 'percentOfFullScale must be at most 100' })
  percentOfFullScale?: number | null;

  @ApiPropertyOptional({ example: 0.5, nullable: true, description: 'Percent of reading' })
  @ValidateIf(given)
  @IsNumber({ allowNaN: false, allowInfinity: false }, { message: 'percentOfReading must be a number' })
  @Min(0, { message: 'percentOfReading must not be negative' })
  @Max(100, { message: 'percentOfReading must be at most 100' })
  percentOfReading?: number | null;

  @ApiPropertyOptional({ example: 2, nullable: true, description: 'Counts of the last displayed digit' })
  @ValidateIf(given)
  @IsInt({ message: 'digits must be a whole number of counts' })
  @Min(0, { message: 'digits must not be negative' })
  digits?: number | null;
}
