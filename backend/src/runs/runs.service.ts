import { HttpStatus, Inject, Injectable } from '@nestjs/common';
import { defer, filter, from, interval, map, merge, mergeMap, type Observable } from 'rxjs';
import { ErrorCode, Role, type Page, type RunSearchQuery, type CheckpointInfo, type MetricSample, type MetricsQuery, type Run, type RunEvent } from '@kiln/shared';
import type { AuthenticatedUser } from '../auth/authenticated-user';
import { ApiException, notFound, unauthenticated } from '../common/api-error';
import { DB, type Db } from '../database/database.module';
import { QuotasService } from '../quotas/quotas.service';
import { RunEventsService } from '../queue/run-events.service';
import { RunQueue } from '../queue/run-queue';
import { StudyAccessService } from '../studies/study-access.service';
import { API_TOKEN_PREFIX, ApiTokensService } from '../tokens/api-tokens.service';
import { UsersRepository } from '../users/users.repository';
import { toUser } from '../users/users.mapper';
import { EventTicketService, EVENT_TICKET_SECONDS } from './event-ticket.service';
import { REQUEUE_FIELDS, stopUnclaimedRun } from './run-control';
import { toCheckpointInfo, toMetricSample, toRun } from './runs.mapper';
import { RunsRepository } from './runs.repository';

const conflict = (message: string) => new ApiException(HttpStatus.CONFLICT, ErrorCode.Conflict, message);

/** How often an idle live stream says it is still there (proxies close silent ones). */
const PING_MS = 15_000;

@Injectable()
export class RunsService {
  constructor(
    @Inject(DB) private readonly db: Db,
    private readonly runs: RunsRepository,
    private readonly access: StudyAccessService,
    private readonly events: RunEventsService,
    private readonly queue: RunQueue,
    private readonly tickets: EventTicketService,
    private readonly users: UsersRepository,
    private readonly apiTokens: ApiTokensService,
    private readonly quotas: QuotasService,
  ) {}

  /** The run, when the caller may see it (404 otherwise, so ids reveal nothing). */
  async get(user: AuthenticatedUser, id: string): Promise<Run> {
    const row = await this.runs.findById(id);
    if (!row) throw notFound('run');
    await this.access.assertCanView(user, row.study_id).catch(() => {
      throw notFound('run');
    });
    return toRun(row);
  }

  private async getForWork(user: AuthenticatedUser, id: string): Promise<Run> {
    const run = await this.get(user, id);
    await this.access.assertCanWork(user, run.studyId);
    return run;
  }

  /** Runs across studies: the caller's own, or all they can see (admins: all). */
  async search(user: AuthenticatedUser, query: RunSearchQuery): Promise<Page<Run>> {
    if (query.studyId) await this.access.assertCanView(user, query.studyId);
    const { rows, total } = await this.runs.list(
      {
        studyId: query.studyId,
        ownerId: query.scope === 'mine' ? user.id : undefined,
        visibleTo: user.role === Role.Admin ? undefined : user.id,
      },
      query,
    );
    return { items: rows.map(toRun), total, page: query.page, pageSize: query.pageSize };
  }

  async metrics(user: AuthenticatedUser, id: string, query: MetricsQuery): Promise<MetricSample[]> {
    await this.get(user, id);
    return (await this.runs.metrics(id, query.from, query.limit)).map(toMetricSample);
  }

  async checkpoints(user: AuthenticatedUser, id: string): Promise<CheckpointInfo[]> {
    await this.get(user, id);
    return (await this.runs.checkpoints(id)).map(toCheckpointInfo);
  }

  async pause(user: AuthenticatedUser, id: string): Promise<Run> {
    return this.stop(user, id, 'pause');
  }

  async cancel(user: AuthenticatedUser, id: string): Promise<Run> {
    return this.stop(user, id, 'cancel');
  }

  private async stop(user: AuthenticatedUser, id: string, request: 'pause' | 'cancel'): Promise<Run> {
    const run = await this.getForWork(user, id);
    const resting = request === 'pause' ? 'paused' : 'cancelled';
    if (!['queued', 'waiting', 'running'].includes(run.state)) {
      throw conflict(`The run is ${run.state}; only queued, waiting or running runs can be ${resting}.`);
    }
    const unclaimed = await stopUnclaimedRun(this.db, id, resting);
    if (unclaimed.stopped) {
      if (unclaimed.attempt > 0) await this.queue.removeIfWaiting({ runId: id, attempt: unclaimed.attempt }).catch(() => undefined);
      await this.events.publish({ type: 'state', runId: id, state: resting, outcome: null, waitReason: null });
      return this.get(user, id);
    }
    // A worker holds it: write the request, then tell the holder; it checkpoints and stops.
    await this.db
      .updateTable('runs')
      .set({ control_request: request, updated_at: new Date() })
      .where('id', '=', id)
      .where('state', '=', 'running')
      .execute();
    await this.events.announceControl({ runId: id, request });
    return this.get(user, id);
  }

  async resume(user: AuthenticatedUser, id: string): Promise<Run> {
    const run = await this.getForWork(user, id);
    if (run.state === 'finished' && run.outcome === 'time-limit' && run.outcomeReason === 't-max') {
      throw conflict('The run reached its end time t_max; resuming would stop at once. Fork it from its last checkpoint with a larger time.tMax instead.');
    }
    const resumable = ['paused', 'cancelled', 'failed'].includes(run.state) || (run.state === 'finished' && run.outcome === 'time-limit');
    if (!resumable) {
      throw conflict(
        run.state === 'finished'
          ? `The run ended ${run.outcome}; fork it from a checkpoint to continue with changes.`
          : `The run is ${run.state}; only paused, cancelled, failed or time-limited runs can be resumed.`,
      );
    }
    // Quotas bind every path into the queue: a limit lowered since submission applies on resume.
    await this.quotas.assertSpecsWithin(run.ownerId, [run.spec]);
    await this.requeue(id, null);
    return this.get(user, id);
  }

  /** Puts a resting run back in the queue, optionally from one of its checkpoints. */
  async requeue(runId: string, fromCheckpointId: string | null): Promise<void> {
    await this.db
      .updateTable('runs')
      .set({ ...REQUEUE_FIELDS, resume_checkpoint_id: fromCheckpointId, updated_at: new Date() })
      .where('id', '=', runId)
      .where('state', 'in', ['paused', 'cancelled', 'failed', 'finished'])
      .execute();
    await this.events.publish({ type: 'state', runId, state: 'queued', outcome: null, waitReason: null });
  }

  async eventTicket(user: AuthenticatedUser, id: string): Promise<{ ticket: string; expiresIn: number }> {
    await this.get(user, id);
    return { ticket: await this.tickets.issue(user.id, id), expiresIn: EVENT_TICKET_SECONDS };
  }

  /** Who is asking for a live stream: a ticket for this run, or a bearer token. */
  async authenticateStream(id: string, ticket: string | undefined, authorization: string | undefined): Promise<AuthenticatedUser> {
    let userId: string | undefined;
    if (ticket) userId = await this.tickets.verify(ticket, id);
    else if (authorization?.startsWith(`Bearer ${API_TOKEN_PREFIX}`)) userId = (await this.apiTokens.authenticate(authorization.slice(7)))?.id;
    else if (authorization?.startsWith('Bearer ')) userId = await this.tickets.verifyAccessToken(authorization.slice(7));
    const row = userId ? await this.users.findById(userId).catch(() => undefined) : undefined;
    if (!row || row.disabled) throw unauthenticated('This live stream needs a valid ticket (POST /api/runs/:id/events/ticket) or bearer token.');
    return toUser(row);
  }

  /** Live events of one run: a snapshot first, then what the workers publish, and pings. */
  async stream(user: AuthenticatedUser, id: string): Promise<Observable<{ data: RunEvent | { type: 'ping' } }>> {
    await this.get(user, id);
    const snapshot = defer(() => from(this.snapshotEvents(user, id))).pipe(mergeMap((events) => from(events)));
    return merge(
      snapshot,
      this.events.stream.pipe(filter((event) => event.runId === id)),
      interval(PING_MS).pipe(map(() => ({ type: 'ping' as const }))),
    ).pipe(map((data) => ({ data })));
  }

  private async snapshotEvents(user: AuthenticatedUser, id: string): Promise<RunEvent[]> {
    const run = await this.get(user, id);
    const events: RunEvent[] = [{ type: 'state', runId: id, state: run.state, outcome: run.outcome, waitReason: run.waitReason }];
    if (run.progress) events.push({ type: 'progress', runId: id, sample: run.progress, cpuSeconds: run.cpuSeconds });
    return events;
  }
}
