import { HttpStatus, Inject, Injectable } from '@nestjs/common';
import { createHash } from 'node:crypto';
import { dilationProfileMaximumOfRun, ErrorCode, flowProfile, forkIncompatibility, jumpToDilationMaximum, serializeCheckpoint, type DilationProfileView, runTime, safeParseRunSpec, type CheckpointProfile, type ForkRequest, type Run } from '@kiln/shared';
import type { AuthenticatedUser } from '../auth/authenticated-user';
import { ApiException, badInput, notFound } from '../common/api-error';
import { DB, type Db } from '../database/database.module';
import { QuotasService } from '../quotas/quotas.service';
import { RunEventsService } from '../queue/run-events.service';
import { RunsRepository } from '../runs/runs.repository';
import { RunsService } from '../runs/runs.service';
import { StudyAccessService } from '../studies/study-access.service';
import { applySpecOverrides } from './spec-overrides';
import { loadCheckpointState } from './checkpoint-state';

@Injectable()
export class CheckpointsService {
  constructor(
    @Inject(DB) private readonly db: Db,
    private readonly runs: RunsService,
    private readonly runsRepository: RunsRepository,
    private readonly access: StudyAccessService,
    private readonly events: RunEventsService,
    private readonly quotas: QuotasService,
  ) {}

  /** The checkpoint's metadata and run, when the caller may see the run. */
  private async find(user: AuthenticatedUser, id: string) {
    const row = await this.db
      .selectFrom('checkpoints')
      .select(['id', 'run_id', 'seq', 'step', 'size_bytes', 'sha256'])
      .where('id', '=', id)
      .executeTakeFirst();
    if (!row) throw notFound('checkpoint');
    const run = await this.runs.get(user, row.run_id).catch(() => {
      throw notFound('checkpoint');
    });
    return { checkpoint: row, run };
  }

  async file(user: AuthenticatedUser, id: string): Promise<{ bytes: Buffer; name: string; sha256: string }> {
    const { checkpoint, run } = await this.find(user, id);
    const row = await this.db.selectFrom('checkpoints').select('state').where('id', '=', id).executeTakeFirstOrThrow();
    return { bytes: row.state, name: `kiln-run-${run.id}-checkpoint-${checkpoint.seq}.kcp`, sha256: checkpoint.sha256 };
  }

  /** The profile h(r) stored in the checkpoint, decoded by the engine (its checksum checked). */
  async profile(user: AuthenticatedUser, id: string): Promise<CheckpointProfile> {
    await this.find(user, id);
    const run = await loadCheckpointState(this.db, id);
    const { r, h } = flowProfile(run);
    return { r: Array.from(r), h: Array.from(h), t: runTime(run), step: run.s.step };
  }

  /** F(s) = D(h∘γ_s) of the checkpoint's state on a log grid, its maximiser s* and the gap (sphere domain). */
  async dilationProfile(user: AuthenticatedUser, id: string): Promise<DilationProfileView> {
    const { run } = await this.find(user, id);
    if (run.spec.domain.kind !== 'sphere') throw badInput('dilations act on the sphere domain only; this run is on the ball');
    const state = await loadCheckpointState(this.db, id);
    const max = dilationProfileMaximumOfRun(state);
    return { profile: max.samples, sStar: max.sStar, energyAtMax: max.energyAtMax, gap: max.gap };
  }

  /**
   * EXPERIMENTAL: a new run (a fork of this checkpoint) that starts from h∘γ_{s*},
   * the state moved along its dilation orbit to the maximiser of F(s). Recorded with
   * its origin so nobody mistakes it for a step of a flow.
   */
  async jumpToMaximiser(user: AuthenticatedUser, id: string, body: ForkRequest): Promise<Run> {
    const { run } = await this.find(user, id);
    await this.access.assertCanWork(user, run.studyId);
    const parsed = safeParseRunSpec(applySpecOverrides(run.spec as unknown as Record<string, unknown>, { symmetry: 'none', ...body.overrides }));
    if (!parsed.success) {
      throw badInput(`overrides: ${parsed.message}`, parsed.issues.map((issue) => ({ path: `overrides.${issue.path}`, message: issue.message })));
    }
    await this.quotas.assertSpecsWithin(user.id, [parsed.spec]);
    const parent = await loadCheckpointState(this.db, id);
    let jump;
    try {
      jump = jumpToDilationMaximum(parent, parsed.spec);
    } catch (error) {
      throw badInput(error instanceof Error ? error.message : String(error));
    }
    const bytes = Buffer.from(serializeCheckpoint(jump.run));
    const origin = { kind: 'dilation-jump', sStar: jump.sStar, gap: jump.gap, energyAtMax: jump.energyAtMax, experimental: true };
    const forkId = await this.db.transaction().execute(async (trx) => {
      const created = await trx
        .insertInto('runs')
        .values({
          study_id: run.studyId,
          owner_id: user.id,
          spec: JSON.stringify(parsed.spec),
          axis_values: '{}',
          parent_checkpoint_id: id,
          priority: run.priority,
          origin: JSON.stringify(origin),
        })
        .returning('id')
        .executeTakeFirstOrThrow();
      await trx
        .insertInto('checkpoints')
        .values({
          run_id: created.id,
          seq: 1,
          step: jump.run.s.step,
          t: runTime(jump.run),
          points: jump.run.r.length,
          reason: 'start',
          cpu_seconds: 0,
          size_bytes: bytes.length,
          sha256: createHash('sha256').update(bytes).digest('hex'),
          state: bytes,
        })
        .execute();
      return created.id;
    });
    await this.events.publish({ type: 'state', runId: forkId, state: 'queued', outcome: null, waitReason: null });
    return this.runs.get(user, forkId);
  }

  /** Continues the same run from this checkpoint. */
  async resume(user: AuthenticatedUser, id: string): Promise<Run> {
    const { run } = await this.find(user, id);
    await this.access.assertCanWork(user, run.studyId);
    if (!['paused', 'cancelled', 'failed', 'finished'].includes(run.state)) {
      throw new ApiException(HttpStatus.CONFLICT, ErrorCode.Conflict, `The run is ${run.state}; pause or cancel it before resuming from a checkpoint.`);
    }
    await this.quotas.assertSpecsWithin(run.ownerId, [run.spec]);
    await this.runs.requeue(run.id, id);
    return this.runs.get(user, run.id);
  }

  /** Starts a new run from this checkpoint with some spec fields changed; the caller owns it. */
  async fork(user: AuthenticatedUser, id: string, body: ForkRequest): Promise<Run> {
    const { run } = await this.find(user, id);
    await this.access.assertCanWork(user, run.studyId);
    const parsed = safeParseRunSpec(applySpecOverrides(run.spec as unknown as Record<string, unknown>, body.overrides));
    if (!parsed.success) {
      throw badInput(`overrides: ${parsed.message}`, parsed.issues.map((issue) => ({ path: `overrides.${issue.path}`, message: issue.message })));
    }
    const incompatible = forkIncompatibility(run.spec, parsed.spec);
    if (incompatible) throw badInput(`overrides: ${incompatible}`, [{ path: 'overrides', message: incompatible }]);
    await this.quotas.assertSpecsWithin(user.id, [parsed.spec]);
    const { id: forkId } = await this.runsRepository.insertOne({
      study_id: run.studyId,
      sweep_id: null,
      owner_id: user.id,
      sweep_index: null,
      axis_values: JSON.stringify(run.axisValues),
      spec: JSON.stringify(parsed.spec),
      parent_checkpoint_id: id,
      priority: run.priority,
    });
    await this.events.publish({ type: 'state', runId: forkId, state: 'queued', outcome: null, waitReason: null });
    return this.runs.get(user, forkId);
  }
}
