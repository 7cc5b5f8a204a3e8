import type { User } from '@kiln/shared';
import { authKeys } from '@/features/auth/api/get-me';
import { workerHostsQueryOptions } from '@/features/admin/api/get-workers';
import { LabAdminPage } from '@/features/admin/components/lab-admin-page';
import { WorkerHostsTable } from '@/features/admin/components/worker-hosts-table';
import { isAdmin } from '@/lib/roles';
import { getToken } from '@/lib/session';
import { queryClient } from '../query-client';

export function loader() {
  if (getToken() && isAdmin(queryClient.getQueryData<User>(authKeys.me())?.role)) void queryClient.prefetchQuery(workerHostsQueryOptions());
  return null;
}

function LabWorkersRoute() {
  return (
    <LabAdminPage
      section="Workers"
      subtitle="The processes that compute runs: where they run, how many slots each offers, and whether they are still alive."
      deniedExplanation="The Workers page shows the lab's compute hosts and their health."
    >
      {() => <WorkerHostsTable />}
    </LabAdminPage>
  );
}

export { LabWorkersRoute as Component };
