import { queryOptions, useQuery } from '@tanstack/react-query';
import { api, ApiRequestError } from '@/lib/api-client';

/** The caller's quota and this month's use, as `GET /api/quota` answers. */
export interface MyQuota {
  slots: number;
  slotsInUse: number;
  cpuHoursPerMonth: number;
  cpuHoursUsed: number;
  maxGridPoints: number;
  maxRunCpuSeconds: number;
}

export const quotaKeys = {
  all: ['quota'] as const,
  mine: () => [...quotaKeys.all, 'mine'] as const,
};

/** `GET /api/quota`; null from a server that does not offer the route yet (older Kiln). */
export async function getMyQuota(signal?: AbortSignal): Promise<MyQuota | null> {
  try {
    return await api.get<MyQuota>('/quota', signal);
  } catch (error) {
    if (error instanceof ApiRequestError && error.status === 404) return null;
    throw error;
  }
}

export const myQuotaQueryOptions = () =>
  queryOptions({ queryKey: quotaKeys.mine(), queryFn: ({ signal }) => getMyQuota(signal), staleTime: 10_000, refetchInterval: 15_000 });

export const useMyQuota = () => useQuery(myQuotaQueryOptions());
