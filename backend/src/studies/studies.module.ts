import { Module } from '@nestjs/common';
import { StudiesController } from './studies.controller';
import { StudiesRepository } from './studies.repository';
import { StudiesService } from './studies.service';
import { StudyAccessService } from './study-access.service';

@Module({
  controllers: [StudiesController],
  providers: [StudiesRepository, StudiesService, StudyAccessService],
  exports: [StudiesRepository, StudyAccessService],
})
export class StudiesModule {}
