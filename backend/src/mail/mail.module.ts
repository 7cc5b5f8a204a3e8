import { Global, Module } from '@nestjs/common';
import { MailOutboxService } from './mail-outbox.service';
import { MailSenderService } from './mail-sender.service';
import { OutboxController } from './outbox.controller';

@Global()
@Module({ controllers: [OutboxController], providers: [MailOutboxService, MailSenderService], exports: [MailOutboxService, MailSenderService] })
export class MailModule {}
