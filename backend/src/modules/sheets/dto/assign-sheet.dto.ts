import type { AssignSheetRequest } from '@dialsheet/common';
import { ApiPropertyOptional } from '@nestjs/swagger';
import { IsUUID, ValidateIf } from 'class-validator';

const given = (_o: object, value: unknown) => value !== null && value !== undefined;

/** Absent: unchanged; null: nobody. */
export class AssignSheetDto implements AssignSheetRequest {
  @ApiPropertyOptional({ format: 'uuid', nullable: true, description: 'A member with the reader role' })
  @ValidateIf(given)
  @IsUUID('all', { message: 'readerId must be a user id (UUID) or null' })
  readerId?: string | null;

  @ApiPropertyOptional({ format: 'uuid', nullable: true, description: 'A member with the checker role, not the reader' })
  @ValidateIf(given)
  @IsUUID('all', { message: 'checkerId must be a user id (UUID) or null' })
  checkerId?: string | null;
}
