import { HttpStatus, Inject, Injectable } from '@nestjs/common';
import { ErrorCode, flowProfile, forkIncompatibility, runTime, safeParseRunSpec, type CheckpointProfile, type ForkRequest, type Run } from '@kiln/shared';
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

  /** Continues the same run from this checkpoint. */
  async resume(user: AuthenticatedUser, id: string): Promise<Run> {
    const { run } = await this.find(user, id);
    await this.access.assertCanWork(user, run.studyId);
    if (!['paused', 'cancelled', 'failed', 'finished'].includes(run.state)) {
      throw new ApiException(HttpStatus.CONFLICT, ErrorCode.Conflict, `The run is ${run.state}; pause or cancel it before resuming from a checkpoint.`);
    }
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
