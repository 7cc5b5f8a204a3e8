import type { WorkerInfo } from '@kiln/shared';
import { Card, Skeleton, Table, type TableColumnsType } from 'antd';
import { Link } from 'react-router-dom';
import { IconWarning } from '@/components/icons';
import { QueryError } from '@/components/query-error';
import { StatusTag } from '@/components/status-tag';
import { paths } from '@/config/paths';
import { formatAge, formatDateTime, plural, shortId } from '@/lib/format';
import { useWorkerHosts } from '../api/get-workers';
import { useNow } from './use-now';

/** The worker processes: which host, its slots and runs, and whether its heartbeat is recent. */
export function WorkerHostsTable({ staleAfterSeconds }: { staleAfterSeconds?: number }) {
  const workers = useWorkerHosts();
  const now = useNow();
  const data = workers.data;
  const live = data?.filter((w) => !w.stale) ?? [];
  const stale = data?.filter((w) => w.stale) ?? [];
  const slots = live.reduce((n, w) => n + w.slots, 0);
  const busy = live.reduce((n, w) => n + w.runs.length, 0);

  const columns: TableColumnsType<WorkerInfo> = [
    {
      title: 'Host',
      dataIndex: 'host',
      render: (_, worker) => (
        <>
          <div className="strong-text mono">{worker.host}</div>
          <div className="table-sub">
            pid <span className="mono">{worker.pid}</span>
          </div>
        </>
      ),
    },
    {
      title: 'Health',
      key: 'health',
      width: 130,
      render: (_, worker) =>
        worker.stale ? (
          <StatusTag tone="down" label="Stale" icon={<IconWarning />} title="No heartbeat recently: the host or the worker process may be gone" />
        ) : (
          <StatusTag tone="ok" label="Alive" title="Heartbeats arriving" />
        ),
    },
    {
      title: 'Slots',
      key: 'slots',
      width: 190,
      render: (_, worker) => (
        <div className="worker-slots" aria-label={`${worker.runs.length} of ${worker.slots} slots busy`}>
          <span className="worker-slots__pips" aria-hidden="true">
            {Array.from({ length: worker.slots }, (_, i) => (
              <span key={i} className={`slot-pip${i < worker.runs.length ? ' slot-pip--busy' : ''}`} />
            ))}
          </span>
          <span>
            {worker.runs.length} of {plural(worker.slots, 'slot', 'slots')} busy
          </span>
        </div>
      ),
    },
    {
      title: 'Last heartbeat',
      key: 'heartbeat',
      width: 150,
      className: 'numeric-cell',
      render: (_, worker) => (
        <span title={formatDateTime(worker.lastHeartbeatAt)} data-testid="heartbeat">
          {formatAge(worker.lastHeartbeatAt, now)}
        </span>
      ),
    },
    {
      title: 'Up since',
      key: 'started',
      width: 170,
      className: 'numeric-cell',
      render: (_, worker) => <span title={formatAge(worker.startedAt, now)}>{formatDateTime(worker.startedAt)}</span>,
    },
    {
      title: 'Runs held',
      key: 'runs',
      render: (_, worker) =>
        worker.runs.length === 0 ? (
          <span className="muted">none</span>
        ) : (
          <span className="run-links">
            {worker.runs.map((run) => (
              <Link key={run.id} to={paths.run.getHref(run.id)} className="mono-link" title={`Run ${run.id}`}>
                {shortId(run.id)}
              </Link>
            ))}
          </span>
        ),
    },
  ];

  const meta = data
    ? `${plural(data.length, 'worker', 'workers')} · ${busy} of ${plural(slots, 'live slot', 'live slots')} busy${stale.length ? ` · ${stale.length} stale` : ''}`
    : null;

  return (
    <Card title="Worker hosts" className="panel" extra={meta ? <span className="panel__meta">{meta}</span> : null}>
      {workers.isPending ? (
        <Skeleton active title={false} paragraph={{ rows: 3 }} />
      ) : workers.isError ? (
        <QueryError what="the worker hosts" error={workers.error} onRetry={() => void workers.refetch()} />
      ) : (
        <>
          {stale.length ? (
            <div className="panel__stale-note" role="status">
              <IconWarning />
              <span>
                {plural(stale.length, 'worker has', 'workers have')} stopped sending heartbeats. Check{' '}
                {stale.map((w) => w.host).filter((h, i, all) => all.indexOf(h) === i).join(', ')} and restart the worker there.
                Until it beats again, its slots are not counted when runs are admitted.
              </span>
            </div>
          ) : null}
          <Table<WorkerInfo>
            rowKey="id"
            size="small"
            columns={columns}
            dataSource={data}
            rowClassName={(worker) => (worker.stale ? 'row--stale' : '')}
            pagination={false}
            locale={{
              emptyText:
                'No worker has registered, so no run can start. Start a worker on each compute host with the start script; it appears here within a few seconds.',
            }}
          />
        </>
      )}
      <p className="panel__note">
        Workers send a heartbeat every few seconds{staleAfterSeconds ? `; one silent for ${staleAfterSeconds} s is marked stale` : '; a silent one is marked stale'}.
        This list refreshes every 10 seconds.
      </p>
    </Card>
  );
}
