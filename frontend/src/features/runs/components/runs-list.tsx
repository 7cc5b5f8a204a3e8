import type { Run } from '@kiln/shared';
import { Table, type TableColumnsType } from 'antd';
import { Link } from 'react-router-dom';
import { OutcomeTag, RunStateTag } from '@/components/run-status';
import { paths } from '@/config/paths';
import { formatAge, formatNumber, shortId } from '@/lib/format';

const SYMBOL: Record<string, string> = {
  'domain.dim': 'm',
  'domain.boundaryAngle': 'α',
  'target.axisRatio': 'b',
  'initial.slope': 'slope',
  'initial.s': 's',
  'initial.amplitude': 'A',
  'initial.mode': 'k',
  'grid.points': 'points',
  'grid.maxPoints': 'cap',
  'time.tMax': 't_max',
  'time.maxStep': 'max step',
  'time.tolerance': 'tol',
  'stop.tension': 'τ stop',
  'stop.gradientBound': 'grad bound',
};

/** What a run varies, in one line: its axis values, or "single run". */
export function runLabel(run: Run): string {
  const entries = Object.entries(run.axisValues ?? {});
  if (entries.length === 0) return run.parentRunId ? 'forked from a checkpoint' : 'single run';
  return entries
    .map(([path, value]) => `${SYMBOL[path] ?? path} = ${path === 'domain.boundaryAngle' ? `${formatNumber(value / Math.PI, 4)}π` : formatNumber(value, 4)}`)
    .join(', ');
}

/** A compact list of runs (overview, study page); each row opens its run. */
export function RunsList({ runs, emptyText, showWait = false }: { runs: Run[]; emptyText: string; showWait?: boolean }) {
  const columns: TableColumnsType<Run> = [
    {
      title: 'Run',
      key: 'id',
      render: (_, run) => (
        <div>
          <Link to={paths.run.getHref(run.id)} className="mono-link">
            {shortId(run.id)}
          </Link>
          <div className="table-sub">{runLabel(run)}</div>
        </div>
      ),
    },
    { title: 'State', key: 'state', width: 120, render: (_, run) => <RunStateTag state={run.state} /> },
    {
      title: showWait ? 'Why waiting' : 'Outcome',
      key: 'outcome',
      width: showWait ? undefined : 150,
      render: (_, run) =>
        showWait ? <span className="table-sub">{run.waitReason ?? 'waiting for a worker'}</span> : <OutcomeTag outcome={run.outcome} />,
    },
    {
      title: 't',
      key: 't',
      width: 80,
      render: (_, run) => formatNumber(run.progress?.t, 4),
      className: 'numeric-cell',
    },
    {
      title: showWait ? 'Submitted' : 'When',
      key: 'when',
      width: 96,
      render: (_, run) => formatAge(run.finishedAt ?? run.startedAt ?? run.createdAt),
      className: 'numeric-cell',
    },
  ];
  return <Table<Run> rowKey="id" size="small" columns={columns} dataSource={runs} pagination={false} locale={{ emptyText }} />;
}
