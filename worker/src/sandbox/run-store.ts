import { DEFAULT_QUOTAS, type Role } from '@kiln/shared';
import { createHash } from 'node:crypto';
import { sql, type Kysely, type Transaction } from 'kysely';
import type { CheckpointReasonValue, Database, RunOutcomeValue } from '@kiln/shared/db';
import type { DiagnosticSample, MetricSample } from '@kiln/shared';
import { LeaseLostError, withDatabaseRetry, type RetryPolicy } from './database-retry';

// Every PostgreSQL statement of a run's execution (docs/run-lifecycle.md). After the
// claim, each write carries `AND lease = $lease`; a write that touches no row throws
// LeaseLostError. Every method retries through a database outage.

export type ControlRequest = 'pause' | 'cancel';

export interface ClaimedRun {
  lease: number;
  spec: unknown;
  parentCheckpointId: string | null;
  resumeCheckpointId: string | null;
  cpuSeconds: number;
  controlRequest: ControlRequest | null;
}

export interface StoredCheckpoint {
  id: string;
  runId: string;
  seq: number;
  step: number;
  sha256: string;
  state: Buffer;
}

export interface WrittenCheckpoint {
  id: string;
  seq: number;
  step: number;
  t: number;
  reason: CheckpointReasonValue;
}

/** Progress written with a flush or a checkpoint. */
export interface RunProgress {
  samples: DiagnosticSample[];
  latest: MetricSample | null;
  cpuSeconds: number;
}

/** The row change that ends a run, in the same transaction as its last checkpoint. */
export type RunEnding =
  | { state: 'finished'; outcome: RunOutcomeValue; outcomeReason: string | null; summary: unknown }
  | { state: 'paused'; pauseReason: 'request' | 'cpu-budget' }
  | { state: 'cancelled' }
  | { state: 'queued' };

/** What a run may still spend, from its owner's quota (docs/run-lifecycle.md, "CPU budgets"). */
export interface CpuBudget {
  /** The per-run limit (quota maxRunCpuSeconds). */
  maxRunCpuSeconds: number;
  /** CPU seconds left of the owner's month, now (other runs of the owner spend it too). */
  monthRemainingSeconds: number;
  ownerId: string;
  notifyQuota: boolean;
  ownerEmail: string;
}

export function sha256Hex(bytes: Uint8Array): string {
  return createHash('sha256').update(bytes).digest('hex');
}

/** The API's camelCase sample (runs.progress, progress events) from an engine sample. */
export function toMetricSample(d: DiagnosticSample): MetricSample {
  return {
    step: d.step,
    t: d.t,
    dt: d.dt,
    energy: d.energy,
    tension: d.tension,
    gradMax: d.gradMax,
    gradMaxAt: d.gradMaxAt,
    lambda: d.lambda,
    center: d.center,
    sigma: d.sigma,
    sigmaDenominator: d.sigmaDenominator,
    points: d.points,
    newtonIterations: d.newtonIterations,
  };
}

const METRIC_ROWS_PER_INSERT = 1_000;

export class RunStore {
  private lease = 0;

  constructor(
    private readonly db: Kysely<Database>,
    readonly runId: string,
    private readonly log: (message: string) => void,
    private readonly retry?: RetryPolicy,
  ) {}

  private retrying<T>(what: string, operation: () => Promise<T>): Promise<T> {
    return withDatabaseRetry(`run ${this.runId}: ${what}`, operation, this.log, this.retry);
  }

  /** Claims admission `attempt` of the run; null when the job is stale. */
  async claim(attempt: number, workerId: string): Promise<ClaimedRun | null> {
    const row = await this.retrying('claim', () =>
      this.db
        .updateTable('runs')
        .set((eb) => ({
          state: 'running',
          lease: eb('lease', '+', 1),
          worker_id: workerId,
          started_at: sql<Date>`coalesce(started_at, now())`,
          updated_at: sql<Date>`now()`,
        }))
        .where('id', '=', this.runId)
        .where('attempt', '=', attempt)
        .where('state', 'in', ['queued', 'running'])
        .returning(['lease', 'spec', 'parent_checkpoint_id', 'resume_checkpoint_id', 'cpu_seconds', 'control_request'])
        .executeTakeFirst(),
    );
    if (!row) return null;
    this.lease = row.lease;
    return {
      lease: row.lease,
      spec: row.spec,
      parentCheckpointId: row.parent_checkpoint_id,
      resumeCheckpointId: row.resume_checkpoint_id,
      cpuSeconds: row.cpu_seconds,
      controlRequest: row.control_request,
    };
  }

  /** Locks the run row if this worker still holds it (first statement of every fenced transaction). */
  private async fence(
    trx: Transaction<Database>,
    progress: RunProgress | null,
  ): Promise<{ controlRequest: ControlRequest | null }> {
    const row = await trx
      .updateTable('runs')
      .set({
        updated_at: sql<Date>`now()`,
        ...(progress
          ? {
              cpu_seconds: progress.cpuSeconds,
              ...(progress.latest ? { progress: JSON.stringify(progress.latest) } : {}),
            }
          : {}),
      })
      .where('id', '=', this.runId)
      .where('lease', '=', this.lease)
      .returning('control_request')
      .executeTakeFirst();
    if (!row) throw new LeaseLostError(this.runId, this.lease);
    return { controlRequest: row.control_request };
  }

  private async insertMetrics(trx: Transaction<Database>, samples: DiagnosticSample[]): Promise<void> {
    for (let i = 0; i < samples.length; i += METRIC_ROWS_PER_INSERT) {
      const rows = samples.slice(i, i + METRIC_ROWS_PER_INSERT).map((d) => ({
        run_id: this.runId,
        step: d.step,
        t: d.t,
        dt: d.dt,
        energy: d.energy,
        tension: d.tension,
        grad_max: d.gradMax,
        grad_max_at: d.gradMaxAt,
        lambda: d.lambda,
        center: d.center,
        sigma: d.sigma,
        sigma_denominator: d.sigmaDenominator,
        points: d.points,
        newton_iterations: d.newtonIterations,
      }));
      // A resumed run re-emits samples it already wrote, identical ones.
      await trx
        .insertInto('run_metrics')
        .values(rows)
        .onConflict((oc) => oc.columns(['run_id', 'step']).doNothing())
        .execute();
    }
  }

  /** Writes buffered samples, progress and CPU seconds; returns the pending control request. */
  async flush(progress: RunProgress): Promise<ControlRequest | null> {
    return this.retrying('flush', () =>
      this.db.transaction().execute(async (trx) => {
        const { controlRequest } = await this.fence(trx, progress);
        await this.insertMetrics(trx, progress.samples);
        return controlRequest;
      }),
    );
  }

  /** The run's control request, re-read after the control signal fired. */
  async readControlRequest(): Promise<ControlRequest | null> {
    const row = await this.retrying('read control request', () =>
      this.db
        .selectFrom('runs')
        .select('control_request')
        .where('id', '=', this.runId)
        .where('lease', '=', this.lease)
        .executeTakeFirst(),
    );
    if (!row) throw new LeaseLostError(this.runId, this.lease);
    return row.control_request;
  }

  /**
   * One checkpoint transaction: fenced run update (progress, CPU seconds), the
   * buffered metrics, the checkpoint row (`seq` = max + 1, SHA-256 of the bytes), and
   * optionally the row change that ends the run. A retry after a commit whose
   * acknowledgement was lost finds its own checkpoint (same SHA-256 and reason) on
   * top and does not write it twice.
   */
  async writeCheckpoint(
    bytes: Uint8Array,
    info: { step: number; t: number; points: number; reason: CheckpointReasonValue },
    progress: RunProgress,
    ending?: RunEnding,
  ): Promise<{ checkpoint: WrittenCheckpoint; controlRequest: ControlRequest | null }> {
    const sha256 = sha256Hex(bytes);
    const state = Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
    return this.retrying(`checkpoint (${info.reason})`, () =>
      this.db.transaction().execute(async (trx) => {
        const { controlRequest } = await this.fence(trx, progress);
        await this.insertMetrics(trx, progress.samples);
        const top = await trx
          .selectFrom('checkpoints')
          .select(['id', 'seq', 'sha256', 'reason'])
          .where('run_id', '=', this.runId)
          .orderBy('seq', 'desc')
          .limit(1)
          .executeTakeFirst();
        let written: { id: string; seq: number };
        if (top && top.sha256 === sha256 && top.reason === info.reason) {
          written = top;
        } else {
          written = await trx
            .insertInto('checkpoints')
            .values({
              run_id: this.runId,
              seq: (top?.seq ?? 0) + 1,
              step: info.step,
              t: info.t,
              points: info.points,
              reason: info.reason,
              cpu_seconds: progress.cpuSeconds,
              size_bytes: bytes.byteLength,
              sha256,
              state,
            })
            .returning(['id', 'seq'])
            .executeTakeFirstOrThrow();
        }
        if (ending) await this.end(trx, ending);
        return { checkpoint: { ...written, step: info.step, t: info.t, reason: info.reason }, controlRequest };
      }),
    );
  }

  private async end(trx: Transaction<Database>, ending: RunEnding): Promise<void> {
    let values;
    switch (ending.state) {
      case 'finished':
        values = {
          state: 'finished' as const,
          outcome: ending.outcome,
          outcome_reason: ending.outcomeReason,
          summary: JSON.stringify(ending.summary),
          error: null,
          finished_at: sql<Date>`now()`,
          dispatched_at: null,
          control_request: null,
        };
        break;
      case 'paused':
        values = { state: 'paused' as const, pause_reason: ending.pauseReason, dispatched_at: null, control_request: null };
        break;
      case 'cancelled':
        values = { state: 'cancelled' as const, dispatched_at: null, control_request: null };
        break;
      case 'queued':
        // Graceful shutdown: hand the run back for the scheduler to admit again.
        values = { state: 'queued' as const, dispatched_at: null, worker_id: null };
        break;
    }
    const result = await trx
      .updateTable('runs')
      .set(values)
      .where('id', '=', this.runId)
      .where('lease', '=', this.lease)
      .executeTakeFirst();
    if (!result.numUpdatedRows) throw new LeaseLostError(this.runId, this.lease);
  }

  /** The owner's quota as it applies to this run now (own quota, or the role's default). */
  async budget(): Promise<CpuBudget> {
    return this.retrying('read the CPU budget', async () => {
      const row = await this.db
        .selectFrom('runs')
        .innerJoin('users', 'users.id', 'runs.owner_id')
        .leftJoin('quotas', 'quotas.user_id', 'runs.owner_id')
        .leftJoin('cpu_usage', (join) =>
          join.onRef('cpu_usage.user_id', '=', 'runs.owner_id').on('cpu_usage.month', '=', sql<Date>`date_trunc('month', now() AT TIME ZONE 'UTC')::date`),
        )
        .select(['runs.owner_id', 'users.role', 'users.email', 'users.notify_quota', 'quotas.cpu_hours_per_month', 'quotas.max_run_cpu_seconds', 'cpu_usage.cpu_seconds as used'])
        .where('runs.id', '=', this.runId)
        .executeTakeFirstOrThrow();
      const defaults = DEFAULT_QUOTAS[row.role as Role];
      const monthSeconds = (row.cpu_hours_per_month ?? defaults.cpuHoursPerMonth) * 3600;
      return {
        maxRunCpuSeconds: row.max_run_cpu_seconds ?? defaults.maxRunCpuSeconds,
        monthRemainingSeconds: Math.max(0, monthSeconds - (row.used ?? 0)),
        ownerId: row.owner_id,
        notifyQuota: row.notify_quota,
        ownerEmail: row.email,
      };
    });
  }

  /** Tells the owner, once a month, that their CPU-hours ran out and their runs wait (in the pausing transaction's wake). */
  async notifyBudgetExhausted(budget: CpuBudget): Promise<void> {
    if (!budget.notifyQuota) return;
    const month = new Date().toISOString().slice(0, 7);
    await this.retrying('queue the quota e-mail', () =>
      this.db
        .insertInto('mail_outbox')
        .values({
          dedupe_key: `quota-exhausted:${budget.ownerId}:${month}`,
          to_address: budget.ownerEmail,
          subject: 'Your Kiln CPU-hours for this month are used up',
          body_text: [
            'Your monthly CPU-hours on Kiln are used up, so your running runs were checkpointed and paused.',
            'They continue by themselves when your lab admin raises your quota, or on the 1st of next month.',
            '',
            'You can switch these e-mails off in your settings.',
          ].join('\n'),
        })
        .onConflict((oc) => oc.column('dedupe_key').doNothing())
        .execute(),
    );
  }

  /** Marks the run failed with a readable error (fenced). */
  async fail(message: string): Promise<void> {
    await this.retrying('mark failed', async () => {
      const result = await this.db
        .updateTable('runs')
        .set({ state: 'failed', error: message.slice(0, 4_000), dispatched_at: null, control_request: null, updated_at: sql<Date>`now()` })
        .where('id', '=', this.runId)
        .where('lease', '=', this.lease)
        .executeTakeFirst();
      if (!result.numUpdatedRows) throw new LeaseLostError(this.runId, this.lease);
    });
  }

  /** Ids and checksums of the run's checkpoints, newest first (no bytes). */
  async listCheckpoints(): Promise<{ id: string; seq: number }[]> {
    return this.retrying('list checkpoints', () =>
      this.db
        .selectFrom('checkpoints')
        .select(['id', 'seq'])
        .where('run_id', '=', this.runId)
        .orderBy('seq', 'desc')
        .execute(),
    );
  }

  async loadCheckpoint(id: string): Promise<StoredCheckpoint | null> {
    const row = await this.retrying('load checkpoint', () =>
      this.db
        .selectFrom('checkpoints')
        .select(['id', 'run_id', 'seq', 'step', 'sha256', 'state'])
        .where('id', '=', id)
        .executeTakeFirst(),
    );
    return row ? { id: row.id, runId: row.run_id, seq: row.seq, step: row.step, sha256: row.sha256, state: row.state } : null;
  }

  /**
   * The parsed content of a profile upload (`{ domain, r, h }` or `{ h, f, z }`, as the
   * API stored it after checking it) for a spec that names it; throws when there is no
   * upload of that kind with that id. Only a new run needs it: checkpoints are self-contained.
   */
  async loadUploadContent(id: string, kind: 'initial-profile' | 'target-profile'): Promise<unknown> {
    const uuid = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(id);
    const row = !uuid
      ? undefined
      : await this.retrying('load upload', () =>
          this.db.selectFrom('uploads').select(['kind', 'content']).where('id', '=', id).executeTakeFirst(),
        );
    if (!row || row.kind !== kind || row.content === null) throw new Error(`the spec names ${kind} upload ${id}, which does not exist`);
    return typeof row.content === 'string' ? JSON.parse(row.content) : row.content;
  }

  /**
   * Starts a resume from one of the run's own checkpoints: copies it on top as a
   * `start` checkpoint (so a crash before the next checkpoint resumes from it, not
   * from a later one of the abandoned timeline), deletes the metrics after its step
   * and clears `resume_checkpoint_id`, in one fenced transaction.
   */
  async beginResumeFrom(checkpoint: StoredCheckpoint, info: { t: number; points: number }, cpuSeconds: number): Promise<WrittenCheckpoint> {
    return this.retrying('resume from checkpoint', () =>
      this.db.transaction().execute(async (trx) => {
        await this.fence(trx, null);
        const top = await trx
          .selectFrom('checkpoints')
          .select(sql<number>`coalesce(max(seq), 0)`.as('seq'))
          .where('run_id', '=', this.runId)
          .executeTakeFirstOrThrow();
        const written = await trx
          .insertInto('checkpoints')
          .values({
            run_id: this.runId,
            seq: top.seq + 1,
            step: checkpoint.step,
            t: info.t,
            points: info.points,
            reason: 'start',
            cpu_seconds: cpuSeconds,
            size_bytes: checkpoint.state.byteLength,
            sha256: checkpoint.sha256,
            state: checkpoint.state,
          })
          .returning(['id', 'seq'])
          .executeTakeFirstOrThrow();
        await trx.deleteFrom('run_metrics').where('run_id', '=', this.runId).where('step', '>', checkpoint.step).execute();
        await trx
          .updateTable('runs')
          .set({ resume_checkpoint_id: null })
          .where('id', '=', this.runId)
          .where('lease', '=', this.lease)
          .execute();
        return { ...written, step: checkpoint.step, t: info.t, reason: 'start' as const };
      }),
    );
  }
}
