// Local mode's SMTP sink process, started by scripts/start.sh on KILN_SMTP_PORT.
import { createDatabase } from '@kiln/shared/db';
import { createSmtpSink } from './smtp-sink';

const port = Number(process.env.KILN_SMTP_PORT ?? 2525);
const url = process.env.DATABASE_URL;
if (!url) {
  console.error('[kiln] smtp sink: DATABASE_URL is required');
  process.exit(1);
}
const db = createDatabase({ connectionString: url, max: 2, applicationName: 'kiln-smtp-sink' });
const sink = createSmtpSink(db);
sink.on('error', (error) => console.error(`[kiln] smtp sink: ${error.message}`));
sink.listen(port, '127.0.0.1', () => console.log(`[kiln] SMTP sink on 127.0.0.1:${port} stores mail in PostgreSQL`));

const stop = () => sink.close(() => void db.destroy().then(() => process.exit(0)));
process.on('SIGTERM', stop);
process.on('SIGINT', stop);
