import { Inject, Injectable, Logger, type OnApplicationBootstrap, type OnApplicationShutdown } from '@nestjs/common';
import nodemailer, { type Transporter } from 'nodemailer';
import { KILN_CONFIG } from '../config/config.module';
import type { KilnConfig } from '../config/config.schema';
import { DB, type Db } from '../database/database.module';

const POLL_MS = 1_000;
const MAX_ATTEMPTS = 20;

/**
 * Delivers the outbox over SMTP (nodemailer). Each message is taken with
 * FOR UPDATE SKIP LOCKED, so several API replicas never send one twice.
 */
@Injectable()
export class MailSenderService implements OnApplicationBootstrap, OnApplicationShutdown {
  private readonly logger = new Logger('mail');
  private readonly transport: Transporter;
  private timer: NodeJS.Timeout | undefined;
  private busy = false;

  constructor(
    @Inject(KILN_CONFIG) private readonly config: KilnConfig,
    @Inject(DB) private readonly db: Db,
  ) {
    this.transport = nodemailer.createTransport(config.SMTP_URL);
  }

  onApplicationBootstrap(): void {
    this.timer = setInterval(() => void this.flush(), POLL_MS);
    this.timer.unref();
  }

  async onApplicationShutdown(): Promise<void> {
    clearInterval(this.timer);
    while (this.busy) await new Promise((resolve) => setTimeout(resolve, 20));
    this.transport.close();
  }

  /** Sends what is pending; returns how many were sent. */
  async flush(): Promise<number> {
    if (this.busy) return 0;
    this.busy = true;
    let sent = 0;
    try {
      for (;;) {
        const delivered = await this.db.transaction().execute(async (trx) => {
          const mail = await trx
            .selectFrom('mail_outbox')
            .selectAll()
            .where('sent_at', 'is', null)
            .where('attempts', '<', MAX_ATTEMPTS)
            .orderBy('created_at')
            .limit(1)
            .forUpdate()
            .skipLocked()
            .executeTakeFirst();
          if (!mail) return undefined;
          try {
            await this.transport.sendMail({ from: this.config.KILN_MAIL_FROM, to: mail.to_address, subject: mail.subject, text: mail.body_text });
            await trx.updateTable('mail_outbox').set({ sent_at: new Date(), attempts: mail.attempts + 1, last_error: null }).where('id', '=', mail.id).execute();
            return true;
          } catch (error) {
            await trx
              .updateTable('mail_outbox')
              .set({ attempts: mail.attempts + 1, last_error: error instanceof Error ? error.message : String(error) })
              .where('id', '=', mail.id)
              .execute();
            return false;
          }
        });
        if (delivered === undefined || delivered === false) break;
        sent++;
      }
    } catch (error) {
      this.logger.warn(`mail delivery paused: ${error instanceof Error ? error.message : String(error)}`);
    } finally {
      this.busy = false;
    }
    return sent;
  }
}
