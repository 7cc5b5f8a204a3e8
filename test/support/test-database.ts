import { randomBytes } from 'node:crypto';
import { Kysely, sql } from 'kysely';
import { createDatabase, migrateToLatest, type Database } from '@kiln/shared/db';
import { MIGRATIONS_FOLDER } from '../../backend/src/database/migrations-folder';
import { testEnv } from './test-env';

export interface TestDatabase {
  url: string;
  name: string;
  db: Kysely<Database>;
  drop(): Promise<void>;
}

function withDatabase(url: string, name: string): string {
  const parsed = new URL(url);
  parsed.pathname = `/${name}`;
  return parsed.toString();
}

/** A fresh, empty database of its own for one test file; migrated unless told otherwise. */
export async function createTestDatabase(options: { migrate?: boolean } = {}): Promise<TestDatabase> {
  const name = `kiln_t_${randomBytes(5).toString('hex')}`;
  const admin = createDatabase({ connectionString: testEnv.pgAdminUrl, max: 1 });
  await sql.raw(`CREATE DATABASE ${name}`).execute(admin);
  await admin.destroy();
  const url = withDatabase(testEnv.pgAdminUrl, name);
  const db = createDatabase({ connectionString: url, max: 4 });
  if (options.migrate !== false) await migrateToLatest(db, MIGRATIONS_FOLDER);
  return {
    url,
    name,
    db,
    async drop() {
      await db.destroy();
      const again = createDatabase({ connectionString: testEnv.pgAdminUrl, max: 1 });
      await sql.raw(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`).execute(again);
      await again.destroy();
    },
  };
}
