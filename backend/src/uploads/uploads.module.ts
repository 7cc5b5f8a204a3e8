import { Module } from '@nestjs/common';
import { RunsModule } from '../runs/runs.module';
import { StudiesModule } from '../studies/studies.module';
import { UploadsController } from './uploads.controller';
import { UploadsService } from './uploads.service';

@Module({ imports: [RunsModule, StudiesModule], controllers: [UploadsController], providers: [UploadsService] })
export class UploadsModule {}
