import {
  advanceFlowRun,
  createFlowRun,
  deserializeCheckpoint,
  drainSamples,
  parseRunSpec,
  runDiagnostics,
  runOutcome,
  runTime,
  serializeCheckpoint,
  summarizeFlowRun,
  type DiagnosticSample,
  type FlowRun,
  type InitialProfile,
  type RunState,
  type TargetProfile,
} from '@kiln/shared';
import type { CheckpointReasonValue } from '@kiln/shared/db';
import { AbortReason } from './abort-reason';
import { LeaseLostError } from './database-retry';
import { forkFlowRun } from './fork-flow-run.adapter';
import type { RunEventsPublisher } from './run-events.publisher';
import {
  sha256Hex,
  toMetricSample,
  type ClaimedRun,
  type CpuBudget,
  type ControlRequest,
  type RunEnding,
  type RunStore,
  type StoredCheckpoint,
  type WrittenCheckpoint,
} from './run-store';
import { RunCpuMeter } from './thread-cpu-clock';

export interface ExecutionSettings {
  workerId: string;
  /** Seconds between interval checkpoints (KILN_CHECKPOINT_SECONDS). */
  checkpointSeconds: number;
  /** Length of one compute slice (default 200 ms). */
  sliceMs: number;
  /** Time between flushes of samples, progress and CPU seconds (default 1 s). */
  flushMs: number;
}

export const DEFAULT_SLICE_MS = 200;
export const DEFAULT_FLUSH_MS = 1_000;

export type ExecutionStatus = 'stale' | 'superseded' | RunState;

export interface ExecutionResult {
  runId: string;
  status: ExecutionStatus;
}

const yieldToEventLoop = () => new Promise<void>((resolve) => setImmediate(resolve));

/** Checks the SHA-256 recorded with a checkpoint, then reads it (the format has its own CRC-32 too). */
export function readVerifiedCheckpoint(checkpoint: StoredCheckpoint): FlowRun {
  const actual = sha256Hex(checkpoint.state);
  if (actual !== checkpoint.sha256) {
    throw new Error(`checkpoint ${checkpoint.seq} is corrupted: SHA-256 ${actual.slice(0, 12)}… does not match the recorded ${checkpoint.sha256.slice(0, 12)}…`);
  }
  return deserializeCheckpoint(new Uint8Array(checkpoint.state.buffer, checkpoint.state.byteOffset, checkpoint.state.byteLength));
}

/**
 * One execution of a run by one worker (docs/run-lifecycle.md): claim with a fencing
 * lease, pick the starting state, advance in slices, flush about once a second,
 * checkpoint on an interval, and end on an outcome, a control request or shutdown.
 */
export class RunExecution {
  private buffer: DiagnosticSample[] = [];
  private cpu = new RunCpuMeter(0);
  private controlSignalSeen = false;

  constructor(
    private readonly store: RunStore,
    private readonly events: RunEventsPublisher,
    private readonly settings: ExecutionSettings,
    private readonly log: (message: string) => void,
    private readonly signal?: AbortSignal,
  ) {}

  private get runId(): string {
    return this.store.runId;
  }

  async execute(attempt: number): Promise<ExecutionResult> {
    const claim = await this.store.claim(attempt, this.settings.workerId);
    if (!claim) {
      this.log(`run ${this.runId} attempt ${attempt}: stale job (run paused, cancelled, finished or re-admitted), dropped`);
      return { runId: this.runId, status: 'stale' };
    }
    this.cpu = new RunCpuMeter(claim.cpuSeconds);
    this.publishState('running');
    try {
      return { runId: this.runId, status: await this.drive(claim) };
    } catch (error) {
      if (error instanceof LeaseLostError) {
        this.log(`${error.message}; stopping without further writes`);
        return { runId: this.runId, status: 'superseded' };
      }
      const message = error instanceof Error ? error.message : String(error);
      this.log(`run ${this.runId} failed: ${error instanceof Error ? (error.stack ?? message) : message}`);
      try {
        await this.store.fail(message);
      } catch (failError) {
        if (failError instanceof LeaseLostError) return { runId: this.runId, status: 'superseded' };
        throw failError;
      }
      this.publishState('failed');
      return { runId: this.runId, status: 'failed' };
    }
  }

  private async drive(claim: ClaimedRun): Promise<RunState> {
    const run = await this.startingState(claim);
    if (claim.controlRequest) return this.endOnRequest(run, claim.controlRequest);
    // The run may spend up to its per-run limit, and no more than its owner's month has
    // left; re-read at every flush, because the owner's other runs spend the month too.
    let budget = await this.store.budget();
    const cpuBudgetSeconds = () => Math.min(budget.maxRunCpuSeconds, this.cpu.total() + budget.monthRemainingSeconds);
    let limit = cpuBudgetSeconds();
    const { checkpointSeconds, sliceMs, flushMs } = this.settings;
    let nextFlush = performance.now() + flushMs;
    let nextCheckpoint = performance.now() + checkpointSeconds * 1000;
    for (;;) {
      const stop = this.pendingStop();
      if (stop === AbortReason.Shutdown) return this.handBack(run);
      if (stop === AbortReason.Control) {
        const request = await this.store.readControlRequest();
        if (request) return this.endOnRequest(run, request);
      }
      const sliceEnd = performance.now() + sliceMs;
      // The engine never reads clocks: the slice's wall-clock check lives here.
      const result = this.cpu.measure(() =>
        advanceFlowRun(run, {
          shouldStop: () => performance.now() >= sliceEnd || this.signal?.aborted === true,
          cpuSecondsUsed: () => this.cpu.total(),
          cpuBudgetSeconds: limit,
        }),
      );
      this.buffer.push(...drainSamples(run));
      if (result.done && result.reason === 'cpu-budget' && limit < budget.maxRunCpuSeconds) {
        // The owner's month ran out, not the run's own limit: pause until the budget allows more.
        return this.pauseForBudget(run, budget);
      }
      if (result.done) return this.finish(run);
      const now = performance.now();
      if (now >= nextCheckpoint) {
        const request = await this.checkpoint(run, 'interval');
        nextCheckpoint = performance.now() + checkpointSeconds * 1000;
        nextFlush = performance.now() + flushMs;
        if (request) return this.endOnRequest(run, request);
      } else if (now >= nextFlush) {
        const request = await this.flush(run);
        nextFlush = performance.now() + flushMs;
        if (request) return this.endOnRequest(run, request);
        budget = await this.store.budget();
        limit = cpuBudgetSeconds();
      }
      // Lets the thread receive the main process's cancel message between slices.
      await yieldToEventLoop();
    }
  }

  /** Shutdown always wins; a control abort is acted on once (then the 1 s flush polls). */
  private pendingStop(): AbortReason | null {
    if (!this.signal?.aborted) return null;
    if (this.signal.reason === AbortReason.Shutdown) return AbortReason.Shutdown;
    if (this.controlSignalSeen) return null;
    this.controlSignalSeen = true;
    return AbortReason.Control;
  }

  private async startingState(claim: ClaimedRun): Promise<FlowRun> {
    const spec = parseRunSpec(claim.spec);
    if (claim.resumeCheckpointId) {
      const checkpoint = await this.store.loadCheckpoint(claim.resumeCheckpointId);
      if (!checkpoint || checkpoint.runId !== this.runId) {
        throw new Error(`cannot resume: checkpoint ${claim.resumeCheckpointId} is not a checkpoint of this run`);
      }
      const run = readVerifiedCheckpoint(checkpoint);
      const start = await this.store.beginResumeFrom(checkpoint, { t: runTime(run), points: run.r.length }, claim.cpuSeconds);
      this.publishCheckpoint(start);
      this.log(`run ${this.runId}: resuming from checkpoint ${checkpoint.seq} (step ${checkpoint.step})`);
      return run;
    }
    for (const { id, seq } of await this.store.listCheckpoints()) {
      const checkpoint = await this.store.loadCheckpoint(id);
      if (!checkpoint) continue;
      try {
        const run = readVerifiedCheckpoint(checkpoint);
        this.log(`run ${this.runId}: continuing from checkpoint ${seq} (step ${checkpoint.step})`);
        return run;
      } catch (error) {
        // A bad checkpoint is skipped, never loaded: the one before it is used.
        this.log(`run ${this.runId}: skipping checkpoint ${seq}: ${error instanceof Error ? error.message : String(error)}`);
      }
    }
    if (claim.parentCheckpointId) {
      const parent = await this.store.loadCheckpoint(claim.parentCheckpointId);
      if (!parent) throw new Error(`cannot fork: parent checkpoint ${claim.parentCheckpointId} no longer exists`);
      return forkFlowRun(readVerifiedCheckpoint(parent), spec);
    }
    // The engine reads no uploads itself: a new run gets the tables its spec names.
    return createFlowRun(spec, {
      initialProfile:
        spec.initial.kind === 'table' ? ((await this.store.loadUploadContent(spec.initial.uploadId, 'initial-profile')) as InitialProfile) : undefined,
      targetProfile:
        spec.target.kind === 'profile' ? ((await this.store.loadUploadContent(spec.target.uploadId, 'target-profile')) as TargetProfile) : undefined,
    });
  }

  private progress(run: FlowRun) {
    const samples = this.buffer;
    this.buffer = [];
    return { samples, latest: toMetricSample(runDiagnostics(run)), cpuSeconds: this.cpu.total() };
  }

  private async flush(run: FlowRun): Promise<ControlRequest | null> {
    const progress = this.progress(run);
    const request = await this.store.flush(progress);
    this.events.publish({ type: 'progress', runId: this.runId, sample: progress.latest, cpuSeconds: progress.cpuSeconds });
    return request;
  }

  private async checkpoint(
    run: FlowRun,
    reason: CheckpointReasonValue,
    ending?: (cpuSeconds: number) => RunEnding,
  ): Promise<ControlRequest | null> {
    // Samples are not part of a checkpoint: they go into the same transaction.
    this.buffer.push(...drainSamples(run));
    const bytes = this.cpu.measure(() => serializeCheckpoint(run));
    const progress = this.progress(run);
    const { checkpoint, controlRequest } = await this.store.writeCheckpoint(
      bytes,
      { step: run.s.step, t: runTime(run), points: run.r.length, reason },
      progress,
      ending?.(progress.cpuSeconds),
    );
    this.publishCheckpoint(checkpoint);
    this.events.publish({ type: 'progress', runId: this.runId, sample: progress.latest, cpuSeconds: progress.cpuSeconds });
    return controlRequest;
  }

  private async finish(run: FlowRun): Promise<RunState> {
    const { outcome, reason } = runOutcome(run);
    if (outcome === null) throw new Error('the engine reported the run done without an outcome');
    await this.checkpoint(run, 'outcome', (cpuSeconds) => ({
      state: 'finished',
      outcome,
      outcomeReason: reason,
      summary: summarizeFlowRun(run, cpuSeconds),
    }));
    this.publishState('finished', outcome);
    return 'finished';
  }

  private async pauseForBudget(run: FlowRun, budget: CpuBudget): Promise<RunState> {
    await this.checkpoint(run, 'cpu-budget', () => ({ state: 'paused', pauseReason: 'cpu-budget' }));
    await this.store.notifyBudgetExhausted(budget);
    this.publishState('paused');
    this.log(`run ${this.runId}: paused at step ${run.s.step}: the owner's monthly CPU-hours are used up`);
    return 'paused';
  }

  private async endOnRequest(run: FlowRun, request: ControlRequest): Promise<RunState> {
    await this.checkpoint(run, request, () => (request === 'pause' ? { state: 'paused', pauseReason: 'request' } : { state: 'cancelled' }));
    const state = request === 'pause' ? 'paused' : 'cancelled';
    this.publishState(state);
    this.log(`run ${this.runId}: ${state} on request at step ${run.s.step}`);
    return state;
  }

  private async handBack(run: FlowRun): Promise<RunState> {
    await this.checkpoint(run, 'shutdown', () => ({ state: 'queued' }));
    this.publishState('queued');
    this.log(`run ${this.runId}: checkpointed at step ${run.s.step} and handed back (worker shutting down)`);
    return 'queued';
  }

  private publishState(state: RunState, outcome: ReturnType<typeof runOutcome>['outcome'] = null): void {
    this.events.publish({ type: 'state', runId: this.runId, state, outcome, waitReason: null });
  }

  private publishCheckpoint(checkpoint: WrittenCheckpoint): void {
    const { id, seq, step, t, reason } = checkpoint;
    this.events.publish({ type: 'checkpoint', runId: this.runId, checkpoint: { id, seq, step, t, reason } });
  }
}
