import type { WorkerInfo } from '@kiln/shared';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { adminKeys } from './admin-keys';

/** `GET /api/workers`: worker processes, their slots, heartbeats and the runs they hold. */
export const getWorkerHosts = (signal?: AbortSignal) => api.get<WorkerInfo[]>('/workers', signal);

export const workerHostsQueryOptions = () =>
  queryOptions({
    queryKey: adminKeys.workers(),
    queryFn: ({ signal }) => getWorkerHosts(signal),
    staleTime: 5_000,
    refetchInterval: 10_000,
  });

export const useWorkerHosts = () => useQuery(workerHostsQueryOptions());
