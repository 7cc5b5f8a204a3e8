import type { DependencyHealth, HealthResponse } from '@kiln/shared';
import { Button, Card, Skeleton, Tooltip } from 'antd';
import type { ReactNode } from 'react';
import { IconRefresh } from '@/components/icons';
import { QueryError } from '@/components/query-error';
import { StatusTag } from '@/components/status-tag';
import { formatLatency, formatTime, plural } from '@/lib/format';
import { useHealth } from '../api/get-health';

function Readout({ name, status, detail }: { name: string; status: ReactNode; detail: ReactNode }) {
  return (
    <section className="readout" aria-label={name}>
      <div className="readout__name">{name}</div>
      <div className="readout__status">{status}</div>
      <div className="readout__detail">{detail}</div>
    </section>
  );
}

function DependencyReadout({ name, health }: { name: string; health: DependencyHealth }) {
  const up = health.status === 'up';
  return (
    <Readout
      name={name}
      status={<StatusTag tone={up ? 'ok' : 'down'} label={up ? 'Up' : 'Down'} />}
      detail={
        up
          ? health.latencyMs !== undefined
            ? `answered in ${formatLatency(health.latencyMs)}`
            : 'answering'
          : (health.error ?? 'not answering')
      }
    />
  );
}

function WorkersReadout({ workers }: { workers: HealthResponse['workers'] }) {
  const tone = workers.alive > 0 ? 'ok' : 'warn';
  return (
    <Readout
      name="Worker pool"
      status={<StatusTag tone={tone} label={workers.alive > 0 ? `${workers.alive} alive` : 'None alive'} />}
      detail={
        <>
          <span>{plural(workers.slots, 'slot', 'slots')} offered</span>
          {workers.stale > 0 ? (
            <span className="readout__aside">
              <StatusTag tone="idle" label={`${workers.stale} stale`} title="Stopped sending heartbeats" />
            </span>
          ) : (
            <span className="readout__aside">no stale workers</span>
          )}
        </>
      }
    />
  );
}

function HealthBody({ health }: { health: HealthResponse }) {
  return (
    <div className="readout-grid">
      <DependencyReadout name="PostgreSQL" health={health.db} />
      <DependencyReadout name="Redis" health={health.redis} />
      <WorkersReadout workers={health.workers} />
    </div>
  );
}

/** PostgreSQL, Redis and the worker pool, as `GET /api/health` reports them, refreshed every 30 s. */
export function ServiceHealthPanel({ note }: { note?: ReactNode }) {
  const health = useHealth();
  const data = health.data;

  const overall = data ? (
    data.status === 'ok' ? (
      <StatusTag tone="ok" label="All services answering" />
    ) : (
      <StatusTag tone="down" label="Degraded" />
    )
  ) : null;

  return (
    <Card
      title="Service health"
      className="panel"
      extra={
        <div className="panel__extra">
          {overall}
          {data ? <span className="panel__meta">checked {formatTime(data.time)}</span> : null}
          <Tooltip title="Check now">
            <Button
              size="small"
              type="text"
              aria-label="Check service health now"
              icon={<IconRefresh />}
              loading={health.isFetching}
              onClick={() => void health.refetch()}
            />
          </Tooltip>
        </div>
      }
    >
      {health.isPending ? (
        <Skeleton active title={false} paragraph={{ rows: 3 }} />
      ) : health.isError && !data ? (
        <QueryError what="the service health" error={health.error} onRetry={() => void health.refetch()} />
      ) : data ? (
        <>
          {health.isError ? (
            <div className="panel__stale-note">
              <StatusTag tone="warn" label="Out of date" /> The last check failed; showing the result from{' '}
              {formatTime(data.time)}.
            </div>
          ) : null}
          <HealthBody health={data} />
          {note ? <div className="panel__note">{note}</div> : null}
        </>
      ) : null}
    </Card>
  );
}
