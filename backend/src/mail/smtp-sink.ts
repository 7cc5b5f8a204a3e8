import { SMTPServer, type SMTPServerAddress } from 'smtp-server';
import type { Kysely } from 'kysely';
import type { Database } from '@kiln/shared/db';

/** Largest message the sink accepts (bytes). */
export const SINK_MAX_MESSAGE_BYTES = 5 * 1024 * 1024;

/** The decoded Subject header of a raw message (RFC 2047 encoded words included). */
export function subjectOf(raw: string): string {
  const headerEnd = raw.search(/\r?\n\r?\n/);
  const headers = (headerEnd === -1 ? raw : raw.slice(0, headerEnd)).replace(/\r?\n[ \t]+/g, ' ');
  const match = /^subject:[ \t]*(.*)$/im.exec(headers);
  if (!match) return '(no subject)';
  // Whitespace between adjacent encoded words is not part of the text (RFC 2047, section 6.2).
  return match[1].replace(/(\?=)\s+(?==\?)/g, '$1').replace(/=\?([^?]+)\?([bBqQ])\?([^?]*)\?=/g, (_all, charset: string, encoding: string, text: string) => {
    const bytes =
      encoding.toUpperCase() === 'B'
        ? Buffer.from(text, 'base64')
        : Buffer.from(text.replace(/_/g, ' ').replace(/=([0-9A-Fa-f]{2})/g, (_m, hex: string) => String.fromCharCode(parseInt(hex, 16))), 'latin1');
    return bytes.toString(/utf-?8/i.test(charset) ? 'utf8' : 'latin1');
  });
}

const addressOf = (address: SMTPServerAddress | false): string => (address ? address.address : '');

/**
 * The local stand-in for a mail service: accepts every message on 127.0.0.1
 * and stores it in PostgreSQL, where the outbox page shows it.
 */
export function createSmtpSink(db: Kysely<Database>): SMTPServer {
  return new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    size: SINK_MAX_MESSAGE_BYTES,
    banner: 'Kiln local mail sink',
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (chunk: Buffer) => chunks.push(chunk));
      stream.on('end', () => {
        if ((stream as unknown as { sizeExceeded?: boolean }).sizeExceeded) {
          callback(Object.assign(new Error('message too large for the local sink'), { responseCode: 552 }));
          return;
        }
        const raw = Buffer.concat(chunks).toString('utf8');
        db.insertInto('mail_messages')
          .values({
            envelope_from: addressOf(session.envelope.mailFrom),
            envelope_to: session.envelope.rcptTo.map((rcpt) => rcpt.address),
            subject: subjectOf(raw),
            raw,
          })
          .execute()
          .then(() => callback(), (error: Error) => callback(Object.assign(error, { responseCode: 451 })));
      });
    },
  });
}
