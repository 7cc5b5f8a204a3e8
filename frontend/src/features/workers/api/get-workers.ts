import type { WorkerInfo } from '@kiln/shared';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';

export const workerKeys = {
  all: ['workers'] as const,
  list: () => [...workerKeys.all, 'list'] as const,
};

/** `GET /api/workers`: the worker hosts, their slots, heartbeats and runs. */
export const getWorkers = (signal?: AbortSignal) => api.get<WorkerInfo[]>('/workers', signal);

export const workersQueryOptions = () =>
  queryOptions({
    queryKey: workerKeys.list(),
    queryFn: ({ signal }) => getWorkers(signal),
    staleTime: 5_000,
    refetchInterval: 10_000,
  });

export const useWorkers = () => useQuery(workersQueryOptions());
