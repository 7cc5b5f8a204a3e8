import { Breadcrumb, Button, Card, Descriptions, Skeleton } from 'antd';
import { App } from 'antd';
import { Link, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { IconDownload } from '@/components/icons';
import { PageHeader } from '@/components/page-header';
import { QueryError } from '@/components/query-error';
import { StateCountsBar } from '@/components/state-counts-bar';
import { paths } from '@/config/paths';
import { useStudy } from '@/features/studies/api/get-studies';
import { activeRunCount, sweepQueryOptions, useSweep } from '@/features/sweeps/api/get-sweep';
import { OutcomeMap } from '@/features/sweeps/components/outcome-map';
import { axisLabel, formatAxisValue, sweepAxesOf } from '@/features/sweeps/components/sweep-axes';
import { SweepRunsTable } from '@/features/sweeps/components/sweep-runs-table';
import { downloadFile } from '@/lib/api-client';
import { describeError } from '@/lib/describe-error';
import { formatDateTime, formatNumber } from '@/lib/format';
import { getToken } from '@/lib/session';
import { axisValues } from '@kiln/shared';
import { useMemo, useState } from 'react';
import { queryClient } from '../query-client';

export function loader({ params }: LoaderFunctionArgs) {
  if (getToken() && params.sweepId) void queryClient.prefetchQuery(sweepQueryOptions(params.sweepId));
  return null;
}

function SweepRoute() {
  const { sweepId = '' } = useParams();
  const sweep = useSweep(sweepId);
  const study = useStudy(sweep.data?.studyId);
  const { message } = App.useApp();
  const [downloading, setDownloading] = useState(false);
  const axes = useMemo(() => sweepAxesOf(sweep.data?.axes), [sweep.data?.axes]);

  if (sweep.isPending) return <Skeleton active paragraph={{ rows: 10 }} />;
  if (sweep.isError) return <QueryError what="this sweep" error={sweep.error} onRetry={() => void sweep.refetch()} />;
  const s = sweep.data;
  const live = activeRunCount(s) > 0;
  const version = JSON.stringify(s.counts);

  const download = async () => {
    setDownloading(true);
    try {
      await downloadFile(`/sweeps/${s.id}/results.csv`, `${s.name.replace(/[^\w.-]+/g, '-')}-results.csv`);
    } catch (error) {
      const { problem, remedy } = describeError(error);
      message.error(`${problem} ${remedy}`);
    } finally {
      setDownloading(false);
    }
  };

  return (
    <div className="page page--wide">
      <title>{`${s.name} · Kiln`}</title>
      <Breadcrumb
        items={[
          { title: <Link to={paths.studies.getHref()}>Studies</Link> },
          { title: <Link to={paths.study.getHref(s.studyId)}>{study.data?.name ?? 'Study'}</Link> },
          { title: s.name },
        ]}
        className="page-crumbs"
      />
      <PageHeader
        title={s.name}
        subtitle={`Sweep of ${s.runCount} runs, created ${formatDateTime(s.createdAt)}${live ? ' · updating live' : ''}`}
        extra={
          <Button icon={<IconDownload />} onClick={() => void download()} loading={downloading}>
            Results (CSV)
          </Button>
        }
      />
      <div className="page__stack">
        <Card title="Progress" className="panel" size="small">
          <StateCountsBar counts={s.counts} total={s.runCount} />
          <Descriptions size="small" column={3} className="sweep-axes-facts">
            {axes.map((axis) => {
              const values = axisValues(axis);
              return (
                <Descriptions.Item key={axis.path} label={axisLabel(axis.path)}>
                  {values.length} values, {formatAxisValue(axis.path, values[0])} … {formatAxisValue(axis.path, values[values.length - 1])}
                  {axis.range ? ` (${axis.range.scale})` : ''}
                </Descriptions.Item>
              );
            })}
          </Descriptions>
        </Card>
        <OutcomeMap sweepId={s.id} axes={axes} live={live} version={version} />
        <Card title="Runs" className="panel" size="small">
          <SweepRunsTable sweepId={s.id} axes={axes} live={live} version={version} />
        </Card>
      </div>
    </div>
  );
}

export { SweepRoute as Component };
