import type { DisplayRegionInput, SetDisplayRegionsRequest } from '@dialsheet/common';
import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { Type } from 'class-transformer';
import { ArrayMaxSize, IsArray, IsNumber, IsOptional, IsString, IsUUID, Max, MaxLength, Min, ValidateNested } from 'class-validator';
import { finite } from './create-channel.dto';

/** Nest prefixes these messages with the element's path, e.g. "regions.0.x …". */
export class DisplayRegionInputDto implements DisplayRegionInput {
  @ApiProperty({ format: 'uuid' })
  @IsUUID('all', { message: 'channelId must be a channel id (UUID)' })
  channelId: string;

  @ApiProperty({ example: 0.12, description: 'Left edge, fraction of the frame width (0–1)' })
  @IsNumber(finite, { message: 'x must be a number' })
  @Min(0, { message: 'x must be a fraction of the frame between 0 and 1' })
  @Max(1, { message: 'x must be a fraction of the frame between 0 and 1' })
  x: number;

  @ApiProperty({ example: 0.3, description: 'Top edge, fraction of the frame height (0–1)' })
  @IsNumber(finite, { message: 'y must be a number' })
  @Min(0, { message: 'y must be a fraction of the frame between 0 and 1' })
  @Max(1, { message: 'y must be a fraction of the frame between 0 and 1' })
  y: number;

  @ApiProperty({ example: 0.2, description: 'Fraction of the frame width (above 0, at most 1)' })
  @IsNumber(finite, { message: 'width must be a number' })
  @Min(Number.MIN_VALUE, { message: 'width must be a fraction of the frame above 0 and at most 1' })
  @Max(1, { message: 'width must be a fraction of the frame above 0 and at most 1' })
  width: number;

  @ApiProperty({ example: 0.1, description: 'Fraction of the frame height (above 0, at most 1)' })
  @IsNumber(finite, { message: 'height must be a number' })
  @Min(Number.MIN_VALUE, { message: 'height must be a fraction of the frame above 0 and at most 1' })
  @Max(1, { message: 'height must be a fraction of the frame above 0 and at most 1' })
  height: number;
}

export class SetDisplayRegionsDto implements SetDisplayRegionsRequest {
  @ApiProperty({ type: [DisplayRegionInputDto], description: 'The run’s complete set; channels left out lose their region' })
  @IsArray({ message: 'regions must be an array' })
  @ArrayMaxSize(500)
  @ValidateNested({ each: true })
  @Type(() => DisplayRegionInputDto)
  regions: DisplayRegionInputDto[];

  @ApiPropertyOptional({ description: 'Kept in the audit trail', maxLength: 1000 })
  @IsOptional()
  @IsString()
  @MaxLength(1000)
  reason?: string;
}
