// API types of runs, checkpoints and their live events (architecture.md, "The API surface").
import type { FlowOutcome } from '../flow';
import type { RunSpec } from '../spec';

export const RUN_STATES = ['queued', 'waiting', 'running', 'paused', 'finished', 'failed', 'cancelled'] as const;
export type RunState = (typeof RUN_STATES)[number];
/** States after which a run does nothing more until someone resumes or forks it. */
export const RESTING_STATES: readonly RunState[] = ['paused', 'finished', 'failed', 'cancelled'];

/** One sampled diagnostic row (numerics.md §3). */
export interface MetricSample {
  step: number;
  t: number;
  dt: number;
  energy: number;
  tension: number;
  gradMax: number;
  gradMaxAt: number;
  lambda: number;
  center: number | null;
  sigma: number | null;
  /** The normalized flow's constraint denominator (null otherwise); near zero means degenerate. */
  sigmaDenominator?: number | null;
  points: number;
  newtonIterations: number;
}

export interface CheckpointInfo {
  id: string;
  runId: string;
  seq: number;
  step: number;
  t: number;
  points: number;
  reason: string;
  cpuSeconds: number;
  sizeBytes: number;
  sha256: string;
  createdAt: string;
}

export interface Run {
  id: string;
  studyId: string;
  sweepId: string | null;
  ownerId: string;
  sweepIndex: number | null;
  axisValues: Record<string, number>;
  spec: RunSpec;
  state: RunState;
  /** Why a queued run is not running yet, in words a person understands. */
  waitReason: string | null;
  /** Why a paused run is paused: someone asked, or the owner's monthly CPU-hours ran out (it resumes by itself). */
  pauseReason: 'request' | 'cpu-budget' | null;
  outcome: FlowOutcome | null;
  outcomeReason: string | null;
  /** The `flow` command's summary (numerics.md §5) once the run has an outcome. */
  summary: unknown;
  /** The latest diagnostic sample. */
  progress: MetricSample | null;
  error: string | null;
  priority: number;
  parentCheckpointId: string | null;
  /** The run the parent checkpoint belongs to, for forks. */
  parentRunId: string | null;
  /** How the run began, when not plainly from its spec or a fork: the experimental dilation jump. */
  origin: { kind: 'dilation-jump'; sStar: number; gap: number; energyAtMax: number; experimental: true } | null;
  controlRequest: 'pause' | 'cancel' | null;
  workerId: string | null;
  cpuSeconds: number;
  createdAt: string;
  startedAt: string | null;
  finishedAt: string | null;
}

/** Server-sent events of `GET /api/runs/:id/events`, published by workers on Redis. */
export type RunEvent =
  | { type: 'progress'; runId: string; sample: MetricSample; cpuSeconds: number }
  | { type: 'state'; runId: string; state: RunState; outcome: FlowOutcome | null; waitReason: string | null }
  | { type: 'checkpoint'; runId: string; checkpoint: Pick<CheckpointInfo, 'id' | 'seq' | 'step' | 't' | 'reason'> };

/** A worker host as `GET /api/workers` lists it. */
export interface WorkerInfo {
  id: string;
  host: string;
  pid: number;
  slots: number;
  startedAt: string;
  lastHeartbeatAt: string;
  /** No heartbeat for longer than the stale limit: the host may be gone. */
  stale: boolean;
  runs: { id: string; studyId: string }[];
}

/** The profile h(r) stored in a checkpoint (`GET /api/checkpoints/:id/profile`). */
export interface CheckpointProfile {
  r: number[];
  h: number[];
  t: number;
  step: number;
}

/** F(s) = D(h∘γ_s) of a checkpoint's state (`GET /api/checkpoints/:id/dilation-profile`). */
export interface DilationProfileView {
  /** (s, F(s)) on a log grid. */
  profile: [number, number][];
  sStar: number;
  energyAtMax: number;
  /** F(s*) − F(1). */
  gap: number;
}
