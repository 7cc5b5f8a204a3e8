import type { User } from '@kiln/shared';
import './lab-admin.css';
import { Card, Skeleton } from 'antd';
import { BarChart } from 'echarts/charts';
import * as echarts from 'echarts/core';
import { useMemo } from 'react';
import { Chart } from '@/components/chart';
import { QueryError } from '@/components/query-error';
import { StatusTag } from '@/components/status-tag';
import { palette } from '@/config/palette';
import { formatNumber, plural } from '@/lib/format';
import { roleLabel } from '@/lib/roles';
import { useOwnQuota, useOwnUsage } from '../api/get-own-quota';
import { formatMonth, lastMonths } from './month-label';
import { formatPoints, formatRunTime } from './quota-format';
import { UsageMeter } from './usage-meter';

echarts.use([BarChart]);

const MONTHS = 6;

/** The signed-in person's own share of the machines: slots, this month's CPU-hours, and the limits on one run. */
export function OwnQuotaPanel({ user }: { user: User }) {
  const quota = useOwnQuota();
  const q = quota.data;
  return (
    <Card
      title="Your quota"
      className="panel"
      extra={q ? <StatusTag tone={q.custom ? 'ember' : 'idle'} label={q.custom ? 'Set for you' : `${roleLabel[user.role]} default`} /> : null}
    >
      {quota.isPending ? (
        <Skeleton active paragraph={{ rows: 3 }} />
      ) : quota.isError ? (
        <QueryError what="your quota" error={quota.error} onRetry={() => void quota.refetch()} />
      ) : (
        <>
          <div className="readout-grid own-quota__grid">
            <div className="readout">
              <span className="readout__name">Slots</span>
              <span className="figure__value figure__value--sm" data-testid="own-slots">
                {q!.slotsInUse} of {plural(q!.slots, 'slot', 'slots')} in use
              </span>
              <span className="slot-meter" aria-hidden="true">
                {Array.from({ length: Math.min(64, Math.max(q!.slots, q!.slotsInUse)) }, (_, i) => (
                  <span key={i} className={`slot-pip${i < q!.slotsInUse ? ' slot-pip--busy' : ''}`} />
                ))}
              </span>
            </div>
            <div className="readout">
              <span className="readout__name">CPU-hours this month</span>
              <UsageMeter used={q!.cpuHoursUsed} allowance={q!.cpuHoursPerMonth} />
            </div>
            <div className="readout">
              <span className="readout__name">Limits on one run</span>
              <span className="readout__detail">grid up to {formatPoints(q!.maxGridPoints)}</span>
              <span className="readout__detail">up to {formatRunTime(q!.maxRunCpuSeconds)} of CPU time</span>
            </div>
          </div>
          <p className="panel__note">
            Runs beyond your slots wait in the queue and start as yours finish. When this month's CPU-hours are used up, your
            running runs are checkpointed and paused; they continue next month (UTC) or when a lab admin raises your allowance.
            Ask a lab admin if you need more.
          </p>
        </>
      )}
    </Card>
  );
}

/** The signed-in person's own CPU-hours over the last months. */
export function OwnUsagePanel() {
  const usage = useOwnUsage(MONTHS);
  const months = useMemo(() => lastMonths(MONTHS), []);
  const byMonth = useMemo(() => {
    const map = new Map<string, number>();
    for (const row of usage.data ?? []) map.set(row.month.slice(0, 10), (map.get(row.month.slice(0, 10)) ?? 0) + row.cpuHours);
    return map;
  }, [usage.data]);
  const option = useMemo(
    () => ({
      grid: { left: 52, right: 12, top: 28, bottom: 28 },
      tooltip: { trigger: 'axis', axisPointer: { type: 'shadow' }, valueFormatter: (v: number) => `${formatNumber(v, 3)} CPU-h` },
      xAxis: { type: 'category', data: months.map(formatMonth) },
      yAxis: { type: 'value', name: 'CPU-hours', nameTextStyle: { align: 'left' }, minInterval: 1 },
      series: [{ type: 'bar', name: 'Your CPU-hours', color: palette.ember, barMaxWidth: 40, data: months.map((m) => byMonth.get(m) ?? 0) }],
    }),
    [months, byMonth],
  );
  return (
    <Card title="Your CPU-hours by month" className="panel">
      {usage.isPending ? (
        <Skeleton active paragraph={{ rows: 4 }} />
      ) : usage.isError ? (
        <QueryError what="your CPU usage" error={usage.error} onRetry={() => void usage.refetch()} />
      ) : byMonth.size === 0 ? (
        <div className="empty-state__body">
          No CPU time counted for you in the last {MONTHS} months. It is counted as your runs compute, so start a sweep or resume
          a checkpoint and it appears here.
        </div>
      ) : (
        <Chart option={option} height={220} label={`Your CPU-hours per month over the last ${MONTHS} months`} points={months.length} />
      )}
    </Card>
  );
}
