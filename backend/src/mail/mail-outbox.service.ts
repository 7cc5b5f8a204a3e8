import { Injectable } from '@nestjs/common';
import type { Kysely } from 'kysely';
import type { Database } from '@kiln/shared/db';

export interface OutgoingMail {
  /** Same key, same message: a second enqueue (a retried job, a repeated event) is dropped. */
  dedupeKey: string;
  to: string;
  subject: string;
  text: string;
}

/** Writes e-mails into the outbox inside the caller's transaction; the sender delivers them. */
@Injectable()
export class MailOutboxService {
  async enqueue(executor: Kysely<Database>, mail: OutgoingMail): Promise<boolean> {
    const result = await executor
      .insertInto('mail_outbox')
      .values({ dedupe_key: mail.dedupeKey, to_address: mail.to, subject: mail.subject, body_text: mail.text })
      .onConflict((oc) => oc.column('dedupe_key').doNothing())
      .executeTakeFirst();
    return Number(result.numInsertedOrUpdatedRows ?? 0) > 0;
  }
}
