import { Migrator, type Kysely, type MigrationResult } from 'kysely';
import { SqlFolderMigrationProvider } from './sql-migration-provider';

export interface MigrationReport {
  applied: string[];
}

/**
 * Applies every pending migration from the SQL folder in one transaction under
 * Kysely's advisory lock, so concurrent starts are safe. Throws on failure
 * (Kysely's Migrator returns errors instead of throwing).
 */
export async function migrateToLatest(db: Kysely<any>, folder: string): Promise<MigrationReport> {
  const migrator = new Migrator({ db, provider: new SqlFolderMigrationProvider(folder) });
  const { error, results } = await migrator.migrateToLatest();
  const failed = (results ?? []).find((result: MigrationResult) => result.status === 'Error');
  if (error || failed) {
    const which = failed ? ` in ${failed.migrationName}` : '';
    const reason = error instanceof Error ? error.message : String(error ?? 'unknown error');
    throw new Error(`database migration failed${which}: ${reason}`);
  }
  return { applied: (results ?? []).map((result) => result.migrationName) };
}
