import { Body, Controller, Delete, Get, HttpCode, Param, ParseUUIDPipe, Post } from '@nestjs/common';
import { Transform } from 'class-transformer';
import { IsOptional, IsString, IsUUID, Length } from 'class-validator';
import { Roles } from '../core/decorators/access.decorator';
import { CurrentAuth } from '../core/decorators/current-auth.decorator';
import type { AuthContext } from '../core/guards/auth.guard';
import { MEMBER_ROLES, SHEET_EDITORS } from '../core/roles';
import { SheetsService } from '../sheets/sheets.service';
import { TemplatesService, type TemplateSummary } from './templates.service';

export class SaveTemplateDto {
  @IsUUID('4', { message: 'sheetId must be the id of a sheet' })
  sheetId: string;

  @IsOptional()
  @Transform(({ value }) => (typeof value === 'string' ? value.trim() : value))
  @IsString()
  @Length(1, 200, { message: 'title must be 1 to 200 characters' })
  title?: string;
}

@Controller('templates')
export class TemplatesController {
  constructor(
    private readonly templates: TemplatesService,
    private readonly sheets: SheetsService,
  ) {}

  @Roles(...MEMBER_ROLES)
  @Get()
  list(@CurrentAuth() auth: AuthContext): Promise<TemplateSummary[]> {
    return this.templates.list(auth);
  }

  /** Saves a sheet of the firm (its cells, without results) as one of the firm's templates. */
  @Roles(...SHEET_EDITORS)
  @Post()
  async save(@CurrentAuth() auth: AuthContext, @Body() dto: SaveTemplateDto): Promise<TemplateSummary> {
    const file = await this.sheets.export(auth, dto.sheetId);
    return this.templates.save(auth, dto.title ?? file.title, file);
  }

  @Roles(...SHEET_EDITORS)
  @Delete(':id')
  @HttpCode(204)
  remove(@CurrentAuth() auth: AuthContext, @Param('id', ParseUUIDPipe) id: string): Promise<void> {
    return this.templates.remove(auth, id);
  }
}
