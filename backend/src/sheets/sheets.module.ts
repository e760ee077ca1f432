import { MikroOrmModule } from '@mikro-orm/nestjs';
import { Module } from '@nestjs/common';
import { Cell } from './entities/cell.entity';
import { Sheet } from './entities/sheet.entity';
import { EvaluationModule } from '../evaluation/evaluation.module';
import { ProjectsModule } from '../projects/projects.module';
import { TemplatesModule } from '../templates/templates.module';
import { TemplatesController } from '../templates/templates.controller';
import { SheetsController } from './sheets.controller';
import { SheetsService } from './sheets.service';
import { SheetViewCache } from './sheet-view-cache';

@Module({
  imports: [MikroOrmModule.forFeature([Sheet, Cell]), ProjectsModule, TemplatesModule, EvaluationModule],
  controllers: [SheetsController, TemplatesController],
  providers: [SheetsService, SheetViewCache],
  exports: [SheetsService],
})
export class SheetsModule {}
