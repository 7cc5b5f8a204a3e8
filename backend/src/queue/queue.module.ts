import { Global, Module } from '@nestjs/common';
import { RunEventsService } from './run-events.service';
import { RunQueue } from './run-queue';

@Global()
@Module({ providers: [RunQueue, RunEventsService], exports: [RunQueue, RunEventsService] })
export class QueueModule {}
