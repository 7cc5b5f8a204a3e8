import type { Selectable } from 'kysely';
import type { CheckpointsTable, RunMetricsTable, RunsTable } from '@kiln/shared/db';
import type { CheckpointInfo, MetricSample, Run, RunSpec } from '@kiln/shared';

const iso = (date: Date | null) => (date ? date.toISOString() : null);

export function toRun(row: Selectable<RunsTable> & { parent_run_id?: string | null }): Run {
  return {
    id: row.id,
    studyId: row.study_id,
    sweepId: row.sweep_id,
    ownerId: row.owner_id,
    sweepIndex: row.sweep_index,
    axisValues: row.axis_values,
    spec: row.spec as RunSpec,
    state: row.state,
    waitReason: row.wait_reason,
    pauseReason: row.pause_reason,
    outcome: row.outcome,
    outcomeReason: row.outcome_reason,
    summary: row.summary,
    progress: (row.progress as MetricSample | null) ?? null,
    error: row.error,
    priority: row.priority,
    parentCheckpointId: row.parent_checkpoint_id,
    parentRunId: row.parent_run_id ?? null,
    origin: (row.origin as Run['origin']) ?? null,
    controlRequest: row.control_request,
    workerId: row.worker_id,
    cpuSeconds: row.cpu_seconds,
    createdAt: row.created_at.toISOString(),
    startedAt: iso(row.started_at),
    finishedAt: iso(row.finished_at),
  };
}

export function toMetricSample(row: Selectable<RunMetricsTable>): MetricSample {
  return {
    step: row.step,
    t: row.t,
    dt: row.dt,
    energy: row.energy,
    tension: row.tension,
    gradMax: row.grad_max,
    gradMaxAt: row.grad_max_at,
    lambda: row.lambda,
    center: row.center,
    sigma: row.sigma,
    sigmaDenominator: row.sigma_denominator,
    points: row.points,
    newtonIterations: row.newton_iterations,
  };
}

export function toCheckpointInfo(row: Omit<Selectable<CheckpointsTable>, 'state'>): CheckpointInfo {
  return {
    id: row.id,
    runId: row.run_id,
    seq: row.seq,
    step: row.step,
    t: row.t,
    points: row.points,
    reason: row.reason,
    cpuSeconds: row.cpu_seconds,
    sizeBytes: row.size_bytes,
    sha256: row.sha256,
    createdAt: row.created_at.toISOString(),
  };
}
