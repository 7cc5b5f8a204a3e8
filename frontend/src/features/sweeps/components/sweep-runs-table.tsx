import { RUN_STATES, type FlowOutcome, type Run, type RunState, type SweepAxis } from '@kiln/shared';
import { Select, Table, type TableColumnsType, type TablePaginationConfig } from 'antd';
import type { SorterResult } from 'antd/es/table/interface';
import { useState } from 'react';
import { Link } from 'react-router-dom';
import { QueryError } from '@/components/query-error';
import { OutcomeTag, outcomeLook, RunStateTag, runStateLook } from '@/components/run-status';
import { paths } from '@/config/paths';
import { formatCpu, formatNumber } from '@/lib/format';
import { useSweepRuns, type SweepRunsQuery } from '../api/get-sweep-runs';
import { axisLabel, formatAxisValue } from './sweep-axes';

type SortKey = NonNullable<SweepRunsQuery['sort']>;
const OUTCOMES = Object.keys(outcomeLook) as FlowOutcome[];

function blowupTime(run: Run): number | null {
  const summary = run.summary as { blowup?: { T?: number | null } | null } | null;
  return summary?.blowup?.T ?? null;
}

/** The sweep's runs: filter by state and outcome, sort and page on the server. */
export function SweepRunsTable({ sweepId, axes, live, version }: { sweepId: string; axes: SweepAxis[]; live: boolean; version: string }) {
  const [query, setQuery] = useState<SweepRunsQuery>({ sort: 'index', order: 'asc', page: 1, pageSize: 25 });
  const runs = useSweepRuns(sweepId, query, live, version);

  const sortOrder = (key: SortKey) => (query.sort === key ? (query.order === 'desc' ? 'descend' : 'ascend') : null);
  const columns: TableColumnsType<Run> = [
    {
      title: '#',
      key: 'index',
      width: 64,
      sorter: true,
      sortOrder: sortOrder('index'),
      render: (_, run) => <Link to={paths.run.getHref(run.id)}>{(run.sweepIndex ?? 0) + 1}</Link>,
      className: 'numeric-cell',
    },
    ...axes.map((axis) => ({
      title: axisLabel(axis.path),
      key: axis.path,
      render: (_: unknown, run: Run) => formatAxisValue(axis.path, run.axisValues[axis.path]),
      className: 'numeric-cell',
    })),
    { title: 'State', key: 'state', sorter: true, sortOrder: sortOrder('state'), render: (_, run) => <RunStateTag state={run.state} /> },
    {
      title: 'Outcome',
      key: 'outcome',
      sorter: true,
      sortOrder: sortOrder('outcome'),
      render: (_, run) => <OutcomeTag outcome={run.outcome} />,
    },
    {
      title: 'T̂',
      key: 'T',
      render: (_, run) => formatNumber(blowupTime(run), 3),
      className: 'numeric-cell',
    },
    {
      title: 'Energy',
      key: 'energy',
      sorter: true,
      sortOrder: sortOrder('energy'),
      render: (_, run) => formatNumber(run.progress?.energy, 5),
      className: 'numeric-cell',
    },
    {
      title: 'Steps',
      key: 'steps',
      render: (_, run) => run.progress?.step ?? '—',
      className: 'numeric-cell',
    },
    {
      title: 'CPU',
      key: 'cpu',
      sorter: true,
      sortOrder: sortOrder('cpu'),
      render: (_, run) => formatCpu(run.cpuSeconds),
      className: 'numeric-cell',
    },
  ];

  const onChange = (pagination: TablePaginationConfig, _filters: unknown, sorter: SorterResult<Run> | SorterResult<Run>[]) => {
    const s = Array.isArray(sorter) ? sorter[0] : sorter;
    const key = (s?.order ? (s.columnKey as SortKey) : 'index') ?? 'index';
    setQuery((q) => ({
      ...q,
      sort: key,
      order: s?.order === 'descend' ? 'desc' : 'asc',
      page: pagination.current ?? 1,
      pageSize: pagination.pageSize ?? 25,
    }));
  };

  return (
    <div className="sweep-runs">
      <div className="table-filters">
        <label>
          <span className="table-filters__label">State</span>
          <Select<RunState | 'any'>
            aria-label="Filter by state"
            value={query.state ?? 'any'}
            style={{ width: 150 }}
            onChange={(state) => setQuery((q) => ({ ...q, state: state === 'any' ? undefined : state, page: 1 }))}
            options={[{ value: 'any', label: 'Any state' }, ...RUN_STATES.map((s) => ({ value: s, label: runStateLook[s].label }))]}
          />
        </label>
        <label>
          <span className="table-filters__label">Outcome</span>
          <Select<FlowOutcome | 'any'>
            aria-label="Filter by outcome"
            value={query.outcome ?? 'any'}
            style={{ width: 170 }}
            onChange={(outcome) => setQuery((q) => ({ ...q, outcome: outcome === 'any' ? undefined : outcome, page: 1 }))}
            options={[{ value: 'any', label: 'Any outcome' }, ...OUTCOMES.map((o) => ({ value: o, label: outcomeLook[o].label }))]}
          />
        </label>
        {runs.isFetching && !runs.isPending ? <span className="muted">updating…</span> : null}
      </div>
      {runs.isError ? (
        <QueryError what="the sweep's runs" error={runs.error} onRetry={() => void runs.refetch()} />
      ) : (
        <Table<Run>
          rowKey="id"
          size="small"
          columns={columns}
          loading={runs.isPending}
          dataSource={runs.data?.items ?? []}
          onChange={onChange}
          pagination={{
            current: query.page,
            pageSize: query.pageSize,
            total: runs.data?.total ?? 0,
            showSizeChanger: true,
            pageSizeOptions: [25, 50, 100, 200],
            showTotal: (total) => `${total} runs`,
          }}
          locale={{
            emptyText:
              query.state || query.outcome
                ? 'No runs match these filters. Choose "Any" to see all of them.'
                : 'This sweep has no runs.',
          }}
        />
      )}
    </div>
  );
}
