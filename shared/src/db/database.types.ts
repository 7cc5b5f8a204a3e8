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
  notify_sweep_finished: Generated<boolean>;
  notify_run_failed: Generated<boolean>;
  notify_candidate: Generated<boolean>;
  notify_quota: Generated<boolean>;
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

type Json<T> = ColumnType<T, string, string>;
type JsonNullable<T> = ColumnType<T | null, string | null | undefined, string | null>;

export type RunStateValue = 'queued' | 'waiting' | 'running' | 'paused' | 'finished' | 'failed' | 'cancelled';
export type RunOutcomeValue = 'converged' | 'blowup' | 'time-limit' | 'numerics-failed' | 'degenerate';
export type CheckpointReasonValue = 'interval' | 'pause' | 'outcome' | 'shutdown' | 'cancel' | 'cpu-budget' | 'start';

export interface SweepsTable {
  id: Generated<string>;
  study_id: string;
  owner_id: string;
  name: string;
  base_spec: Json<unknown>;
  axes: Json<unknown>;
  run_count: number;
  created_at: Generated<Date>;
  notified_at: TimestampNullable;
}

export interface RunsTable {
  id: Generated<string>;
  study_id: string;
  sweep_id: string | null;
  owner_id: string;
  sweep_index: number | null;
  axis_values: ColumnType<Record<string, number>, string | undefined, string>;
  spec: Json<unknown>;
  state: ColumnType<RunStateValue, RunStateValue | undefined, RunStateValue>;
  wait_reason: string | null;
  outcome: RunOutcomeValue | null;
  outcome_reason: string | null;
  summary: JsonNullable<unknown>;
  progress: JsonNullable<unknown>;
  error: string | null;
  priority: Generated<number>;
  parent_checkpoint_id: string | null;
  resume_checkpoint_id: string | null;
  control_request: 'pause' | 'cancel' | null;
  attempt: Generated<number>;
  dispatched_at: TimestampNullable;
  lease: Generated<number>;
  worker_id: string | null;
  cpu_seconds: Generated<number>;
  pause_reason: 'request' | 'cpu-budget' | null;
  origin: JsonNullable<unknown>;
  created_at: Generated<Date>;
  started_at: TimestampNullable;
  finished_at: TimestampNullable;
  updated_at: Generated<Date>;
}

export interface CheckpointsTable {
  id: Generated<string>;
  run_id: string;
  seq: number;
  step: number;
  t: number;
  points: number;
  reason: CheckpointReasonValue;
  cpu_seconds: number;
  size_bytes: number;
  sha256: string;
  state: Buffer;
  created_at: Generated<Date>;
}

export interface RunMetricsTable {
  run_id: string;
  step: number;
  t: number;
  dt: number;
  energy: number;
  tension: number;
  grad_max: number;
  grad_max_at: number;
  lambda: number;
  center: number | null;
  sigma: number | null;
  sigma_denominator: ColumnType<number | null, number | null | undefined, number | null>;
  points: number;
  newton_iterations: number;
}

export interface QuotasTable {
  user_id: string;
  slots: number;
  cpu_hours_per_month: number;
  max_grid_points: number;
  max_run_cpu_seconds: number;
  updated_at: Generated<Date>;
  updated_by: string | null;
}

export interface CpuUsageTable {
  user_id: string;
  /** First day of the month (UTC). */
  month: ColumnType<Date, string, string>;
  cpu_seconds: number;
}

export interface MailOutboxTable {
  id: Generated<string>;
  dedupe_key: string;
  to_address: string;
  subject: string;
  body_text: string;
  created_at: Generated<Date>;
  attempts: Generated<number>;
  last_error: string | null;
  sent_at: TimestampNullable;
}

export interface InvitationsTable {
  id: Generated<string>;
  study_id: string;
  email: string;
  study_role: 'member' | 'viewer';
  invited_by: string;
  token_hash: string;
  expires_at: Timestamp;
  accepted_at: TimestampNullable;
  accepted_by: string | null;
  revoked_at: TimestampNullable;
  created_at: Generated<Date>;
}

export interface PasswordResetsTable {
  id: Generated<string>;
  user_id: string;
  token_hash: string;
  expires_at: Timestamp;
  used_at: TimestampNullable;
  created_at: Generated<Date>;
}

export interface UploadsTable {
  id: Generated<string>;
  owner_id: string;
  kind: 'initial-profile' | 'target-profile' | 'checkpoint';
  filename: string;
  size_bytes: number;
  content: JsonNullable<unknown>;
  bytes: Buffer | null;
  sha256: string;
  summary: ColumnType<Record<string, unknown>, string | undefined, string>;
  created_at: Generated<Date>;
}

export interface CandidatesTable {
  id: Generated<string>;
  run_id: string;
  study_id: string;
  sweep_id: string | null;
  found_while_running: boolean;
  kind: 'type-I' | 'type-II' | 'infinite-time' | 'inconclusive';
  confidence: number;
  blowup_t: number | null;
  blowup_t_uncertainty: number | null;
  exponent: number | null;
  exponent_uncertainty: number | null;
  evidence: Json<unknown>;
  checkpoint_id: string | null;
  verdict: 'confirmed' | 'artefact' | 'needs-finer-run' | null;
  verdict_note: string | null;
  verdict_by: string | null;
  verdict_at: TimestampNullable;
  finer_run_id: string | null;
  created_at: Generated<Date>;
  updated_at: Generated<Date>;
}

export interface Database {
  users: UsersTable;
  api_tokens: ApiTokensTable;
  audit_log: AuditLogTable;
  studies: StudiesTable;
  study_members: StudyMembersTable;
  workers: WorkersTable;
  mail_messages: MailMessagesTable;
  sweeps: SweepsTable;
  runs: RunsTable;
  checkpoints: CheckpointsTable;
  run_metrics: RunMetricsTable;
  quotas: QuotasTable;
  cpu_usage: CpuUsageTable;
  mail_outbox: MailOutboxTable;
  invitations: InvitationsTable;
  password_resets: PasswordResetsTable;
  uploads: UploadsTable;
  candidates: CandidatesTable;
}
