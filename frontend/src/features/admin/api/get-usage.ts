import type { UsageRow } from '@kiln/shared';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api, toQueryString } from '@/lib/api-client';
import { adminKeys } from './admin-keys';

/** `GET /api/admin/usage?months=` (lab admins): CPU-hours per person per month. */
export const getUsage = (months: number, signal?: AbortSignal) =>
  api.get<UsageRow[]>(`/admin/usage${toQueryString({ months })}`, signal);

export const usageQueryOptions = (months: number) =>
  queryOptions({
    queryKey: adminKeys.usage(months),
    queryFn: ({ signal }) => getUsage(months, signal),
    staleTime: 60_000,
  });

export const useUsage = (months: number) => useQuery(usageQueryOptions(months));
