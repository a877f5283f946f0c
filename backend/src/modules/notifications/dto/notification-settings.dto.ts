import type { NotificationSettings } from '@dialsheet/common';
import { ApiPropertyOptional } from '@nestjs/swagger';
import { IsBoolean, IsOptional } from 'class-validator';

/** PUT body: any subset of the kinds, each on (true) or off (false); unknown kinds are a 400. */
export class NotificationSettingsDto implements Partial<NotificationSettings> {
  @ApiPropertyOptional({ description: 'A sheet is assigned to me' })
  @IsOptional()
  @IsBoolean({ message: 'sheet-assigned must be true or false' })
  'sheet-assigned'?: boolean;

  @ApiPropertyOptional({ description: 'A pass of a sheet I oversee is finished' })
  @IsOptional()
  @IsBoolean({ message: 'pass-finished must be true or false' })
  'pass-finished'?: boolean;

  @ApiPropertyOptional({ description: 'Mismatches wait for my resolution' })
  @IsOptional()
  @IsBoolean({ message: 'mismatches-waiting must be true or false' })
  'mismatches-waiting'?: boolean;

  @ApiPropertyOptional({ description: 'A release of my campaign is published' })
  @IsOptional()
  @IsBoolean({ message: 'release-published must be true or false' })
  'release-published'?: boolean;
}
