import { Module } from '@nestjs/common';
import { RunsModule } from '../runs/runs.module';
import { StudiesModule } from '../studies/studies.module';
import { SweepsController } from './sweeps.controller';
import { SweepsService } from './sweeps.service';

@Module({ imports: [RunsModule, StudiesModule], controllers: [SweepsController], providers: [SweepsService] })
export class SweepsModule {}
