import { Button, Card, Skeleton } from 'antd';
import { Link, useNavigate } from 'react-router-dom';
import { IconPlus } from '@/components/icons';
import { QueryError } from '@/components/query-error';
import { StateCountsBar } from '@/components/state-counts-bar';
import { paths } from '@/config/paths';
import { formatDateTime } from '@/lib/format';
import { useStudySweeps } from '../api/get-sweep';

/** A study's sweeps, newest first, each with its progress. */
export function StudySweepsList({ studyId, canCreate }: { studyId: string; canCreate: boolean }) {
  const sweeps = useStudySweeps(studyId);
  const navigate = useNavigate();
  const newButton = canCreate ? (
    <Button type="primary" icon={<IconPlus />} onClick={() => navigate(paths.newSweep.getHref(studyId))}>
      New sweep
    </Button>
  ) : null;
  return (
    <Card title="Sweeps" className="panel" extra={newButton}>
      {sweeps.isPending ? (
        <Skeleton active paragraph={{ rows: 3 }} />
      ) : sweeps.isError ? (
        <QueryError what="the study's sweeps" error={sweeps.error} onRetry={() => void sweeps.refetch()} />
      ) : sweeps.data.length === 0 ? (
        <div className="empty-state">
          <div className="empty-state__heading">No sweeps in this study yet.</div>
          <div className="empty-state__body">
            {canCreate
              ? 'Start one with "New sweep": choose a base spec, the fields to vary, and check the run count and CPU estimate before you submit.'
              : 'A researcher of this study launches sweeps; their runs will appear here, and you can open, fork or resume them.'}
          </div>
        </div>
      ) : (
        <ul className="sweep-list">
          {sweeps.data.map((sweep) => (
            <li key={sweep.id} className="sweep-list__item">
              <div className="sweep-list__head">
                <Link to={paths.sweep.getHref(sweep.id)} className="strong-link">
                  {sweep.name}
                </Link>
                <span className="panel__meta">
                  {sweep.runCount} runs · {formatDateTime(sweep.createdAt)}
                </span>
              </div>
              <StateCountsBar counts={sweep.counts} total={sweep.runCount} compact />
            </li>
          ))}
        </ul>
      )}
    </Card>
  );
}
