import { HttpStatus, Inject, Injectable } from '@nestjs/common';
import { sql, type Selectable } from 'kysely';
import type { CandidatesTable } from '@kiln/shared/db';
import {
  ErrorCode,
  flowProfile,
  Role,
  runTime,
  type Candidate,
  type CandidateEvidence,
  type CandidateListQuery,
  type CandidatePlots,
  type FinerComparison,
  type Page,
  type Run,
  type RunSpec,
  type VerdictRequest,
} from '@kiln/shared';
import { AuditService } from '../audit/audit.service';
import type { AuthenticatedUser } from '../auth/authenticated-user';
import { loadCheckpointState } from '../checkpoints/checkpoint-state';
import { CheckpointsService } from '../checkpoints/checkpoints.service';
import { ApiException, notFound } from '../common/api-error';
import { DB, type Db } from '../database/database.module';
import { StudyAccessService } from '../studies/study-access.service';

type Row = Selectable<CandidatesTable> & { run_state: string; run_outcome: string | null };

function toCandidate(row: Row): Candidate {
  return {
    id: row.id,
    runId: row.run_id,
    studyId: row.study_id,
    sweepId: row.sweep_id,
    foundWhileRunning: row.found_while_running,
    kind: row.kind,
    confidence: row.confidence,
    T: row.blowup_t,
    TUncertainty: row.blowup_t_uncertainty,
    exponent: row.exponent,
    exponentUncertainty: row.exponent_uncertainty,
    evidence: row.evidence as CandidateEvidence,
    checkpointId: row.checkpoint_id,
    verdict: row.verdict,
    verdictNote: row.verdict_note,
    verdictBy: row.verdict_by,
    verdictAt: row.verdict_at?.toISOString() ?? null,
    finerRunId: row.finer_run_id,
    createdAt: row.created_at.toISOString(),
    runState: row.run_state,
    runOutcome: row.run_outcome,
  };
}

/** Profiles and points kept per plotted series (enough for a screen). */
const PLOT_POINTS = 400;
const RESCALED_PROFILES = 5;

@Injectable()
export class CandidatesService {
  constructor(
    @Inject(DB) private readonly db: Db,
    private readonly access: StudyAccessService,
    private readonly audit: AuditService,
    private readonly checkpoints: CheckpointsService,
  ) {}

  private base() {
    return this.db.selectFrom('candidates').innerJoin('runs', 'runs.id', 'candidates.run_id').selectAll('candidates').select(['runs.state as run_state', 'runs.outcome as run_outcome']);
  }

  async list(user: AuthenticatedUser, query: CandidateListQuery): Promise<Page<Candidate>> {
    if (query.studyId) await this.access.assertCanView(user, query.studyId);
    let q = this.base();
    if (user.role !== Role.Admin) q = q.where('candidates.study_id', 'in', (eb) => eb.selectFrom('study_members').select('study_id').where('user_id', '=', user.id));
    if (query.studyId) q = q.where('candidates.study_id', '=', query.studyId);
    if (query.sweepId) q = q.where('candidates.sweep_id', '=', query.sweepId);
    if (query.kind) q = q.where('candidates.kind', '=', query.kind);
    if (query.verdict) q = query.verdict === 'none' ? q.where('candidates.verdict', 'is', null) : q.where('candidates.verdict', '=', query.verdict);
    const total = (await q.clearSelect().select((eb) => eb.fn.countAll<number>().as('n')).executeTakeFirstOrThrow()).n;
    const column = { confidence: 'candidates.confidence', T: 'candidates.blowup_t', created: 'candidates.created_at' }[query.sort] as 'candidates.confidence';
    const rows = (await q
      .orderBy(column, (ob) => (query.order === 'asc' ? ob.asc() : ob.desc()).nullsLast())
      .orderBy('candidates.id')
      .limit(query.pageSize)
      .offset((query.page - 1) * query.pageSize)
      .execute()) as Row[];
    return { items: rows.map(toCandidate), total: Number(total), page: query.page, pageSize: query.pageSize };
  }

  private async findVisible(user: AuthenticatedUser, id: string): Promise<Row> {
    const row = (await this.base().where('candidates.id', '=', id).executeTakeFirst()) as Row | undefined;
    if (!row) throw notFound('candidate');
    await this.access.assertCanView(user, row.study_id).catch(() => {
      throw notFound('candidate');
    });
    return row;
  }

  async get(user: AuthenticatedUser, id: string): Promise<Candidate & { finer: FinerComparison | null }> {
    const row = await this.findVisible(user, id);
    return { ...toCandidate(row), finer: await this.compareFiner(row) };
  }

  /** Do the finer fork's T̂ and p agree with this candidate's within their combined uncertainties? */
  private async compareFiner(row: Row): Promise<FinerComparison | null> {
    if (!row.finer_run_id) return null;
    const run = await this.db.selectFrom('runs').select(['id', 'state', 'outcome']).where('id', '=', row.finer_run_id).executeTakeFirst();
    if (!run) return null;
    const finer = await this.db.selectFrom('candidates').selectAll().where('run_id', '=', run.id).executeTakeFirst();
    const within = (a: number | null, ua: number | null, b: number | null, ub: number | null) =>
      a === null || b === null || ua === null || ub === null ? null : Math.abs(a - b) <= ua + ub;
    const tAgrees = finer ? within(row.blowup_t, row.blowup_t_uncertainty, finer.blowup_t, finer.blowup_t_uncertainty) : null;
    const pAgrees = finer ? within(row.exponent, row.exponent_uncertainty, finer.exponent, finer.exponent_uncertainty) : null;
    return {
      runId: run.id,
      state: run.state,
      outcome: run.outcome,
      T: finer?.blowup_t ?? null,
      exponent: finer?.exponent ?? null,
      agrees: tAgrees === null && pAgrees === null ? null : (tAgrees ?? true) && (pAgrees ?? true),
    };
  }

  async plots(user: AuthenticatedUser, id: string): Promise<CandidatePlots> {
    const row = await this.findVisible(user, id);
    const T = row.blowup_t;
    const metrics = await this.db
      .selectFrom('run_metrics')
      .select(['t', 'grad_max', 'tension', 'energy'])
      .where('run_id', '=', row.run_id)
      .orderBy('step')
      .execute();
    const stride = Math.max(1, Math.ceil(metrics.length / PLOT_POINTS));
    const history = metrics.filter((_, i) => i % stride === 0 || i === metrics.length - 1).map((m) => ({ t: m.t, gradMax: m.grad_max, tension: m.tension, energy: m.energy }));
    const gradientVsTimeToBlowup: [number, number][] =
      T === null ? [] : metrics.filter((m) => T - m.t > 0).map((m): [number, number] => [T - m.t, m.grad_max]).filter((_, i, all) => i % Math.max(1, Math.ceil(all.length / PLOT_POINTS)) === 0);
    const rescaledProfiles: CandidatePlots['rescaledProfiles'] = [];
    if (T !== null) {
      const checkpoints = await this.db.selectFrom('checkpoints').select(['id', 't']).where('run_id', '=', row.run_id).where('t', '<', T).orderBy('seq', 'desc').limit(RESCALED_PROFILES).execute();
      for (const checkpoint of checkpoints.reverse()) {
        const run = await loadCheckpointState(this.db, checkpoint.id);
        const { r, h } = flowProfile(run);
        const scale = Math.sqrt(T - runTime(run));
        const step = Math.max(1, Math.ceil(r.length / PLOT_POINTS));
        const y: number[] = [];
        const hs: number[] = [];
        for (let i = 0; i < r.length; i += step) {
          y.push(r[i]! / scale);
          hs.push(h[i]!);
        }
        rescaledProfiles.push({ t: runTime(run), y, h: hs });
      }
    }
    return { gradientVsTimeToBlowup, rescaledProfiles, history };
  }

  /** Researchers and collaborators who work in the study record verdicts (viewers cannot); audited. */
  async verdict(user: AuthenticatedUser, id: string, body: VerdictRequest): Promise<Candidate & { finer: FinerComparison | null }> {
    const row = await this.findVisible(user, id);
    await this.access.assertCanWork(user, row.study_id);
    await this.db.transaction().execute(async (trx) => {
      await trx
        .updateTable('candidates')
        .set({ verdict: body.verdict, verdict_note: body.note, verdict_by: user.id, verdict_at: new Date(), updated_at: new Date() })
        .where('id', '=', id)
        .execute();
      await this.audit.record(trx, {
        actorId: user.id,
        action: 'candidate.verdict',
        subjectType: 'candidate',
        subjectId: id,
        before: { verdict: row.verdict, note: row.verdict_note },
        after: { verdict: body.verdict, note: body.note },
      });
    });
    return this.get(user, id);
  }

  /**
   * A finer run in one click: from the checkpoint before the indicators fired, with
   * twice the grid points (and refinement cap) and a ten times tighter tolerance.
   */
  async forkFiner(user: AuthenticatedUser, id: string): Promise<Run> {
    const row = await this.findVisible(user, id);
    if (!row.checkpoint_id) throw new ApiException(HttpStatus.CONFLICT, ErrorCode.Conflict, 'This candidate has no checkpoint to start a finer run from.');
    const spec = (await this.db.selectFrom('runs').select('spec').where('id', '=', row.run_id).executeTakeFirstOrThrow()).spec as RunSpec;
    const overrides = {
      grid: { points: Math.min(20_000, spec.grid.points * 2), maxPoints: Math.min(50_000, Math.max(spec.grid.maxPoints * 2, spec.grid.points * 2)) },
      time: { ...spec.time, tolerance: Math.max(1e-12, spec.time.tolerance / 10) },
    };
    const run = await this.checkpoints.fork(user, row.checkpoint_id, { overrides });
    await this.db.updateTable('candidates').set({ finer_run_id: run.id, updated_at: new Date() }).where('id', '=', id).execute();
    return run;
  }
}
