import type { PassFinish, Reading, ReadingPass, Resolution, SaveRowResponse, SheetMismatches } from '@dialsheet/common';
import { BadRequestException, Body, Controller, Get, Header, HttpCode, Param, ParseUUIDPipe, Post, Put, Query } from '@nestjs/common';
import { ApiBearerAuth, ApiConflictResponse, ApiOperation, ApiQuery, ApiTags } from '@nestjs/swagger';
import type { AuthUser } from '../../core/auth-user';
import { CurrentUser } from '../../core/decorators/current-user.decorator';
import { ResolveCellDto } from './dto/resolve-cell.dto';
import { SaveRowDto } from './dto/save-row.dto';
import { ReadingsService } from './readings.service';
import { SheetGridService } from './sheet-grid.service';

function passOf(value: unknown, field: string): ReadingPass {
  if (value === '1' || value === 1) return 1;
  if (value === '2' || value === 2) return 2;
  throw new BadRequestException(`${field} must be 1 or 2`);
}

function rowOf(value: string): number {
  if (!/^\d{1,9}$/.test(value)) throw new BadRequestException(`rowIndex must be a whole number of 0 or more, got ${value}`);
  return Number(value);
}

@ApiTags('readings')
@ApiBearerAuth()
@Controller('sheets/:sheetId')
export class ReadingsController {
  constructor(
    private readonly readings: ReadingsService,
    private readonly sheetGrid: SheetGridService,
  ) {}

  @Put('rows/:rowIndex')
  @ApiOperation({
    summary: 'Save one row of one pass (its assigned reader or checker)',
    description:
      'Idempotent per (sheet, row, channel, pass): resending the same text and frame changes nothing. A change must name the stored version in baseVersion.',
  })
  @ApiConflictResponse({ description: 'A reading was changed elsewhere; the body carries the stored one in `current`' })
  saveRow(
    @CurrentUser() user: AuthUser,
    @Param('sheetId') sheetId: string,
    @Param('rowIndex') rowIndex: string,
    @Body() dto: SaveRowDto,
  ): Promise<SaveRowResponse> {
    return this.readings.saveRow(user, sheetId, rowOf(rowIndex), dto);
  }

  @Get('readings')
  @ApiQuery({ name: 'pass', enum: ['1', '2'] })
  @ApiOperation({ summary: 'Entries of one pass (its owner, Lead, Engineers; the checker sees pass 1 only after finishing pass 2)' })
  list(@CurrentUser() user: AuthUser, @Param('sheetId') sheetId: string, @Query('pass') pass: string): Promise<Reading[]> {
    return this.readings.list(user, sheetId, passOf(pass, 'pass'));
  }

  @Get('grid')
  @ApiOperation({
    summary: 'The sheet table in one answer: row times, channels and their limits, the entries of the passes the viewer may see as column-wise arrays, and resolutions',
    description:
      'A pass holds only the cells with an entry, in no particular order, each with its cell index (row × channels + channel position); common/ layOutSheetGrid lays it out. Same rules as the readings and mismatch routes: a pass or the resolutions the viewer may not see are null (the checker sees pass 1 only after finishing pass 2); 403 when neither pass may be seen.',
  })
  // The answer is JSON text already (see SheetGridService): sent as it is, labelled as JSON.
  @Header('Content-Type', 'application/json; charset=utf-8')
  grid(@CurrentUser() user: AuthUser, @Param('sheetId') sheetId: string): Promise<string> {
    return this.sheetGrid.grid(user, sheetId);
  }

  @Post('passes/:pass/finish')
  @HttpCode(200)
  @ApiOperation({ summary: 'Mark a pass finished once every cell has an entry (its assigned reader or checker)' })
  finish(@CurrentUser() user: AuthUser, @Param('sheetId') sheetId: string, @Param('pass') pass: string): Promise<PassFinish> {
    return this.readings.finish(user, sheetId, passOf(pass, 'pass'));
  }

  @Get('mismatches')
  @ApiOperation({
    summary: 'Cells where the passes differ or either is flagged, with resolutions and mismatch rates',
    description: 'Lead and Engineers at any time; the sheet’s reader and checker once pass 2 is finished.',
  })
  mismatches(@CurrentUser() user: AuthUser, @Param('sheetId') sheetId: string): Promise<SheetMismatches> {
    return this.readings.mismatches(user, sheetId);
  }

  @Put('resolutions/:rowIndex/:channelId')
  @ApiOperation({ summary: 'Record the agreed value of a mismatched cell with a reason (the checker after pass 2, or a Lead)' })
  @ApiConflictResponse({ description: 'Not a mismatch, pass 2 not finished, locked, or a stale change (`current` holds the stored resolution)' })
  resolve(
    @CurrentUser() user: AuthUser,
    @Param('sheetId') sheetId: string,
    @Param('rowIndex') rowIndex: string,
    @Param('channelId', new ParseUUIDPipe({ exceptionFactory: () => new BadRequestException('channelId must be a channel id (UUID)') }))
    channelId: string,
    @Body() dto: ResolveCellDto,
  ): Promise<Resolution> {
    return this.readings.resolve(user, sheetId, rowOf(rowIndex), channelId, dto);
  }
}
