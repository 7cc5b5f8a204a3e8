import { Skeleton } from 'antd';
import { PageHeader } from '@/components/page-header';
import { QueryError } from '@/components/query-error';
import { meQueryOptions, useMe } from '@/features/auth/api/get-me';
import { healthQueryOptions } from '@/features/health/api/get-health';
import { ServiceHealthPanel } from '@/features/health/components/service-health-panel';
import { AccountPanel } from '@/features/overview/components/account-panel';
import { NextStepsPanel } from '@/features/overview/components/next-steps-panel';
import { getToken } from '@/lib/session';
import { queryClient } from '../query-client';

/** Starts both requests while the page's code is still loading. */
export function loader() {
  if (getToken()) {
    void queryClient.prefetchQuery(meQueryOptions());
    void queryClient.prefetchQuery(healthQueryOptions());
  }
  return null;
}

function OverviewRoute() {
  const me = useMe();

  return (
    <div className="page">
      <title>Overview · Kiln</title>
      {me.isPending ? (
        <Skeleton active title={{ width: 320 }} paragraph={{ rows: 1, width: 420 }} />
      ) : me.isError ? (
        <QueryError what="your account" error={me.error} onRetry={() => void me.refetch()} />
      ) : (
        <PageHeader
          title={`Welcome back, ${me.data.name}`}
          subtitle="The state of Kiln's services and what you can do next."
        />
      )}
      <div className="page__grid">
        <div className="page__main">
          <ServiceHealthPanel />
          {me.data ? <NextStepsPanel role={me.data.role} email={me.data.email} /> : null}
        </div>
        <div className="page__side">
          {me.data ? <AccountPanel user={me.data} /> : <Skeleton active paragraph={{ rows: 4 }} />}
        </div>
      </div>
    </div>
  );
}

export { OverviewRoute as Component };
