import { Module } from '@nestjs/common';
import { RunsModule } from '../runs/runs.module';
import { StudiesModule } from '../studies/studies.module';
import { CheckpointsController } from './checkpoints.controller';
import { CheckpointsService } from './checkpoints.service';

@Module({ imports: [RunsModule, StudiesModule], controllers: [CheckpointsController], providers: [CheckpointsService], exports: [CheckpointsService] })
export class CheckpointsModule {}
