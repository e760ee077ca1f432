import { Module } from '@nestjs/common';
import { EvaluationController } from './evaluation.controller';
import { EvaluationService } from './evaluation.service';
import { SheetEvaluator } from './sheet-evaluator';

@Module({ controllers: [EvaluationController], providers: [EvaluationService, SheetEvaluator], exports: [EvaluationService, SheetEvaluator] })
export class EvaluationModule {}
