import type { ReadingInput, ReadingPass, SaveRowRequest } from '@dialsheet/common';
import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { Type } from 'class-transformer';
import { ArrayMaxSize, ArrayNotEmpty, IsArray, IsIn, IsInt, IsNumber, IsString, IsUUID, MaxLength, Min, ValidateIf, ValidateNested } from 'class-validator';
import { finite } from '../../channels/dto/create-channel.dto';

const given = (_o: object, value: unknown) => value !== null && value !== undefined;

export class ReadingInputDto implements ReadingInput {
  @ApiProperty({ format: 'uuid' })
  @IsUUID('all', { message: 'channelId must be a channel id (UUID)' })
  channelId: string;

  @ApiProperty({ example: '12.50', description: 'Exactly as typed; "" for blank, "#unreadable" or "#ambiguous" to flag' })
  @IsString({ message: 'rawText must be text' })
  @MaxLength(100, { message: 'rawText must be at most 100 characters' })
  rawText: string;

  @ApiPropertyOptional({ nullable: true, description: 'Presentation time (s) of the frame actually read' })
  @ValidateIf(given)
  @IsNumber(finite, { message: 'frameTime must be a number of seconds' })
  @Min(0, { message: 'frameTime must be 0 s or later' })
  frameTime?: number | null;

  @ApiPropertyOptional({ nullable: true, description: 'The stored version this replaces; absent for a first entry' })
  @ValidateIf(given)
  @IsInt({ message: 'baseVersion must be a whole number' })
  @Min(1, { message: 'baseVersion must be 1 or more' })
  baseVersion?: number | null;
}

export class SaveRowDto implements SaveRowRequest {
  @ApiProperty({ enum: [1, 2] })
  @IsIn([1, 2], { message: 'pass must be 1 or 2' })
  pass: ReadingPass;

  @ApiPropertyOptional({ description: 'Must equal the row index in the path when sent' })
  @ValidateIf(given)
  @IsInt({ message: 'rowIndex must be a whole number' })
  rowIndex?: number;

  @ApiProperty({ type: [ReadingInputDto] })
  @IsArray({ message: 'readings must be an array' })
  @ArrayNotEmpty({ message: 'readings must hold at least one reading' })
  @ArrayMaxSize(200, { message: 'readings must hold at most 200 readings' })
  @ValidateNested({ each: true })
  @Type(() => ReadingInputDto)
  readings: ReadingInputDto[];
}
