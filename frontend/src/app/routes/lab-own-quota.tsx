import { Skeleton } from 'antd';
import { PageHeader } from '@/components/page-header';
import { QueryError } from '@/components/query-error';
import { useMe } from '@/features/auth/api/get-me';
import { ownQuotaQueryOptions, ownUsageQueryOptions } from '@/features/admin/api/get-own-quota';
import { OwnQuotaPanel, OwnUsagePanel } from '@/features/admin/components/own-quota-panel';
import { getToken } from '@/lib/session';
import { queryClient } from '../query-client';

export function loader() {
  if (getToken()) {
    void queryClient.prefetchQuery(ownQuotaQueryOptions());
    void queryClient.prefetchQuery(ownUsageQueryOptions(6));
  }
  return null;
}

/** Everyone's own share of the machines (the lab admin sets it on Lab · Quotas). */
function OwnQuotaRoute() {
  const me = useMe();
  return (
    <div className="page">
      <title>Your quota · Kiln</title>
      <PageHeader title="Your quota" subtitle="Your share of the lab's machines and the CPU time you have used." />
      {me.isPending ? (
        <Skeleton active paragraph={{ rows: 4 }} />
      ) : me.isError ? (
        <QueryError what="your account" error={me.error} onRetry={() => void me.refetch()} />
      ) : (
        <div className="page__stack">
          <OwnQuotaPanel user={me.data} />
          <OwnUsagePanel />
        </div>
      )}
    </div>
  );
}

export { OwnQuotaRoute as Component };
