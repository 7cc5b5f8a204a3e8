import type { User } from '@kiln/shared';
import { authKeys } from '@/features/auth/api/get-me';
import { quotasQueryOptions } from '@/features/admin/api/get-quotas';
import { LabAdminPage } from '@/features/admin/components/lab-admin-page';
import { QuotaTable } from '@/features/admin/components/quota-table';
import { isAdmin } from '@/lib/roles';
import { getToken } from '@/lib/session';
import { queryClient } from '../query-client';

export function loader() {
  // Only ask when we already know this is an admin (anyone else gets a 403).
  if (getToken() && isAdmin(queryClient.getQueryData<User>(authKeys.me())?.role)) void queryClient.prefetchQuery(quotasQueryOptions());
  return null;
}

function LabQuotasRoute() {
  return (
    <LabAdminPage
      section="Quotas"
      subtitle="Each person's share of the machines: concurrent slots, CPU-hours a month, and the largest run they may start."
      deniedExplanation="The Quotas page sets everyone's slots and CPU-hours."
    >
      {() => <QuotaTable />}
    </LabAdminPage>
  );
}

export { LabQuotasRoute as Component };
