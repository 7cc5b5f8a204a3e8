import type { WorkerInfo } from '@kiln/shared';
import { Card, Skeleton } from 'antd';
import { QueryError } from '@/components/query-error';
import { StatusTag } from '@/components/status-tag';
import { formatAge, plural } from '@/lib/format';
import { useWorkers } from '../api/get-workers';

function WorkerRow({ worker }: { worker: WorkerInfo }) {
  const busy = worker.runs.length;
  return (
    <li className="worker-row" data-stale={worker.stale}>
      <div className="worker-row__head">
        <span className="worker-row__host">{worker.host}</span>
        <span className="muted">pid {worker.pid}</span>
        {worker.stale ? <StatusTag tone="down" label="Stale" title="No heartbeat recently: the host may be gone" /> : <StatusTag tone="ok" label="Alive" />}
      </div>
      <div className="worker-row__slots" aria-label={`${busy} of ${worker.slots} slots busy`}>
        {Array.from({ length: worker.slots }, (_, i) => (
          <span key={i} className={`slot-pip${i < busy ? ' slot-pip--busy' : ''}`} />
        ))}
        <span className="muted">
          {busy} of {plural(worker.slots, 'slot', 'slots')} busy · heartbeat {formatAge(worker.lastHeartbeatAt)}
        </span>
      </div>
    </li>
  );
}

/** The worker hosts at a glance: alive or stale, slots busy, last heartbeat. */
export function WorkerPoolPanel() {
  const workers = useWorkers();
  const data = workers.data;
  const slots = data?.filter((w) => !w.stale).reduce((n, w) => n + w.slots, 0) ?? 0;
  const busy = data?.filter((w) => !w.stale).reduce((n, w) => n + w.runs.length, 0) ?? 0;
  return (
    <Card title="Worker pool" className="panel" size="small" extra={data ? <span className="panel__meta">{busy} of {slots} slots busy</span> : null}>
      {workers.isPending ? (
        <Skeleton active paragraph={{ rows: 2 }} />
      ) : workers.isError ? (
        <QueryError what="the worker pool" error={workers.error} onRetry={() => void workers.refetch()} />
      ) : data!.length === 0 ? (
        <div className="empty-state__body">
          No worker has registered, so no run can start. A lab admin starts workers with the start script on each compute host.
        </div>
      ) : (
        <ul className="worker-list">
          {data!.map((w) => (
            <WorkerRow key={w.id} worker={w} />
          ))}
        </ul>
      )}
    </Card>
  );
}
