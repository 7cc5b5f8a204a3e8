import type { QuotaView, Role } from '@kiln/shared';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { adminKeys } from './admin-keys';

/** One row of `GET /api/admin/quotas`: a person's quota in force and this month's use. */
export type PersonQuota = QuotaView & { name: string; email: string; role: Role; disabled: boolean };

/** `GET /api/admin/quotas` (lab admins): everyone's quota with current use. */
export const getQuotas = (signal?: AbortSignal) => api.get<PersonQuota[]>('/admin/quotas', signal);

export const quotasQueryOptions = () =>
  queryOptions({
    queryKey: adminKeys.quotas(),
    queryFn: ({ signal }) => getQuotas(signal),
    // Slots in use change as runs start and end.
    staleTime: 10_000,
    refetchInterval: 30_000,
  });

export const useQuotas = () => useQuery(quotasQueryOptions());
