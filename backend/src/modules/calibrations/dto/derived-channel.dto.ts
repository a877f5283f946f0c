import type { CreateDerivedChannelRequest, UpdateDerivedChannelRequest } from '@dialsheet/common';
import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { Transform } from 'class-transformer';
import { IsInt, IsNotEmpty, IsObject, IsOptional, IsString, Matches, MaxLength, Min } from 'class-validator';
import { trim } from '../../campaigns/dto/create-campaign.dto';

/** A mathjs symbol: what the expressions of other derived channels can name. */
const SYMBOL = /^[A-Za-z_][A-Za-z0-9_]*$/;
const SYMBOL_MESSAGE = 'symbol must start with a letter or _ and hold only letters, digits and _ (it is used in expressions)';

export class CreateDerivedChannelDto implements CreateDerivedChannelRequest {
  @ApiProperty({ maxLength: 200, example: 'Warm stream heat given up' })
  @Transform(trim)
  @IsString({ message: 'name must be text' })
  @IsNotEmpty({ message: 'name is required' })
  @MaxLength(200, { message: 'name must be at most 200 characters' })
  name: string;

  @ApiProperty({ maxLength: 40, example: 'Q_warm' })
  @Transform(trim)
  @IsString({ message: 'symbol must be text' })
  @Matches(SYMBOL, { message: SYMBOL_MESSAGE })
  @MaxLength(40, { message: 'symbol must be at most 40 characters' })
  symbol: string;

  @ApiProperty({ maxLength: 40, example: 'W' })
  @Transform(trim)
  @IsString({ message: 'unit must be text' })
  @IsNotEmpty({ message: 'unit is required' })
  @MaxLength(40, { message: 'unit must be at most 40 characters' })
  unit: string;

  @ApiProperty({ maxLength: 500, example: 'V / 60 * cp * (T1 - T2)' })
  @IsString({ message: 'expression must be text' })
  @IsNotEmpty({ message: 'expression is required' })
  expression: string;

  @ApiPropertyOptional({ example: { cp: 1.006 }, description: 'Named numbers the expression may use' })
  @IsOptional()
  @IsObject({ message: 'constants must be an object of names and numbers' })
  constants?: Record<string, number>;
}

export class UpdateDerivedChannelDto implements UpdateDerivedChannelRequest {
  @ApiPropertyOptional({ maxLength: 200 })
  @IsOptional()
  @Transform(trim)
  @IsString({ message: 'name must be text' })
  @IsNotEmpty({ message: 'name must not be empty' })
  @MaxLength(200, { message: 'name must be at most 200 characters' })
  name?: string;

  @ApiPropertyOptional({ maxLength: 40 })
  @IsOptional()
  @Transform(trim)
  @IsString({ message: 'symbol must be text' })
  @Matches(SYMBOL, { message: SYMBOL_MESSAGE })
  @MaxLength(40, { message: 'symbol must be at most 40 characters' })
  symbol?: string;

  @ApiPropertyOptional({ maxLength: 40 })
  @IsOptional()
  @Transform(trim)
  @IsString({ message: 'unit must be text' })
  @IsNotEmpty({ message: 'unit must not be empty' })
  @MaxLength(40, { message: 'unit must be at most 40 characters' })
  unit?: string;

  @ApiPropertyOptional({ maxLength: 500 })
  @IsOptional()
  @IsString({ message: 'expression must be text' })
  @IsNotEmpty({ message: 'expression must not be empty' })
  expression?: string;

  @ApiPropertyOptional()
  @IsOptional()
  @IsObject({ message: 'constants must be an object of names and numbers' })
  constants?: Record<string, number>;

  @ApiProperty({ description: 'The stored version this change replaces' })
  @IsInt({ message: 'baseVersion must be a whole number' })
  @Min(1, { message: 'baseVersion must be 1 or more' })
  baseVersion: number;

  @ApiPropertyOptional({ maxLength: 500 })
  @IsOptional()
  @IsString({ message: 'reason must be text' })
  @MaxLength(500, { message: 'reason must be at most 500 characters' })
  reason?: string;
}
