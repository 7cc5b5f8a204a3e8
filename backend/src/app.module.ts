import { Module, type DynamicModule } from '@nestjs/common';
import { APP_FILTER } from '@nestjs/core';
import { AuthModule } from './auth/auth.module';
import { ApiExceptionFilter } from './common/api-exception.filter';
import { ConfigModule } from './config/config.module';
import type { KilnConfig } from './config/config.schema';
import { DatabaseModule } from './database/database.module';
import { HealthModule } from './health/health.module';
import { RedisModule } from './redis/redis.module';
import { UsersModule } from './users/users.module';
import { CheckpointsModule } from './checkpoints/checkpoints.module';
import { QueueModule } from './queue/queue.module';
import { RunsModule } from './runs/runs.module';
import { SchedulerModule } from './scheduler/scheduler.module';
import { StudiesModule } from './studies/studies.module';
import { SweepsModule } from './sweeps/sweeps.module';
import { WorkersModule } from './workers/workers.module';
import { AdminModule } from './admin/admin.module';
import { InvitationsModule } from './invitations/invitations.module';
import { MailModule } from './mail/mail.module';
import { CandidatesModule } from './candidates/candidates.module';
import { UploadsModule } from './uploads/uploads.module';
import { NotificationsModule } from './notifications/notifications.module';
import { ApiTokensModule } from './tokens/api-tokens.module';
import { AuditModule } from './audit/audit.module';
import { QuotasModule } from './quotas/quotas.module';

@Module({})
export class AppModule {
  static forConfig(config: KilnConfig): DynamicModule {
    return {
      module: AppModule,
      imports: [
        ConfigModule.forRoot(config),
        DatabaseModule,
        RedisModule,
        QueueModule,
        AuditModule,
        MailModule,
        NotificationsModule,
        ApiTokensModule,
        InvitationsModule,
        QuotasModule,
        AdminModule,
        AuthModule,
        UsersModule,
        HealthModule,
        StudiesModule,
        SweepsModule,
        RunsModule,
        CheckpointsModule,
        SchedulerModule,
        WorkersModule,
        UploadsModule,
        CandidatesModule,
      ],
      providers: [{ provide: APP_FILTER, useClass: ApiExceptionFilter }],
    };
  }
}
