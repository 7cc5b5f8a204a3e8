import { Button, Card, Skeleton } from 'antd';
import { useState } from 'react';
import { useNavigate } from 'react-router-dom';
import { IconPlus } from '@/components/icons';
import { PageHeader } from '@/components/page-header';
import { QueryError } from '@/components/query-error';
import { paths } from '@/config/paths';
import { useMe } from '@/features/auth/api/get-me';
import { studiesQueryOptions, useStudies } from '@/features/studies/api/get-studies';
import { CreateStudyDialog } from '@/features/studies/components/create-study-dialog';
import { StudiesTable } from '@/features/studies/components/studies-table';
import { Role } from '@kiln/shared';
import { getToken } from '@/lib/session';
import { queryClient } from '../query-client';

export function loader() {
  if (getToken()) void queryClient.prefetchQuery(studiesQueryOptions());
  return null;
}

function StudiesRoute() {
  const me = useMe();
  const studies = useStudies();
  const navigate = useNavigate();
  const [creating, setCreating] = useState(false);
  const canCreate = me.data?.role === Role.Admin || me.data?.role === Role.Researcher;

  return (
    <div className="page">
      <title>Studies · Kiln</title>
      <PageHeader
        title="Studies"
        subtitle="Each study is one research question: its sweeps, its runs and the people working on it."
        extra={
          canCreate ? (
            <Button type="primary" icon={<IconPlus />} onClick={() => setCreating(true)}>
              New study
            </Button>
          ) : null
        }
      />
      <Card className="panel">
        {studies.isPending ? (
          <Skeleton active paragraph={{ rows: 4 }} />
        ) : studies.isError ? (
          <QueryError what="your studies" error={studies.error} onRetry={() => void studies.refetch()} />
        ) : (
          <StudiesTable
            studies={studies.data}
            emptyText={
              canCreate
                ? 'No studies yet. Create one with "New study", then launch a sweep inside it.'
                : 'No studies are shared with you yet. The researcher who runs a study adds you with the e-mail you sign in with.'
            }
          />
        )}
      </Card>
      <CreateStudyDialog
        open={creating}
        onClose={() => setCreating(false)}
        onCreated={(id) => {
          setCreating(false);
          navigate(paths.study.getHref(id));
        }}
      />
    </div>
  );
}

export { StudiesRoute as Component };
