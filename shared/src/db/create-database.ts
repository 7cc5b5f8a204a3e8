import { Kysely, PostgresDialect } from 'kysely';
import { Pool, types } from 'pg';
import type { Database } from './database.types';

// PostgreSQL int8 (bigint) arrives as a string by default; our counters fit in a double.
types.setTypeParser(types.builtins.INT8, (value) => Number(value));

export interface DatabaseOptions {
  connectionString: string;
  /** Pool size; the worker's sandboxed threads use 1–2 each. Default 10. */
  max?: number;
  /** Shown in pg_stat_activity, so an admin can tell the parts apart. */
  applicationName?: string;
}

/** One Kysely instance over one pg Pool for this process. Call `destroy()` on shutdown. */
export function createDatabase(options: DatabaseOptions): Kysely<Database> {
  const pool = new Pool({
    connectionString: options.connectionString,
    max: options.max ?? 10,
    application_name: options.applicationName ?? 'kiln',
    connectionTimeoutMillis: 5_000,
  });
  // An idle client losing its server (PostgreSQL restarted) must not crash the process.
  pool.on('error', () => undefined);
  return new Kysely<Database>({ dialect: new PostgresDialect({ pool }) });
}
