import { Module } from '@nestjs/common';
import { AuthModule } from '../auth/auth.module';
import { StudiesModule } from '../studies/studies.module';
import { UsersModule } from '../users/users.module';
import { EventTicketService } from './event-ticket.service';
import { RunsController } from './runs.controller';
import { RunsRepository } from './runs.repository';
import { RunsService } from './runs.service';

@Module({
  imports: [AuthModule, StudiesModule, UsersModule],
  controllers: [RunsController],
  providers: [RunsRepository, RunsService, EventTicketService],
  exports: [RunsRepository, RunsService],
})
export class RunsModule {}
