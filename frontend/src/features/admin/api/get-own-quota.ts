import type { QuotaView, UsageRow } from '@kiln/shared';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api, toQueryString } from '@/lib/api-client';
import { ownQuotaKeys } from './admin-keys';

/** `GET /api/quota`: the signed-in person's own quota and this month's use. */
export const getOwnQuota = (signal?: AbortSignal) => api.get<QuotaView>('/quota', signal);

/** `GET /api/usage?months=`: the signed-in person's own CPU-hours per month. */
export const getOwnUsage = (months: number, signal?: AbortSignal) =>
  api.get<UsageRow[]>(`/usage${toQueryString({ months })}`, signal);

export const ownQuotaQueryOptions = () =>
  queryOptions({
    queryKey: ownQuotaKeys.quota(),
    queryFn: ({ signal }) => getOwnQuota(signal),
    staleTime: 10_000,
    refetchInterval: 30_000,
  });

export const ownUsageQueryOptions = (months: number) =>
  queryOptions({
    queryKey: ownQuotaKeys.usage(months),
    queryFn: ({ signal }) => getOwnUsage(months, signal),
    staleTime: 60_000,
  });

export const useOwnQuota = () => useQuery(ownQuotaQueryOptions());
export const useOwnUsage = (months: number) => useQuery(ownUsageQueryOptions(months));
