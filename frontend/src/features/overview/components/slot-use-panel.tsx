import { Card, Progress } from 'antd';
import { formatCpuAmount, formatCpuHours, plural } from '@/lib/format';
import type { MyQuota } from '../api/get-my-quota';

/** The signed-in person's runs in flight against their slot cap, and this month's CPU-hours. */
export function SlotUsePanel({
  running,
  queued,
  waiting,
  slots,
  quota,
}: {
  running: number | undefined;
  queued: number | undefined;
  waiting: number | undefined;
  /** The slot cap when only it is known (from the sweep preview). */
  slots: number | null;
  quota: MyQuota | null | undefined;
}) {
  const known = running !== undefined || !!quota;
  const cap = quota?.slots ?? slots;
  const used = quota?.slotsInUse ?? running ?? 0;
  return (
    <Card title="Your slots" className="panel" size="small">
      {known ? (
        <>
          {cap !== null ? (
            <div className="slot-meter" role="img" aria-label={`${used} of ${cap} slots in use`}>
              {Array.from({ length: Math.max(cap, used) }, (_, i) => (
                <span key={i} className={`slot-pip slot-pip--lg${i < used ? ' slot-pip--busy' : ''}`} />
              ))}
            </div>
          ) : null}
          <div className="figure__value figure__value--sm" data-testid="slot-use">
            {cap !== null ? `${used} of ${plural(cap, 'slot', 'slots')} in use` : `${plural(used, 'run', 'runs')} computing`}
          </div>
          <p className="panel__note">
            {queued ?? 0} in the queue, {waiting ?? 0} waiting. At most {cap ?? 'your slot cap'} of your runs compute at a
            time; the rest wait their turn fairly with everyone else's.
          </p>
          {quota ? (
            <div className="cpu-month">
              <div className="figure__name">CPU-hours this month</div>
              <Progress
                percent={quota.cpuHoursPerMonth > 0 ? Math.min(100, (100 * quota.cpuHoursUsed) / quota.cpuHoursPerMonth) : 100}
                showInfo={false}
                size="small"
                strokeColor="#c4561d"
                aria-label="CPU-hours used this month"
              />
              <div className="muted">
                {formatCpuAmount(quota.cpuHoursUsed)} of {formatCpuHours(quota.cpuHoursPerMonth)} used; runs start with at most{' '}
                {quota.maxGridPoints} grid points
              </div>
            </div>
          ) : null}
        </>
      ) : (
        <p className="muted">Counting your runs…</p>
      )}
    </Card>
  );
}
