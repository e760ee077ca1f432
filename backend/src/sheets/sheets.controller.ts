import { Readable } from 'node:stream';
import {
  Body,
  Controller,
  Delete,
  Get,
  HttpCode,
  Param,
  ParseIntPipe,
  ParseUUIDPipe,
  Patch,
  Post,
  Put,
  Query,
  StreamableFile,
  UploadedFile,
  UseInterceptors,
} from '@nestjs/common';
import { FileInterceptor } from '@nestjs/platform-express';
import type { ImportResultDto, SheetFile, SheetSummaryDto } from '@ampwright/common';
import { Roles } from '../core/decorators/access.decorator';
import { CurrentAuth } from '../core/decorators/current-auth.decorator';
import type { AuthContext } from '../core/guards/auth.guard';
import { MEMBER_ROLES, SHEET_EDITORS } from '../core/roles';
import { UPLOAD_OPTIONS } from '../files/uploads';
import { AddCellDto, CoPreparersDto, CreateSheetDto, ImportCsvDto, MoveCellDto, UpdateCellDto, UpdateSheetDto } from './dto/sheet.dto';
import { SheetsService, type SaveResult, type SheetView } from './sheets.service';

@Controller()
export class SheetsController {
  constructor(private readonly sheets: SheetsService) {}

  @Roles(...MEMBER_ROLES)
  @Get('projects/:projectId/sheets')
  list(@CurrentAuth() auth: AuthContext, @Param('projectId', ParseUUIDPipe) projectId: string): Promise<SheetSummaryDto[]> {
    return this.sheets.list(auth, projectId);
  }

  /** A blank sheet, one from a template (`templateId`), or an imported sheet file (`sheet`). */
  @Roles(...SHEET_EDITORS)
  @Post('projects/:projectId/sheets')
  create(@CurrentAuth() auth: AuthContext, @Param('projectId', ParseUUIDPipe) projectId: string, @Body() dto: CreateSheetDto): Promise<SheetView> {
    return this.sheets.create(auth, projectId, dto);
  }

  /**
   * The sheet (`SheetView`), its stored results sent as they are kept rather than parsed and serialised again.
   * @answers SheetDto
   */
  @Roles(...MEMBER_ROLES)
  @Get('sheets/:id')
  async get(@CurrentAuth() auth: AuthContext, @Param('id', ParseUUIDPipe) id: string): Promise<StreamableFile> {
    const parts = await this.sheets.getJson(auth, id);
    // Sent part by part: joining them would copy the kept cells into a new buffer on every read.
    return new StreamableFile(Readable.from(parts), { type: 'application/json; charset=utf-8', length: parts.reduce((n, p) => n + p.length, 0) });
  }

  /** The sheet in the ampwright.sheet/1 file format. */
  @Roles(...MEMBER_ROLES)
  @Get('sheets/:id/export')
  export(@CurrentAuth() auth: AuthContext, @Param('id', ParseUUIDPipe) id: string): Promise<SheetFile> {
    return this.sheets.export(auth, id);
  }

  @Roles(...SHEET_EDITORS)
  @Patch('sheets/:id')
  update(@CurrentAuth() auth: AuthContext, @Param('id', ParseUUIDPipe) id: string, @Body() dto: UpdateSheetDto): Promise<SaveResult> {
    return this.sheets.update(auth, id, dto);
  }

  /** The preparer names the revision's co-preparers (who may edit it, and then neither check nor approve it). */
  @Roles(...SHEET_EDITORS)
  @Put('sheets/:id/co-preparers')
  setCoPreparers(@CurrentAuth() auth: AuthContext, @Param('id', ParseUUIDPipe) id: string, @Body() dto: CoPreparersDto): Promise<SheetView> {
    return this.sheets.setCoPreparers(auth, id, dto);
  }

  @Roles(...SHEET_EDITORS)
  @Delete('sheets/:id')
  @HttpCode(204)
  remove(@CurrentAuth() auth: AuthContext, @Param('id', ParseUUIDPipe) id: string): Promise<void> {
    return this.sheets.remove(auth, id);
  }

  @Roles(...SHEET_EDITORS)
  @Post('sheets/:id/cells')
  addCell(@CurrentAuth() auth: AuthContext, @Param('id', ParseUUIDPipe) id: string, @Body() dto: AddCellDto): Promise<SaveResult> {
    return this.sheets.addCell(auth, id, dto);
  }

  /**
   * A CSV of measurements (header `h, I_h [A]`) as a new table cell; multipart field "file", at most 25 MB.
   * The delimiter (comma, semicolon, tab, bar) and the decimal mark are detected, and returned in `detected`.
   */
  @Roles(...SHEET_EDITORS)
  @Post('sheets/:id/cells/import-csv')
  @UseInterceptors(FileInterceptor('file', UPLOAD_OPTIONS))
  importCsv(
    @CurrentAuth() auth: AuthContext,
    @Param('id', ParseUUIDPipe) id: string,
    @UploadedFile() file: Express.Multer.File | undefined,
    @Body() dto: ImportCsvDto,
  ): Promise<ImportResultDto> {
    return this.sheets.importCsv(auth, id, file, dto);
  }

  @Roles(...SHEET_EDITORS)
  @Patch('sheets/:id/cells/:cellId')
  updateCell(
    @CurrentAuth() auth: AuthContext,
    @Param('id', ParseUUIDPipe) id: string,
    @Param('cellId', ParseUUIDPipe) cellId: string,
    @Body() dto: UpdateCellDto,
  ): Promise<SaveResult> {
    return this.sheets.updateCell(auth, id, cellId, dto);
  }

  @Roles(...SHEET_EDITORS)
  @Post('sheets/:id/cells/:cellId/move')
  @HttpCode(200)
  moveCell(
    @CurrentAuth() auth: AuthContext,
    @Param('id', ParseUUIDPipe) id: string,
    @Param('cellId', ParseUUIDPipe) cellId: string,
    @Body() dto: MoveCellDto,
  ): Promise<SaveResult> {
    return this.sheets.moveCell(auth, id, cellId, dto);
  }

  @Roles(...SHEET_EDITORS)
  @Delete('sheets/:id/cells/:cellId')
  deleteCell(
    @CurrentAuth() auth: AuthContext,
    @Param('id', ParseUUIDPipe) id: string,
    @Param('cellId', ParseUUIDPipe) cellId: string,
    @Query('version', new ParseIntPipe({ errorHttpStatusCode: 400 })) version: number,
  ): Promise<SaveResult> {
    return this.sheets.deleteCell(auth, id, cellId, version);
  }
}
