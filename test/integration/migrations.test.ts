import { mkdtempSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { sql } from 'kysely';
import { afterEach, describe, expect, it } from 'vitest';
import { migrateToLatest } from '@kiln/shared/db';
import { MIGRATIONS_FOLDER } from '../../backend/src/database/migrations-folder';
import { createTestDatabase, type TestDatabase } from '../support/test-database';

describe('migrations', () => {
  let database: TestDatabase | undefined;
  afterEach(async () => {
    await database?.drop();
    database = undefined;
  });

  const tables = async (db: TestDatabase['db']) =>
    (
      await sql<{ table_name: string }>`SELECT table_name FROM information_schema.tables WHERE table_schema = 'public' ORDER BY table_name`.execute(db)
    ).rows.map((row) => row.table_name);

  it('apply on an empty database, and a second run changes nothing', async () => {
    database = await createTestDatabase({ migrate: false });
    expect(await tables(database.db)).toEqual([]);
    const first = await migrateToLatest(database.db, MIGRATIONS_FOLDER);
    expect(first.applied).toContain('0001_people');
    const after = await tables(database.db);
    for (const table of ['users', 'api_tokens', 'audit_log', 'studies', 'study_members', 'workers', 'mail_messages']) {
      expect(after).toContain(table);
    }
    const second = await migrateToLatest(database.db, MIGRATIONS_FOLDER);
    expect(second.applied).toEqual([]);
    expect(await tables(database.db)).toEqual(after);
  });

  it('roll back completely when one migration fails, and say which', async () => {
    database = await createTestDatabase({ migrate: false });
    const folder = mkdtempSync(path.join(os.tmpdir(), 'kiln-migrations-'));
    writeFileSync(path.join(folder, '0001_good.sql'), 'CREATE TABLE good_one (id int);');
    writeFileSync(path.join(folder, '0002_bad.sql'), 'CREATE TABLE bad_one (id int); SELECT no_such_function();');
    await expect(migrateToLatest(database.db, folder)).rejects.toThrow(/0002_bad/);
    const after = await tables(database.db);
    expect(after.filter((name) => !name.startsWith('kysely_'))).toEqual([]);
  });

  it('enforce the rules the schema states (roles, lower-case unique e-mails)', async () => {
    database = await createTestDatabase();
    const insert = (email: string, role: string) =>
      sql`INSERT INTO users (email, name, role, password_hash) VALUES (${email}, 'X', ${role}, 'h')`.execute(database!.db);
    await insert('a@test.example', 'researcher');
    await expect(insert('a@test.example', 'admin')).rejects.toThrow(/unique|duplicate/i);
    await expect(insert('B@test.example', 'admin')).rejects.toThrow(/check/i);
    await expect(insert('c@test.example', 'superuser')).rejects.toThrow(/check/i);
  });
});
