import type { Selectable } from 'kysely';
import type { UsersTable } from '@kiln/shared/db';
import type { Role, User } from '@kiln/shared';

/** The API's view of a user row: never the password hash. */
export function toUser(row: Selectable<UsersTable>): User {
  return {
    id: row.id,
    email: row.email,
    name: row.name,
    role: row.role as Role,
    disabled: row.disabled,
    createdAt: row.created_at.toISOString(),
  };
}
