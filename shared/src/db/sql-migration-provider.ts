import { promises as fs } from 'node:fs';
import path from 'node:path';
import { sql, type Kysely, type Migration, type MigrationProvider } from 'kysely';

/** The line that separates a migration's up part from its optional down part. */
export const DOWN_MARKER = '-- migrate:down';

/**
 * Reads `NNNN_name.sql` files from a folder as Kysely migrations: the text above
 * `-- migrate:down` is the up migration, the text below it the down one.
 * Kysely's FileMigrationProvider only loads JS/TS modules, hence this provider.
 */
export class SqlFolderMigrationProvider implements MigrationProvider {
  constructor(private readonly folder: string) {}

  async getMigrations(): Promise<Record<string, Migration>> {
    const names = (await fs.readdir(this.folder)).filter((name) => /^\d+_[\w-]+\.sql$/.test(name)).sort();
    const migrations: Record<string, Migration> = {};
    for (const name of names) {
      const text = await fs.readFile(path.join(this.folder, name), 'utf8');
      const [up, down] = text.split(DOWN_MARKER);
      migrations[name.replace(/\.sql$/, '')] = {
        up: (db: Kysely<any>) => sql.raw(up).execute(db).then(() => undefined),
        down: down ? (db: Kysely<any>) => sql.raw(down).execute(db).then(() => undefined) : undefined,
      };
    }
    return migrations;
  }
}
