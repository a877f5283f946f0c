import type { AnalysisKind, BalanceInput, StableValueInput, UpdateAnalysisRequest } from '@dialsheet/common';
import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { Transform } from 'class-transformer';
import { IsIn, IsInt, IsNotEmpty, IsObject, IsOptional, IsString, IsUUID, MaxLength, Min, ValidateIf } from 'class-validator';
import { trim } from '../../campaigns/dto/create-campaign.dto';
import { given } from '../../calibrations/dto/set-calibration.dto';

export const ANALYSIS_KINDS: readonly AnalysisKind[] = ['stable-value', 'balance'];

/** CreateAnalysisRequest (a union on kind): the input's content is checked by the service. */
export class CreateAnalysisDto {
  @ApiProperty({ enum: ANALYSIS_KINDS })
  @IsIn(ANALYSIS_KINDS as AnalysisKind[], { message: `kind must be one of ${ANALYSIS_KINDS.join(', ')}` })
  kind: AnalysisKind;

  @ApiProperty({ maxLength: 200, example: 'Run 1 warm-stream mass flow at 40 s' })
  @Transform(trim)
  @IsString({ message: 'name must be text' })
  @IsNotEmpty({ message: 'name is required' })
  @MaxLength(200, { message: 'name must be at most 200 characters' })
  name: string;

  @ApiPropertyOptional({ nullable: true, maxLength: 2000 })
  @ValidateIf(given)
  @IsString({ message: 'note must be text' })
  @MaxLength(2000, { message: 'note must be at most 2000 characters' })
  note?: string | null;

  @ApiProperty({ description: 'StableValueInput for kind stable-value, BalanceInput for kind balance' })
  @IsObject({ message: 'input must be an object' })
  input: StableValueInput | BalanceInput;
}

export class UpdateAnalysisDto implements UpdateAnalysisRequest {
  @ApiProperty({ description: 'The stored version this change replaces' })
  @IsInt({ message: 'baseVersion must be a whole number' })
  @Min(1, { message: 'baseVersion must be 1 or more' })
  baseVersion: number;

  @ApiPropertyOptional({ maxLength: 200 })
  @IsOptional()
  @Transform(trim)
  @IsString({ message: 'name must be text' })
  @IsNotEmpty({ message: 'name must not be empty' })
  @MaxLength(200, { message: 'name must be at most 200 characters' })
  name?: string;

  @ApiPropertyOptional({ nullable: true, maxLength: 2000 })
  @IsOptional()
  @ValidateIf(given)
  @IsString({ message: 'note must be text' })
  @MaxLength(2000, { message: 'note must be at most 2000 characters' })
  note?: string | null;

  @ApiPropertyOptional({ description: 'New inputs of the same kind; the analysis is recomputed' })
  @IsOptional()
  @IsObject({ message: 'input must be an object' })
  input?: StableValueInput | BalanceInput;

  @ApiPropertyOptional({ maxLength: 500 })
  @IsOptional()
  @IsString({ message: 'reason must be text' })
  @MaxLength(500, { message: 'reason must be at most 500 characters' })
  reason?: string;
}

export class AnalysesQueryDto {
  @ApiPropertyOptional({ description: 'Only analyses that use this run' })
  @IsOptional()
  @IsUUID('all', { message: 'runId must be a run id' })
  runId?: string;

  @ApiPropertyOptional({ enum: ANALYSIS_KINDS })
  @IsOptional()
  @IsIn(ANALYSIS_KINDS as AnalysisKind[], { message: `kind must be one of ${ANALYSIS_KINDS.join(', ')}` })
  kind?: AnalysisKind;
}
