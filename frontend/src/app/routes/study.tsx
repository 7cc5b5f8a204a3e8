import { Role } from '@kiln/shared';
import { Breadcrumb, Card, Skeleton } from 'antd';
import { Link, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { PageHeader } from '@/components/page-header';
import { QueryError } from '@/components/query-error';
import { paths } from '@/config/paths';
import { useMe } from '@/features/auth/api/get-me';
import { InvitePanel } from '@/features/invitations/components/invite-panel';
import { useRuns } from '@/features/runs/api/get-runs';
import { RunsList } from '@/features/runs/components/runs-list';
import { studyQueryOptions, useStudy } from '@/features/studies/api/get-studies';
import { StudyMembers } from '@/features/studies/components/study-members';
import { studySweepsQueryOptions } from '@/features/sweeps/api/get-sweep';
import { StudySweepsList } from '@/features/sweeps/components/study-sweeps-list';
import { getToken } from '@/lib/session';
import { queryClient } from '../query-client';

export function loader({ params }: LoaderFunctionArgs) {
  if (getToken() && params.studyId) {
    void queryClient.prefetchQuery(studyQueryOptions(params.studyId));
    void queryClient.prefetchQuery(studySweepsQueryOptions(params.studyId));
  }
  return null;
}

function RecentRuns({ studyId }: { studyId: string }) {
  const runs = useRuns({ scope: 'all', studyId, sort: 'created', order: 'desc', pageSize: 8 }, { live: true });
  return (
    <Card title="Recent runs" className="panel" size="small">
      {runs.isPending ? (
        <Skeleton active paragraph={{ rows: 3 }} />
      ) : runs.isError ? (
        <QueryError what="the study's runs" error={runs.error} onRetry={() => void runs.refetch()} />
      ) : (
        <RunsList runs={runs.data.items} emptyText="No runs yet. Runs appear here once a sweep is launched or a checkpoint forked." />
      )}
    </Card>
  );
}

function StudyRoute() {
  const { studyId = '' } = useParams();
  const study = useStudy(studyId);
  const me = useMe();
  if (study.isPending) return <Skeleton active paragraph={{ rows: 8 }} />;
  if (study.isError) return <QueryError what="this study" error={study.error} onRetry={() => void study.refetch()} />;
  const s = study.data;
  const labRoleMayCreate = me.data?.role === Role.Admin || me.data?.role === Role.Researcher;
  const canCreate = labRoleMayCreate && s.myRole !== 'viewer';

  return (
    <div className="page">
      <title>{`${s.name} · Kiln`}</title>
      <Breadcrumb items={[{ title: <Link to={paths.studies.getHref()}>Studies</Link> }, { title: s.name }]} className="page-crumbs" />
      <PageHeader title={s.name} subtitle={s.description || 'No description.'} />
      <div className="page__grid">
        <div className="page__main">
          <StudySweepsList studyId={s.id} canCreate={canCreate} />
          <RecentRuns studyId={s.id} />
        </div>
        <div className="page__side">
          <StudyMembers study={s} />
          {s.myRole === 'owner' || me.data?.role === Role.Admin ? <InvitePanel studyId={s.id} studyName={s.name} /> : null}
          {s.myRole === 'viewer' ? (
            <Card className="panel" size="small">
              <p className="muted">You can look at this study's runs; its owner can make you a member if you need to fork or resume.</p>
            </Card>
          ) : null}
        </div>
      </div>
    </div>
  );
}

export { StudyRoute as Component };
