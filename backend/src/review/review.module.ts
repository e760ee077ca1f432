import { Module } from '@nestjs/common';
import { AuditModule } from '../audit/audit.module';
import { EvaluationModule } from '../evaluation/evaluation.module';
import { NotificationsModule } from '../notifications/notifications.module';
import { SheetsModule } from '../sheets/sheets.module';
import { QueriesService } from './queries.service';
import { ReviewController } from './review.controller';
import { RevisionsService } from './revisions.service';
import { WorkflowService } from './workflow.service';

@Module({
  imports: [SheetsModule, EvaluationModule, NotificationsModule, AuditModule],
  controllers: [ReviewController],
  providers: [WorkflowService, QueriesService, RevisionsService],
  exports: [RevisionsService],
})
export class ReviewModule {}
