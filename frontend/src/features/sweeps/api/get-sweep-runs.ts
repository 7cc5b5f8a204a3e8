import type { Page, Run, RunListQuery } from '@kiln/shared';
import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api, toQueryString } from '@/lib/api-client';
import { sweepKeys } from './sweep-keys';

export type SweepRunsQuery = Partial<RunListQuery>;

/** `GET /api/sweeps/:id/runs`: filtered, sorted and paged on the server. */
export const getSweepRuns = (sweepId: string, query: SweepRunsQuery, signal?: AbortSignal) =>
  api.get<Page<Run>>(`/sweeps/${sweepId}/runs${toQueryString(query)}`, signal);

export const sweepRunsQueryOptions = (sweepId: string, query: SweepRunsQuery, live: boolean, version = '') =>
  queryOptions({
    queryKey: sweepKeys.runs(sweepId, query, version),
    queryFn: ({ signal }) => getSweepRuns(sweepId, query, signal),
    staleTime: 2_000,
    placeholderData: keepPreviousData,
    refetchInterval: live ? 2_000 : false,
  });

export const useSweepRuns = (sweepId: string, query: SweepRunsQuery, live: boolean, version = '') =>
  useQuery(sweepRunsQueryOptions(sweepId, query, live, version));

const MAP_PAGE = 500;
/** The outcome map reads at most this many runs (10 pages). */
export const MAP_RUN_LIMIT = 5_000;

/** Every run of a sweep (for the outcome map), in pages of 500. */
export async function getAllSweepRuns(sweepId: string, signal?: AbortSignal): Promise<Run[]> {
  const runs: Run[] = [];
  for (let page = 1; runs.length < MAP_RUN_LIMIT; page++) {
    const result = await getSweepRuns(sweepId, { page, pageSize: MAP_PAGE, sort: 'index', order: 'asc' }, signal);
    runs.push(...result.items);
    if (runs.length >= result.total || result.items.length === 0) break;
  }
  return runs;
}

export const allSweepRunsQueryOptions = (sweepId: string, live: boolean, version = '') =>
  queryOptions({
    queryKey: sweepKeys.allRuns(sweepId, version),
    queryFn: ({ signal }) => getAllSweepRuns(sweepId, signal),
    staleTime: 2_000,
    placeholderData: keepPreviousData,
    refetchInterval: live ? 3_000 : false,
  });

export const useAllSweepRuns = (sweepId: string, live: boolean, version = '') =>
  useQuery(allSweepRunsQueryOptions(sweepId, live, version));
