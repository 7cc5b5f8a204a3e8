// The one source of database types (style.md, item 4). Used by the backend and
// the worker only: the browser sees API types, never table types.
// Rows are snake_case as in sql/; API types are camelCase, with one mapper per entity.
import type { ColumnType, Generated } from 'kysely';

type Timestamp = ColumnType<Date, Date | string | undefined, Date | string>;
type TimestampNullable = ColumnType<Date | null, Date | string | null | undefined, Date | string | null>;

export interface UsersTable {
  id: Generated<string>;
  email: string;
  name: string;
  role: 'admin' | 'researcher' | 'collaborator';
  password_hash: string;
  disabled: Generated<boolean>;
  created_at: Generated<Date>;
  updated_at: Generated<Date>;
}

export interface ApiTokensTable {
  id: Generated<string>;
  user_id: string;
  name: string;
  /** SHA-256 of the secret; the secret itself is shown once and never stored. */
  token_hash: string;
  created_at: Generated<Date>;
  last_used_at: TimestampNullable;
  revoked_at: TimestampNullable;
}

export interface AuditLogTable {
  id: Generated<string>;
  at: Generated<Date>;
  actor_id: string | null;
  action: string;
  subject_type: string;
  subject_id: string | null;
  before: ColumnType<unknown, string | null | undefined, string | null>;
  after: ColumnType<unknown, string | null | undefined, string | null>;
}

export interface StudiesTable {
  id: Generated<string>;
  name: string;
  description: Generated<string>;
  owner_id: string;
  created_at: Generated<Date>;
}

export interface StudyMembersTable {
  study_id: string;
  user_id: string;
  role: 'owner' | 'member' | 'viewer';
  added_at: Generated<Date>;
}

export interface WorkersTable {
  id: string;
  host: string;
  pid: number;
  slots: number;
  started_at: Timestamp;
  last_heartbeat_at: Timestamp;
  stopped_at: TimestampNullable;
}

export interface MailMessagesTable {
  id: Generated<string>;
  received_at: Generated<Date>;
  envelope_from: string;
  envelope_to: string[];
  subject: string;
  raw: string;
}

export interface Database {
  users: UsersTable;
  api_tokens: ApiTokensTable;
  audit_log: AuditLogTable;
  studies: StudiesTable;
  study_members: StudyMembersTable;
  workers: WorkersTable;
  mail_messages: MailMessagesTable;
}
