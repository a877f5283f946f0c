import type { Sheet, SheetRow } from '@dialsheet/common';
import { Body, Controller, Delete, Get, HttpCode, Param, Patch, Post, Put } from '@nestjs/common';
import { ApiBearerAuth, ApiNoContentResponse, ApiOperation, ApiTags } from '@nestjs/swagger';
import type { AuthUser } from '../../core/auth-user';
import { CurrentUser } from '../../core/decorators/current-user.decorator';
import { AssignSheetDto } from './dto/assign-sheet.dto';
import { CreateSheetDto } from './dto/create-sheet.dto';
import { UpdateSheetDto } from './dto/update-sheet.dto';
import { SheetsService } from './sheets.service';

@ApiTags('sheets')
@ApiBearerAuth()
@Controller('runs/:runId/sheets')
export class RunSheetsController {
  constructor(private readonly sheets: SheetsService) {}

  @Get()
  @ApiOperation({ summary: 'Sheets of a run, oldest first (any member)' })
  list(@CurrentUser() user: AuthUser, @Param('runId') runId: string): Promise<Sheet[]> {
    return this.sheets.list(user, runId);
  }

  @Post()
  @ApiOperation({
    summary: 'Plan a sheet on the run (lead, engineer)',
    description: 'Times are test times: the run needs its sync marks, and the end must fall within the recording.',
  })
  create(@CurrentUser() user: AuthUser, @Param('runId') runId: string, @Body() dto: CreateSheetDto): Promise<Sheet> {
    return this.sheets.create(user, runId, dto);
  }
}

@ApiTags('sheets')
@ApiBearerAuth()
@Controller('sheets')
export class SheetsController {
  constructor(private readonly sheets: SheetsService) {}

  @Get(':sheetId')
  @ApiOperation({ summary: 'One sheet with its progress per pass (any member)' })
  get(@CurrentUser() user: AuthUser, @Param('sheetId') sheetId: string): Promise<Sheet> {
    return this.sheets.get(user, sheetId);
  }

  @Get(':sheetId/rows')
  @ApiOperation({ summary: 'The sheet’s rows: index and test time of each, from start to end (any member)' })
  rows(@CurrentUser() user: AuthUser, @Param('sheetId') sheetId: string): Promise<SheetRow[]> {
    return this.sheets.rows(user, sheetId);
  }

  @Patch(':sheetId')
  @ApiOperation({ summary: 'Change a sheet’s name, times, interval or channels (lead, engineer)' })
  update(@CurrentUser() user: AuthUser, @Param('sheetId') sheetId: string, @Body() dto: UpdateSheetDto): Promise<Sheet> {
    return this.sheets.update(user, sheetId, dto);
  }

  @Delete(':sheetId')
  @HttpCode(204)
  @ApiNoContentResponse({ description: 'The sheet is gone' })
  @ApiOperation({ summary: 'Delete a sheet (lead, engineer)' })
  remove(@CurrentUser() user: AuthUser, @Param('sheetId') sheetId: string): Promise<void> {
    return this.sheets.remove(user, sheetId);
  }

  @Put(':sheetId/assignment')
  @ApiOperation({
    summary: 'Assign the reader and the checker (lead, engineer)',
    description: 'Two different members, with the reader and checker roles; each newly assigned person gets an e-mail with a link.',
  })
  assign(@CurrentUser() user: AuthUser, @Param('sheetId') sheetId: string, @Body() dto: AssignSheetDto): Promise<Sheet> {
    return this.sheets.assign(user, sheetId, dto);
  }
}
