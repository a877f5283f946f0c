import type { SetSyncRequest, SyncMark } from '@dialsheet/common';
import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { Type } from 'class-transformer';
import { IsDefined, IsNumber, IsObject, IsOptional, IsString, MaxLength, Min, ValidateIf, ValidateNested } from 'class-validator';

export class SyncMarkDto implements SyncMark {
  @ApiProperty({ example: 2.0167, description: 'Presentation time of the marked frame in the video (s)' })
  @IsNumber({ allowNaN: false, allowInfinity: false }, { message: 'videoTime must be a number of seconds' })
  @Min(0, { message: 'videoTime must not be negative' })
  videoTime: number;

  @ApiProperty({ example: 0, description: 'Test-clock time shown at that frame (s)' })
  @IsNumber({ allowNaN: false, allowInfinity: false }, { message: 'testTime must be a number of seconds' })
  testTime: number;
}

export class SetSyncDto implements SetSyncRequest {
  @ApiProperty({ type: SyncMarkDto })
  @IsDefined({ message: 'first is required: the start-marker frame and its test time' })
  @IsObject({ message: 'first must be an object {videoTime, testTime}' })
  @ValidateNested()
  @Type(() => SyncMarkDto)
  first: SyncMarkDto;

  @ApiPropertyOptional({ type: SyncMarkDto, nullable: true, description: 'A later mark that corrects clock drift' })
  @ValidateIf((_o, value) => value !== null && value !== undefined)
  @IsObject({ message: 'second must be an object {videoTime, testTime} or null' })
  @ValidateNested()
  @Type(() => SyncMarkDto)
  second?: SyncMarkDto | null;

  @ApiPropertyOptional({ description: 'Kept in the audit trail', maxLength: 1000 })
  @IsOptional()
  @IsString()
  @MaxLength(1000)
  reason?: string;
}
