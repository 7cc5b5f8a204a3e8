import type { UsageRow } from '@kiln/shared';
import { Card, Segmented, Skeleton, Table, type TableColumnsType } from 'antd';
import { BarChart } from 'echarts/charts';
import * as echarts from 'echarts/core';
import { useMemo, useState } from 'react';
import { Chart } from '@/components/chart';
import { QueryError } from '@/components/query-error';
import { formatNumber } from '@/lib/format';
import { useUsage } from '../api/get-usage';
import { formatMonth, lastMonths } from './month-label';

// The shared chart registers lines, heatmaps and scatter plots; bars are only drawn here.
echarts.use([BarChart]);

/** One colour per person, told apart by people with common colour-vision deficiencies; the tooltip and table carry the names. */
const personColors = ['#2c6391', '#c4561d', '#1f7a5a', '#d4a73a', '#6b4c9a', '#5a6672', '#7fb2d9', '#b3263e', '#9bc4a8', '#e9a26b'];

interface PersonUsage {
  userId: string;
  name: string;
  email: string;
  /** CPU-hours by month ('YYYY-MM-01'). */
  byMonth: Record<string, number>;
  total: number;
}

function byPerson(rows: UsageRow[]): PersonUsage[] {
  const people = new Map<string, PersonUsage>();
  for (const row of rows) {
    const month = row.month.slice(0, 10);
    const person = people.get(row.userId) ?? { userId: row.userId, name: row.name, email: row.email, byMonth: {}, total: 0 };
    person.byMonth[month] = (person.byMonth[month] ?? 0) + row.cpuHours;
    person.total += row.cpuHours;
    people.set(row.userId, person);
  }
  return [...people.values()].sort((a, b) => b.total - a.total || a.name.localeCompare(b.name));
}

const hours = (value: number | undefined) => (value ? formatNumber(value, value < 10 ? 2 : 3) : '—');

function UsageChart({ people, months }: { people: PersonUsage[]; months: string[] }) {
  const option = useMemo(
    () => ({
      color: personColors,
      grid: { left: 56, right: 16, top: 40, bottom: 28 },
      legend: { top: 0, right: 0, type: 'scroll', itemWidth: 12, itemHeight: 10 },
      tooltip: {
        trigger: 'axis',
        axisPointer: { type: 'shadow' },
        valueFormatter: (value: number) => `${hours(value)} CPU-h`,
      },
      xAxis: { type: 'category', data: months.map(formatMonth), axisTick: { alignWithLabel: true } },
      yAxis: { type: 'value', name: 'CPU-hours', nameTextStyle: { align: 'left' }, minInterval: 1 },
      series: people.map((person) => ({
        type: 'bar',
        name: person.name,
        stack: 'month',
        barMaxWidth: 48,
        emphasis: { focus: 'series' },
        data: months.map((month) => person.byMonth[month] ?? 0),
      })),
    }),
    [people, months],
  );
  return (
    <Chart
      option={option}
      height={300}
      label={`CPU-hours per month, stacked by person, ${formatMonth(months[0]!)} to ${formatMonth(months[months.length - 1]!)}`}
      points={people.length * months.length}
    />
  );
}

/** CPU-hours per person per month: a stacked bar chart to look at and a table to read. */
export function UsagePanel() {
  const [count, setCount] = useState(6);
  const usage = useUsage(count);
  const months = useMemo(() => lastMonths(count), [count]);
  const people = useMemo(() => byPerson(usage.data ?? []), [usage.data]);
  const monthTotals = months.map((month) => people.reduce((sum, person) => sum + (person.byMonth[month] ?? 0), 0));
  const grandTotal = monthTotals.reduce((a, b) => a + b, 0);

  // Newest month first in the table: that is the one people ask about.
  const tableMonths = [...months].reverse();
  const columns: TableColumnsType<PersonUsage> = [
    {
      title: 'Person',
      key: 'person',
      fixed: 'left',
      width: 220,
      render: (_, person) => (
        <>
          <div className="strong-text">{person.name}</div>
          <div className="table-sub">{person.email}</div>
        </>
      ),
    },
    ...tableMonths.map((month, index) => ({
      title: index === 0 ? `${formatMonth(month)} (so far)` : formatMonth(month),
      key: month,
      align: 'right' as const,
      className: 'numeric-cell',
      render: (_: unknown, person: PersonUsage) => hours(person.byMonth[month]),
    })),
    {
      title: `Total, ${count} months`,
      key: 'total',
      align: 'right',
      className: 'numeric-cell strong-text',
      render: (_, person) => hours(person.total),
    },
  ];

  return (
    <Card
      title="CPU-hours by person and month"
      className="panel"
      extra={
        <span className="panel__extra">
          <span className="inline-label" id="usage-months-label">
            Show
          </span>
          <Segmented
            size="small"
            aria-labelledby="usage-months-label"
            value={count}
            onChange={(value) => setCount(Number(value))}
            options={[
              { value: 3, label: '3 months' },
              { value: 6, label: '6 months' },
              { value: 12, label: '12 months' },
            ]}
          />
        </span>
      }
    >
      {usage.isPending ? (
        <Skeleton active paragraph={{ rows: 6 }} />
      ) : usage.isError ? (
        <QueryError what="the lab's CPU usage" error={usage.error} onRetry={() => void usage.refetch()} />
      ) : people.length === 0 ? (
        <div className="empty-state">
          <div className="empty-state__heading">No CPU time recorded in the last {count} months.</div>
          <div className="empty-state__body">
            Usage is counted from the CPU seconds workers report for each run, so it appears here once runs have computed. If runs
            have finished and this stays empty, check on the Workers page that the workers are alive.
          </div>
        </div>
      ) : (
        <>
          <UsageChart people={people} months={months} />
          <Table<PersonUsage>
            className="usage-table"
            rowKey="userId"
            size="small"
            columns={columns}
            dataSource={people}
            pagination={false}
            scroll={{ x: 'max-content' }}
            summary={() => (
              <Table.Summary.Row className="usage-table__total">
                <Table.Summary.Cell index={0} className="usage-table__total-name">Whole lab</Table.Summary.Cell>
                {[...monthTotals].reverse().map((total, i) => (
                  <Table.Summary.Cell key={tableMonths[i]} index={i + 1} align="right" className="numeric-cell">
                    {hours(total)}
                  </Table.Summary.Cell>
                ))}
                <Table.Summary.Cell index={tableMonths.length + 1} align="right" className="numeric-cell">
                  {hours(grandTotal)}
                </Table.Summary.Cell>
              </Table.Summary.Row>
            )}
          />
          <p className="panel__note">CPU-hours are the CPU time workers report per run, counted in the month (UTC) it was spent.</p>
        </>
      )}
    </Card>
  );
}
