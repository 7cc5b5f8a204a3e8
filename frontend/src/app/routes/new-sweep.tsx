import { Role } from '@kiln/shared';
import { Breadcrumb, Skeleton } from 'antd';
import { Link, useNavigate, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { AccessDenied } from '@/components/access-denied';
import { PageHeader } from '@/components/page-header';
import { QueryError } from '@/components/query-error';
import { paths } from '@/config/paths';
import { useMe } from '@/features/auth/api/get-me';
import { studyQueryOptions, useStudy } from '@/features/studies/api/get-studies';
import { SweepBuilder } from '@/features/sweeps/components/sweep-builder';
import { getToken } from '@/lib/session';
import { queryClient } from '../query-client';

export function loader({ params }: LoaderFunctionArgs) {
  if (getToken() && params.studyId) void queryClient.prefetchQuery(studyQueryOptions(params.studyId));
  return null;
}

function NewSweepRoute() {
  const { studyId = '' } = useParams();
  const study = useStudy(studyId);
  const me = useMe();
  const navigate = useNavigate();
  if (study.isPending || me.isPending) return <Skeleton active paragraph={{ rows: 10 }} />;
  if (study.isError) return <QueryError what="this study" error={study.error} onRetry={() => void study.refetch()} />;
  if (me.isError) return <QueryError what="your account" error={me.error} />;
  const mayCreate = (me.data.role === Role.Admin || me.data.role === Role.Researcher) && study.data.myRole !== 'viewer';
  if (!mayCreate) {
    return (
      <AccessDenied
        title="Only researchers of this study launch sweeps"
        explanation="Collaborators and viewers work with the runs a study already has: open a run to resume it or fork it from a checkpoint with changes."
      />
    );
  }
  return (
    <div className="page page--wide">
      <title>New sweep · Kiln</title>
      <Breadcrumb
        items={[
          { title: <Link to={paths.studies.getHref()}>Studies</Link> },
          { title: <Link to={paths.study.getHref(studyId)}>{study.data.name}</Link> },
          { title: 'New sweep' },
        ]}
        className="page-crumbs"
      />
      <PageHeader title="New sweep" subtitle="A base spec and the fields to vary; every combination becomes one run." />
      <SweepBuilder studyId={studyId} onCreated={(sweepId) => navigate(paths.sweep.getHref(sweepId))} />
    </div>
  );
}

export { NewSweepRoute as Component };
