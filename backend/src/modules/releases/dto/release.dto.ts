import type { CreateReleaseRequest, DeclineReleaseRequest, OpenCorrectionRequest, SignReleaseRequest } from '@dialsheet/common';
import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { Transform } from 'class-transformer';
import { ArrayMaxSize, ArrayMinSize, ArrayUnique, IsArray, IsBoolean, IsNotEmpty, IsOptional, IsString, IsUUID, MaxLength } from 'class-validator';
import { IsOmittable } from '../../../core/decorators/is-omittable.decorator';

const trim = ({ value }: { value: unknown }) => (typeof value === 'string' ? value.trim() : value);

export class CreateReleaseDto implements CreateReleaseRequest {
  @ApiProperty({ maxLength: 200, example: 'Soak runs 1–3, checked' })
  @Transform(trim)
  @IsString({ message: 'title must be text' })
  @IsNotEmpty({ message: 'title is required' })
  @MaxLength(200, { message: 'title must be at most 200 characters' })
  title: string;

  @ApiPropertyOptional({ maxLength: 5000 })
  @IsOptional()
  @IsString({ message: 'note must be text' })
  @MaxLength(5000, { message: 'note must be at most 5000 characters' })
  note?: string;

  @ApiProperty({ type: [String], description: 'Runs of this campaign whose data the release holds' })
  @IsArray({ message: 'runIds must be a list of run ids' })
  @ArrayMinSize(1, { message: 'runIds must list at least one run' })
  @ArrayMaxSize(500, { message: 'runIds may list at most 500 runs' })
  @ArrayUnique({ message: 'runIds must not list a run twice' })
  @IsUUID('all', { each: true, message: 'each of runIds must be a run id' })
  runIds: string[];

  @ApiPropertyOptional({ description: 'Lead only: sign it in the same call' })
  @IsOptional()
  @IsBoolean({ message: 'sign must be true or false' })
  sign?: boolean;
}

export class SignReleaseDto implements SignReleaseRequest {
  @ApiPropertyOptional({ maxLength: 5000 })
  @IsOmittable()
  @IsString({ message: 'note must be text' })
  @MaxLength(5000, { message: 'note must be at most 5000 characters' })
  note?: string;
}

export class DeclineReleaseDto implements DeclineReleaseRequest {
  @ApiProperty({ maxLength: 2000 })
  @Transform(trim)
  @IsString({ message: 'reason must be text' })
  @IsNotEmpty({ message: 'reason is required' })
  @MaxLength(2000, { message: 'reason must be at most 2000 characters' })
  reason: string;
}

export class OpenCorrectionDto implements OpenCorrectionRequest {
  @ApiProperty({ maxLength: 2000, description: 'Why the released data must change (goes to the audit trail)' })
  @Transform(trim)
  @IsString({ message: 'reason must be text' })
  @IsNotEmpty({ message: 'reason is required' })
  @MaxLength(2000, { message: 'reason must be at most 2000 characters' })
  reason: string;
}
