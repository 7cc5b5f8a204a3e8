import { Inject, Injectable } from '@nestjs/common';
import type { Selectable } from 'kysely';
import type { SweepsTable } from '@kiln/shared/db';
import {
  estimateRunCpuSeconds,
  expandSweep,
  type CreateSweepRequest,
  type Page,
  type Run,
  type RunListQuery,
  type RunSpec,
  type Sweep,
  type SweepPreviewRequest,
  type SweepPreviewResponse,
} from '@kiln/shared';
import type { AuthenticatedUser } from '../auth/authenticated-user';
import { badInput, notFound } from '../common/api-error';
import { csvLine } from '../common/csv';
import { DB, type Db } from '../database/database.module';
import { toRun } from '../runs/runs.mapper';
import { RunsRepository } from '../runs/runs.repository';
import { QuotasService } from '../quotas/quotas.service';
import { StudyAccessService } from '../studies/study-access.service';

/** Rows per INSERT when writing a sweep's runs (keeps each statement well under pg's parameter cap). */
const INSERT_BATCH = 500;

@Injectable()
export class SweepsService {
  constructor(
    @Inject(DB) private readonly db: Db,
    private readonly access: StudyAccessService,
    private readonly runs: RunsRepository,
    private readonly quotas: QuotasService,
  ) {}

  private expand(body: SweepPreviewRequest) {
    const expansion = expandSweep(body.base, body.axes);
    if (!expansion.ok) throw badInput(expansion.message, expansion.details);
    return expansion.runs;
  }

  /** Uploads named by the spec (initial table, target profile) must be the submitter's own, of the right kind. */
  private async assertUploadsUsable(user: AuthenticatedUser, spec: RunSpec): Promise<void> {
    const wanted: { path: string; id: string; kind: 'initial-profile' | 'target-profile' }[] = [];
    if (spec.initial.kind === 'table') wanted.push({ path: 'base.initial.uploadId', id: spec.initial.uploadId, kind: 'initial-profile' });
    if (spec.target.kind === 'profile') wanted.push({ path: 'base.target.uploadId', id: spec.target.uploadId, kind: 'target-profile' });
    for (const { path, id, kind } of wanted) {
      const upload = /^[0-9a-f-]{36}$/i.test(id)
        ? await this.db.selectFrom('uploads').select(['kind', 'content']).where('id', '=', id).where('owner_id', '=', user.id).executeTakeFirst()
        : undefined;
      if (!upload) throw badInput(`${path}: no upload of yours has this id`, [{ path, message: 'unknown upload' }]);
      if (upload.kind !== kind) throw badInput(`${path}: this upload is a ${upload.kind}, not a ${kind}`, [{ path, message: `needs a ${kind}` }]);
      const domain = (upload.content as { domain?: string } | null)?.domain;
      if (kind === 'initial-profile' && domain && domain !== spec.domain.kind) {
        throw badInput(`${path}: the table spans the ${domain}, but domain.kind is "${spec.domain.kind}"`, [{ path, message: `a ${domain} profile` }]);
      }
    }
  }

  /** Run count and CPU estimate against the caller's quota; writes nothing. */
  async preview(user: AuthenticatedUser, body: SweepPreviewRequest): Promise<SweepPreviewResponse> {
    await this.access.assertCanWork(user, body.studyId);
    const runs = this.expand(body);
    if (runs[0]) await this.assertUploadsUsable(user, runs[0].spec);
    await this.quotas.assertSpecsWithin(user.id, runs.map((run) => run.spec));
    const cpuSeconds = runs.reduce((sum, run) => sum + estimateRunCpuSeconds(run.spec), 0);
    const quota = await this.quotas.view(user.id);
    return {
      runCount: runs.length,
      estimatedCpuHours: cpuSeconds / 3600,
      quota: {
        slots: quota.slots,
        slotsInUse: quota.slotsInUse,
        cpuHoursRemaining: Math.max(0, quota.cpuHoursPerMonth - quota.cpuHoursUsed),
      },
      sample: runs.slice(0, 5).map((run) => ({ axisValues: run.axisValues })),
    };
  }

  /** Creates the sweep and all its runs in one transaction, after every run's spec was validated. */
  async create(user: AuthenticatedUser, body: CreateSweepRequest): Promise<Sweep> {
    await this.access.assertCanWork(user, body.studyId);
    const runs = this.expand(body);
    if (runs[0]) await this.assertUploadsUsable(user, runs[0].spec);
    await this.quotas.assertSpecsWithin(user.id, runs.map((run) => run.spec));
    const sweep = await this.db.transaction().execute(async (trx) => {
      const row = await trx
        .insertInto('sweeps')
        .values({
          study_id: body.studyId,
          owner_id: user.id,
          name: body.name,
          base_spec: JSON.stringify(body.base),
          axes: JSON.stringify(body.axes),
          run_count: runs.length,
        })
        .returningAll()
        .executeTakeFirstOrThrow();
      for (let i = 0; i < runs.length; i += INSERT_BATCH) {
        await this.runs.insertMany(
          runs.slice(i, i + INSERT_BATCH).map((run) => ({
            study_id: body.studyId,
            sweep_id: row.id,
            owner_id: user.id,
            sweep_index: run.index,
            axis_values: JSON.stringify(run.axisValues),
            spec: JSON.stringify(run.spec),
            priority: body.priority,
          })),
          trx,
        );
      }
      return row;
    });
    return this.toSweep(sweep);
  }

  private async findVisible(user: AuthenticatedUser, id: string): Promise<Selectable<SweepsTable>> {
    const row = await this.db.selectFrom('sweeps').selectAll().where('id', '=', id).executeTakeFirst();
    if (!row) throw notFound('sweep');
    await this.access.assertCanView(user, row.study_id).catch(() => {
      throw notFound('sweep');
    });
    return row;
  }

  async get(user: AuthenticatedUser, id: string): Promise<Sweep> {
    return this.toSweep(await this.findVisible(user, id));
  }

  async listRuns(user: AuthenticatedUser, id: string, query: RunListQuery): Promise<Page<Run>> {
    await this.findVisible(user, id);
    const { rows, total } = await this.runs.listBySweep(id, query);
    return { items: rows.map(toRun), total, page: query.page, pageSize: query.pageSize };
  }

  /** One CSV row per run: its axis values, state, outcome, blow-up estimate and final figures. */
  async resultsCsv(user: AuthenticatedUser, id: string): Promise<{ name: string; csv: string }> {
    const sweep = await this.findVisible(user, id);
    const paths = ((sweep.axes as { path: string }[]) ?? []).map((axis) => axis.path);
    const rows = await this.db
      .selectFrom('runs')
      .select(['id', 'sweep_index', 'axis_values', 'state', 'outcome', 'summary', 'cpu_seconds'])
      .where('sweep_id', '=', id)
      .orderBy('sweep_index')
      .execute();
    let csv = csvLine(['index', ...paths, 'state', 'outcome', 'blowup_T', 'blowup_exponent', 'blowup_kind', 'energy_final', 'tension_final', 'grad_max_final', 't_final', 'cpu_seconds', 'run_id']);
    for (const row of rows) {
      const summary = (row.summary ?? {}) as { blowup?: { T?: number | null; exponent?: number; kind?: string } | null; energyFinal?: number; tensionFinal?: number; gradMaxFinal?: number; tFinal?: number };
      csv += csvLine([
        row.sweep_index,
        ...paths.map((path) => row.axis_values[path]),
        row.state,
        row.outcome,
        summary.blowup?.T,
        summary.blowup?.exponent,
        summary.blowup?.kind,
        summary.energyFinal,
        summary.tensionFinal,
        summary.gradMaxFinal,
        summary.tFinal,
        row.cpu_seconds,
        row.id,
      ]);
    }
    const safeName = sweep.name.replace(/[^\w.-]+/g, '-').slice(0, 60) || 'sweep';
    return { name: `kiln-sweep-${safeName}-results.csv`, csv };
  }

  async listForStudy(user: AuthenticatedUser, studyId: string): Promise<Sweep[]> {
    await this.access.assertCanView(user, studyId);
    const rows = await this.db.selectFrom('sweeps').selectAll().where('study_id', '=', studyId).orderBy('created_at', 'desc').execute();
    return Promise.all(rows.map((row) => this.toSweep(row)));
  }

  private async toSweep(row: Selectable<SweepsTable>): Promise<Sweep> {
    const counts = Object.fromEntries((await this.runs.countsBySweep(row.id)).map((c) => [c.state, Number(c.n)]));
    return {
      id: row.id,
      studyId: row.study_id,
      ownerId: row.owner_id,
      name: row.name,
      baseSpec: row.base_spec,
      axes: row.axes,
      runCount: row.run_count,
      createdAt: row.created_at.toISOString(),
      counts,
    };
  }
}
