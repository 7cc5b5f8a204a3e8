import { Inject, Injectable, Logger } from '@nestjs/common';
import type { CandidateEvidence } from '@kiln/shared';
import { loadCheckpointState } from '../checkpoints/checkpoint-state';
import { KILN_CONFIG } from '../config/config.module';
import type { KilnConfig } from '../config/config.schema';
import { DB, type Db } from '../database/database.module';
import { MailOutboxService } from '../mail/mail-outbox.service';
import { firesWhileRunning, readEvidence } from './candidate-evidence';

/**
 * Finds possible singularities: every run that ended with a blow-up outcome, and
 * running runs whose latest checkpoint already shows the indicators (so nobody
 * waits for a days-long run to end). Runs stopped by numerics-failed never stay
 * candidates. Run by the active scheduler; each run is a candidate at most once.
 */
@Injectable()
export class CandidateScannerService {
  private readonly logger = new Logger('candidates');
  /** Latest checkpoint already read per running run, so a round reads only new ones. */
  private readonly scanned = new Map<string, string>();

  constructor(
    @Inject(DB) private readonly db: Db,
    @Inject(KILN_CONFIG) private readonly config: KilnConfig,
    private readonly outbox: MailOutboxService,
  ) {}

  async scan(): Promise<void> {
    await this.fromOutcomes();
    await this.fromRunningRuns();
    // A run flagged while running that then failed numerically is no singularity.
    await this.db
      .deleteFrom('candidates')
      .where('verdict', 'is', null)
      .where('run_id', 'in', (eb) => eb.selectFrom('runs').select('id').where('outcome', '=', 'numerics-failed'))
      .execute();
  }

  private async fromOutcomes(): Promise<void> {
    const runs = await this.db
      .selectFrom('runs')
      .leftJoin('candidates', 'candidates.run_id', 'runs.id')
      .select(['runs.id'])
      .where('runs.outcome', '=', 'blowup')
      .where((eb) => eb.or([eb('candidates.id', 'is', null), eb('candidates.found_while_running', '=', true).and('candidates.updated_at', '<', eb.ref('runs.finished_at'))]))
      .limit(20)
      .execute();
    for (const { id } of runs) {
      const checkpoints = await this.db.selectFrom('checkpoints').select(['id', 'reason']).where('run_id', '=', id).orderBy('seq', 'desc').limit(2).execute();
      if (checkpoints.length === 0) continue;
      const evidence = readEvidence(await loadCheckpointState(this.db, checkpoints[0]!.id));
      // A finer run starts before the indicators fired: the checkpoint before the last.
      await this.upsert(id, evidence, (checkpoints[1] ?? checkpoints[0])!.id, false);
    }
  }

  private async fromRunningRuns(): Promise<void> {
    const latest = await this.db
      .selectFrom('runs')
      .innerJoin('checkpoints', 'checkpoints.run_id', 'runs.id')
      .leftJoin('candidates', 'candidates.run_id', 'runs.id')
      .select(['runs.id as run_id', 'checkpoints.id as checkpoint_id', 'checkpoints.seq'])
      .where('runs.state', 'in', ['running', 'paused'])
      .where('candidates.id', 'is', null)
      .orderBy('runs.id')
      .orderBy('checkpoints.seq', 'desc')
      .distinctOn('runs.id')
      .execute();
    for (const row of latest) {
      if (this.scanned.get(row.run_id) === row.checkpoint_id) continue;
      this.scanned.set(row.run_id, row.checkpoint_id);
      try {
        const evidence = readEvidence(await loadCheckpointState(this.db, row.checkpoint_id));
        if (firesWhileRunning(evidence)) await this.upsert(row.run_id, evidence, row.checkpoint_id, true);
      } catch (error) {
        this.logger.warn(`could not read the latest checkpoint of run ${row.run_id}: ${error instanceof Error ? error.message : String(error)}`);
      }
    }
    if (this.scanned.size > 10_000) this.scanned.clear();
  }

  private async upsert(runId: string, evidence: CandidateEvidence, checkpointId: string, whileRunning: boolean): Promise<void> {
    const e = evidence.estimate;
    await this.db.transaction().execute(async (trx) => {
      const run = await trx
        .selectFrom('runs')
        .innerJoin('users', 'users.id', 'runs.owner_id')
        .select(['runs.study_id', 'runs.sweep_id', 'users.email', 'users.notify_candidate'])
        .where('runs.id', '=', runId)
        .executeTakeFirstOrThrow();
      const values = {
        kind: e.kind,
        confidence: e.confidence,
        blowup_t: e.T,
        blowup_t_uncertainty: e.TUncertainty,
        exponent: e.exponent,
        exponent_uncertainty: e.exponentUncertainty,
        evidence: JSON.stringify(evidence),
        checkpoint_id: checkpointId,
        updated_at: new Date(),
      };
      const candidate = await trx
        .insertInto('candidates')
        .values({ run_id: runId, study_id: run.study_id, sweep_id: run.sweep_id, found_while_running: whileRunning, ...values })
        .onConflict((oc) => oc.column('run_id').doUpdateSet(values))
        .returning('id')
        .executeTakeFirstOrThrow();
      if (run.notify_candidate) {
        await this.outbox.enqueue(trx, {
          dedupeKey: `candidate:${candidate.id}`,
          to: run.email,
          subject: `Possible singularity in one of your runs (${e.kind})`,
          text: [
            `Kiln flagged run ${runId} as a possible singularity${whileRunning ? ' while it is still running' : ''}:`,
            `  kind ${e.kind}, confidence ${e.confidence.toFixed(2)}` + (e.T !== null ? `, T̂ ≈ ${e.T.toPrecision(6)}` : '') + (e.exponent !== null ? `, exponent ≈ ${e.exponent.toPrecision(3)}` : ''),
            '',
            'This is a numerical indication, not a proof: judge the evidence and confirm it with a finer run.',
            `${this.config.KILN_PUBLIC_URL}/candidates/${candidate.id}`,
          ].join('\n'),
        });
      }
    });
  }
}
