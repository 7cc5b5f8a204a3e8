import type { Sweep } from '@kiln/shared';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { sweepKeys } from './sweep-keys';

/** `GET /api/sweeps/:id`: the sweep with its runs counted by state. */
export const getSweep = (sweepId: string, signal?: AbortSignal) => api.get<Sweep>(`/sweeps/${sweepId}`, signal);

/** Runs that have not reached a resting state yet. */
export function activeRunCount(sweep: Sweep): number {
  const c = sweep.counts;
  return (c.queued ?? 0) + (c.waiting ?? 0) + (c.running ?? 0);
}

export const sweepQueryOptions = (sweepId: string) =>
  queryOptions({
    queryKey: sweepKeys.detail(sweepId),
    queryFn: ({ signal }) => getSweep(sweepId, signal),
    staleTime: 2_000,
    refetchInterval: (query) => (query.state.data && activeRunCount(query.state.data) > 0 ? 2_000 : false),
  });

export const useSweep = (sweepId: string) => useQuery(sweepQueryOptions(sweepId));

/** `GET /api/studies/:id/sweeps`, newest first. */
export const getStudySweeps = (studyId: string, signal?: AbortSignal) =>
  api.get<Sweep[]>(`/studies/${studyId}/sweeps`, signal);

export const studySweepsQueryOptions = (studyId: string) =>
  queryOptions({
    queryKey: sweepKeys.forStudy(studyId),
    queryFn: ({ signal }) => getStudySweeps(studyId, signal),
    staleTime: 5_000,
    refetchInterval: (query) => (query.state.data?.some((sweep) => activeRunCount(sweep) > 0) ? 5_000 : false),
  });

export const useStudySweeps = (studyId: string) => useQuery(studySweepsQueryOptions(studyId));
