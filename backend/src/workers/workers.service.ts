import { Inject, Injectable } from '@nestjs/common';
import type { WorkerInfo } from '@kiln/shared';
import { KILN_CONFIG } from '../config/config.module';
import type { KilnConfig } from '../config/config.schema';
import { DB, type Db } from '../database/database.module';

@Injectable()
export class WorkersService {
  constructor(
    @Inject(KILN_CONFIG) private readonly config: KilnConfig,
    @Inject(DB) private readonly db: Db,
  ) {}

  /** Worker processes that have not signed off, with the runs each holds. */
  async list(): Promise<WorkerInfo[]> {
    const staleBefore = Date.now() - this.config.KILN_WORKER_STALE_SECONDS * 1000;
    const workers = await this.db.selectFrom('workers').selectAll().where('stopped_at', 'is', null).orderBy('host').orderBy('pid').execute();
    const held = await this.db
      .selectFrom('runs')
      .select(['id', 'study_id', 'worker_id'])
      .where('state', '=', 'running')
      .where('worker_id', 'in', workers.length ? workers.map((w) => w.id) : [''])
      .execute();
    return workers.map((worker) => ({
      id: worker.id,
      host: worker.host,
      pid: worker.pid,
      slots: worker.slots,
      startedAt: worker.started_at.toISOString(),
      lastHeartbeatAt: worker.last_heartbeat_at.toISOString(),
      stale: worker.last_heartbeat_at.getTime() < staleBefore,
      runs: held.filter((run) => run.worker_id === worker.id).map((run) => ({ id: run.id, studyId: run.study_id })),
    }));
  }
}
