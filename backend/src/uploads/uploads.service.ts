import { createHash } from 'node:crypto';
import { HttpStatus, Inject, Injectable } from '@nestjs/common';
import {
  deserializeCheckpoint,
  ErrorCode,
  parseInitialProfileCsv,
  parseTargetProfileCsv,
  runTime,
  UPLOAD_LIMITS,
  type CsvProblem,
  type Run,
  type UploadInfo,
  type UploadKind,
} from '@kiln/shared';
import type { AuthenticatedUser } from '../auth/authenticated-user';
import { ApiException, badInput, notFound } from '../common/api-error';
import { AuditService } from '../audit/audit.service';
import { DB, type Db } from '../database/database.module';
import { QuotasService } from '../quotas/quotas.service';
import { RunEventsService } from '../queue/run-events.service';
import { RunsService } from '../runs/runs.service';
import { StudyAccessService } from '../studies/study-access.service';

const problemsToDetails = (problems: CsvProblem[]) =>
  problems.map((p) => ({ path: p.row ? `row ${p.row}${p.column ? `, column ${p.column}` : ''}` : p.column || 'file', message: p.message }));

const sha256 = (bytes: Uint8Array) => createHash('sha256').update(bytes).digest('hex');

/** Uploads are parsed and checked completely before anything is stored. */
@Injectable()
export class UploadsService {
  constructor(
    @Inject(DB) private readonly db: Db,
    private readonly audit: AuditService,
    private readonly access: StudyAccessService,
    private readonly quotas: QuotasService,
    private readonly runs: RunsService,
    private readonly events: RunEventsService,
  ) {}

  async store(user: AuthenticatedUser, kind: UploadKind, file: { originalname: string; buffer: Buffer; size: number }): Promise<UploadInfo> {
    const filename = (file.originalname || 'upload').slice(0, 200);
    if (kind === 'checkpoint') {
      if (file.size > UPLOAD_LIMITS.checkpointBytes) throw badInput(`a checkpoint file may have at most ${UPLOAD_LIMITS.checkpointBytes} bytes`);
      let summary: Record<string, unknown>;
      try {
        const run = deserializeCheckpoint(new Uint8Array(file.buffer.buffer, file.buffer.byteOffset, file.buffer.byteLength));
        summary = { step: run.s.step, t: runTime(run), points: run.r.length, spec: run.spec };
      } catch (error) {
        throw badInput(`this is not a readable Kiln checkpoint: ${error instanceof Error ? error.message : String(error)}`, [{ path: 'file', message: 'not a Kiln checkpoint (see docs/checkpoint-format.md)' }]);
      }
      return this.insert(user, { kind, filename, size_bytes: file.size, bytes: file.buffer, content: null, sha256: sha256(file.buffer) }, summary);
    }
    if (file.size > UPLOAD_LIMITS.csvBytes) throw badInput(`a profile table may have at most ${UPLOAD_LIMITS.csvBytes} bytes`);
    const text = file.buffer.toString('utf8');
    const parsed = kind === 'initial-profile' ? parseInitialProfileCsv(text) : parseTargetProfileCsv(text);
    if (!parsed.ok) {
      const first = parsed.problems[0]!;
      throw badInput(`the ${kind === 'initial-profile' ? 'initial profile' : 'target profile'} was not stored: ${first.row ? `row ${first.row}${first.column ? `, column ${first.column}` : ''}: ` : ''}${first.message}`, problemsToDetails(parsed.problems));
    }
    const rows = 'r' in parsed.profile ? parsed.profile.r.length : parsed.profile.h.length;
    const summary = { rows, ...('domain' in parsed.profile ? { domain: parsed.profile.domain } : {}) };
    return this.insert(user, { kind, filename, size_bytes: file.size, bytes: null, content: JSON.stringify(parsed.profile), sha256: sha256(file.buffer) }, summary);
  }

  private async insert(
    user: AuthenticatedUser,
    values: { kind: UploadKind; filename: string; size_bytes: number; bytes: Buffer | null; content: string | null; sha256: string },
    summary: Record<string, unknown>,
  ): Promise<UploadInfo> {
    const row = await this.db.transaction().execute(async (trx) => {
      const inserted = await trx.insertInto('uploads').values({ ...values, owner_id: user.id, summary: JSON.stringify(summary) }).returning(['id', 'created_at']).executeTakeFirstOrThrow();
      await this.audit.record(trx, { actorId: user.id, action: 'upload.create', subjectType: 'upload', subjectId: inserted.id, after: { kind: values.kind, filename: values.filename, size: values.size_bytes } });
      return inserted;
    });
    return { id: row.id, kind: values.kind, filename: values.filename, sizeBytes: values.size_bytes, sha256: values.sha256, createdAt: row.created_at.toISOString(), summary };
  }

  async list(user: AuthenticatedUser): Promise<UploadInfo[]> {
    const rows = await this.db
      .selectFrom('uploads')
      .select(['id', 'kind', 'filename', 'size_bytes', 'sha256', 'created_at', 'summary'])
      .where('owner_id', '=', user.id)
      .orderBy('created_at', 'desc')
      .execute();
    return rows.map((row) => ({ id: row.id, kind: row.kind, filename: row.filename, sizeBytes: row.size_bytes, sha256: row.sha256, createdAt: row.created_at.toISOString(), summary: row.summary }));
  }

  /**
   * Resumes an uploaded checkpoint as a new run of the caller in one of their
   * studies: the run starts from exactly that state (bit-identical continuation).
   */
  async importCheckpoint(user: AuthenticatedUser, uploadId: string, studyId: string): Promise<Run> {
    await this.access.assertCanWork(user, studyId);
    const upload = await this.db.selectFrom('uploads').selectAll().where('id', '=', uploadId).where('owner_id', '=', user.id).executeTakeFirst();
    if (!upload) throw notFound('upload');
    if (upload.kind !== 'checkpoint' || !upload.bytes) throw new ApiException(HttpStatus.UNPROCESSABLE_ENTITY, ErrorCode.Unprocessable, 'only a checkpoint upload can be resumed');
    const run = deserializeCheckpoint(new Uint8Array(upload.bytes.buffer, upload.bytes.byteOffset, upload.bytes.byteLength));
    await this.quotas.assertSpecsWithin(user.id, [run.spec]);
    const runId = await this.db.transaction().execute(async (trx) => {
      const created = await trx
        .insertInto('runs')
        .values({ study_id: studyId, owner_id: user.id, spec: JSON.stringify(run.spec), axis_values: '{}' })
        .returning('id')
        .executeTakeFirstOrThrow();
      await trx
        .insertInto('checkpoints')
        .values({
          run_id: created.id,
          seq: 1,
          step: run.s.step,
          t: runTime(run),
          points: run.r.length,
          reason: 'start',
          cpu_seconds: 0,
          size_bytes: upload.size_bytes,
          sha256: upload.sha256,
          state: upload.bytes!,
        })
        .execute();
      await this.audit.record(trx, { actorId: user.id, action: 'checkpoint.import', subjectType: 'run', subjectId: created.id, after: { uploadId, studyId } });
      return created.id;
    });
    await this.events.publish({ type: 'state', runId, state: 'queued', outcome: null, waitReason: null });
    return this.runs.get(user, runId);
  }
}
