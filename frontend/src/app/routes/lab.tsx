import { Skeleton } from 'antd';
import { AccessDenied } from '@/components/access-denied';
import { PageHeader } from '@/components/page-header';
import { QueryError } from '@/components/query-error';
import { authKeys, useMe } from '@/features/auth/api/get-me';
import { healthQueryOptions } from '@/features/health/api/get-health';
import { ServiceHealthPanel } from '@/features/health/components/service-health-panel';
import { usersQueryOptions } from '@/features/lab/api/get-users';
import { LabSections } from '@/features/admin/components/lab-sections';
import { PeopleAdminPanel } from '@/features/admin/components/people-admin-panel';
import { isAdmin } from '@/lib/roles';
import { getToken } from '@/lib/session';
import type { User } from '@kiln/shared';
import { queryClient } from '../query-client';

export function loader() {
  if (getToken()) {
    void queryClient.prefetchQuery(healthQueryOptions());
    // Only ask for the people list when we already know this is an admin.
    if (isAdmin(queryClient.getQueryData<User>(authKeys.me())?.role)) {
      void queryClient.prefetchQuery(usersQueryOptions());
    }
  }
  return null;
}

function LabRoute() {
  const me = useMe();
  if (me.isPending) return <Skeleton active paragraph={{ rows: 6 }} />;
  if (me.isError) return <QueryError what="your account" error={me.error} onRetry={() => void me.refetch()} />;

  if (!isAdmin(me.data.role)) {
    return (
      <>
        <title>Lab · Kiln</title>
        <AccessDenied
          title="Only lab admins can see this page"
          explanation="The Lab page lists everyone's accounts and the state of the lab's services. If you need a change to an account or think your role is wrong, ask a lab admin."
        />
      </>
    );
  }

  return (
    <div className="page">
      <title>Lab · Kiln</title>
      <PageHeader title="Lab" subtitle="Who has an account, and the services Kiln runs on." />
      <LabSections />
      <div className="page__stack">
        <PeopleAdminPanel me={me.data} />
        <ServiceHealthPanel />
      </div>
    </div>
  );
}

export { LabRoute as Component };
