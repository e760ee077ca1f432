import { Module } from '@nestjs/common';
import { FilesModule } from '../files/files.module';
import { SheetsModule } from '../sheets/sheets.module';
import { AttachmentsController } from './attachments.controller';
import { AttachmentsService } from './attachments.service';

@Module({ imports: [SheetsModule, FilesModule], controllers: [AttachmentsController], providers: [AttachmentsService] })
export class AttachmentsModule {}
