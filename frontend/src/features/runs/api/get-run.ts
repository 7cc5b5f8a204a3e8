import { RESTING_STATES, type Run } from '@kiln/shared';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { runKeys } from './run-keys';

/** `GET /api/runs/:id`. */
export const getRun = (runId: string, signal?: AbortSignal) => api.get<Run>(`/runs/${runId}`, signal);

export const isResting = (run: Pick<Run, 'state'> | undefined) => !!run && RESTING_STATES.includes(run.state);

export const runQueryOptions = (runId: string) =>
  queryOptions({
    queryKey: runKeys.detail(runId),
    queryFn: ({ signal }) => getRun(runId, signal),
    staleTime: 5_000,
    // Live events keep an active run current; this poll is the safety net when the stream drops.
    refetchInterval: (query) => (query.state.data && !isResting(query.state.data) ? 10_000 : false),
  });

export const useRun = (runId: string) => useQuery(runQueryOptions(runId));
