import nodemailer from 'nodemailer';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createSmtpSink } from '../../backend/src/mail/smtp-sink';
import { freePort } from '../support/ports';
import { createTestDatabase, type TestDatabase } from '../support/test-database';

describe('local SMTP sink', () => {
  let database: TestDatabase;
  let port: number;
  let sink: ReturnType<typeof createSmtpSink>;

  beforeAll(async () => {
    database = await createTestDatabase();
    port = await freePort();
    sink = createSmtpSink(database.db);
    await new Promise<void>((resolve) => sink.listen(port, '127.0.0.1', resolve));
  });
  afterAll(async () => {
    await new Promise<void>((resolve) => sink.close(() => resolve()));
    await database?.drop();
  });

  it('stores every message it receives over real SMTP, with envelope and decoded subject', async () => {
    const transport = nodemailer.createTransport({ host: '127.0.0.1', port, secure: false, ignoreTLS: true });
    await transport.sendMail({
      from: 'kiln@vellmar.example',
      to: ['a@test.example', 'b@test.example'],
      subject: 'Blow-up candidate in “S³ → ellipsoid b=3”',
      text: 'Have a look.',
    });
    const rows = await database.db.selectFrom('mail_messages').selectAll().execute();
    expect(rows).toHaveLength(1);
    expect(rows[0].envelope_from).toBe('kiln@vellmar.example');
    expect(rows[0].envelope_to).toEqual(['a@test.example', 'b@test.example']);
    expect(rows[0].subject).toBe('Blow-up candidate in “S³ → ellipsoid b=3”');
    expect(rows[0].raw).toContain('Have a look.');
  });

  it('refuses a message over the size limit and stores nothing for it', async () => {
    const transport = nodemailer.createTransport({ host: '127.0.0.1', port, secure: false, ignoreTLS: true });
    await expect(
      transport.sendMail({ from: 'kiln@vellmar.example', to: 'a@test.example', subject: 'huge', text: 'x'.repeat(6 * 1024 * 1024) }),
    ).rejects.toThrow();
    const count = await database.db.selectFrom('mail_messages').select((eb) => eb.fn.countAll<number>().as('n')).executeTakeFirstOrThrow();
    expect(Number(count.n)).toBe(1);
  });
});
