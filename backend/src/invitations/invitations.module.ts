import { Module } from '@nestjs/common';
import { AuthModule } from '../auth/auth.module';
import { StudiesModule } from '../studies/studies.module';
import { InvitationsController } from './invitations.controller';
import { InvitationsService } from './invitations.service';

@Module({ imports: [AuthModule, StudiesModule], controllers: [InvitationsController], providers: [InvitationsService] })
export class InvitationsModule {}
