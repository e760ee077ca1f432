import { Module } from '@nestjs/common';
import { EvaluationModule } from '../evaluation/evaluation.module';
import { FilesModule } from '../files/files.module';
import { ReviewModule } from '../review/review.module';
import { CertificatesService } from './certificates.service';
import { PackagesController } from './packages.controller';
import { PackagesService } from './packages.service';

@Module({
  imports: [EvaluationModule, FilesModule, ReviewModule],
  controllers: [PackagesController],
  providers: [PackagesService, CertificatesService],
  exports: [PackagesService],
})
export class PackagesModule {}
