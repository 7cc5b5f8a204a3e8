import type { Kysely } from 'kysely';
import type { Database } from '@kiln/shared/db';
import { Role } from '@kiln/shared';
import { PasswordService } from '../../backend/src/auth/password.service';

const passwords = new PasswordService();

export interface TestPerson {
  id: string;
  email: string;
  name: string;
  role: Role;
  password: string;
}

/** Inserts one person with a known password. */
export async function createPerson(
  db: Kysely<Database>,
  role: Role,
  overrides: Partial<{ email: string; name: string; password: string; disabled: boolean }> = {},
): Promise<TestPerson> {
  const email = overrides.email ?? `${role}-${Math.random().toString(36).slice(2, 8)}@test.example`;
  const name = overrides.name ?? `Test ${role}`;
  const password = overrides.password ?? `pw-${Math.random().toString(36).slice(2)}`;
  const row = await db
    .insertInto('users')
    .values({ email, name, role, password_hash: await passwords.hash(password), disabled: overrides.disabled ?? false })
    .returning('id')
    .executeTakeFirstOrThrow();
  return { id: row.id, email, name, role, password };
}
