import type { ResolveCellRequest } from '@dialsheet/common';
import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { IsInt, IsString, Matches, MaxLength, Min, ValidateIf } from 'class-validator';

const given = (_o: object, value: unknown) => value !== null && value !== undefined;

export class ResolveCellDto implements ResolveCellRequest {
  @ApiProperty({ example: '21.4', description: 'The agreed value as read from the frame; "#unreadable" or "#ambiguous" to flag' })
  @IsString({ message: 'rawText must be text' })
  @MaxLength(100, { message: 'rawText must be at most 100 characters' })
  rawText: string;

  @ApiProperty({ example: 'Frame 00:01:25.033 shows 21.4; pass 2 misread the last digit' })
  @IsString({ message: 'reason must be text' })
  @Matches(/\S/, { message: 'reason is required: say why this value is the right one' })
  @MaxLength(500, { message: 'reason must be at most 500 characters' })
  reason: string;

  @ApiPropertyOptional({ nullable: true, description: 'The stored version this replaces; absent for a first resolution' })
  @ValidateIf(given)
  @IsInt({ message: 'baseVersion must be a whole number' })
  @Min(1, { message: 'baseVersion must be 1 or more' })
  baseVersion?: number | null;
}
