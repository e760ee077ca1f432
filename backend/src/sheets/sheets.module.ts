import { Module } from '@nestjs/common';
import { EvaluationModule } from '../evaluation/evaluation.module';
import { ProjectsModule } from '../projects/projects.module';
import { TemplatesModule } from '../templates/templates.module';
import { TemplatesController } from '../templates/templates.controller';
import { SheetsController } from './sheets.controller';
import { SheetsService } from './sheets.service';

@Module({ imports: [ProjectsModule, TemplatesModule, EvaluationModule], controllers: [SheetsController, TemplatesController], providers: [SheetsService], exports: [SheetsService] })
export class SheetsModule {}
