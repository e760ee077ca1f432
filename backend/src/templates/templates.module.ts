import { Module } from '@nestjs/common';
import { TemplatesService } from './templates.service';

/** The templates' service; its controller sits in SheetsModule, since saving a template reads a sheet. */
@Module({ providers: [TemplatesService], exports: [TemplatesService] })
export class TemplatesModule {}
