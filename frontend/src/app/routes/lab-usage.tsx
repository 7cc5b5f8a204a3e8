import type { User } from '@kiln/shared';
import { authKeys } from '@/features/auth/api/get-me';
import { usageQueryOptions } from '@/features/admin/api/get-usage';
import { LabAdminPage } from '@/features/admin/components/lab-admin-page';
import { UsagePanel } from '@/features/admin/components/usage-panel';
import { isAdmin } from '@/lib/roles';
import { getToken } from '@/lib/session';
import { queryClient } from '../query-client';

export function loader() {
  if (getToken() && isAdmin(queryClient.getQueryData<User>(authKeys.me())?.role)) void queryClient.prefetchQuery(usageQueryOptions(6));
  return null;
}

function LabUsageRoute() {
  return (
    <LabAdminPage
      section="Usage"
      subtitle="Who used how much CPU time, month by month."
      deniedExplanation="The Usage page shows everyone's CPU-hours."
    >
      {() => <UsagePanel />}
    </LabAdminPage>
  );
}

export { LabUsageRoute as Component };
