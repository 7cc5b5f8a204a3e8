import type { Page, Run, RunSearchQuery } from '@kiln/shared';
import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api, toQueryString } from '@/lib/api-client';
import { runKeys } from './run-keys';

export type RunSearch = Partial<RunSearchQuery>;

/** `GET /api/runs`: runs the caller can see (scope=mine: their own), filtered, sorted, paged. */
export const getRuns = (query: RunSearch, signal?: AbortSignal) =>
  api.get<Page<Run>>(`/runs${toQueryString(query)}`, signal);

export const runsQueryOptions = (query: RunSearch, options: { live?: boolean } = {}) =>
  queryOptions({
    queryKey: runKeys.list(query),
    queryFn: ({ signal }) => getRuns(query, signal),
    staleTime: 5_000,
    placeholderData: keepPreviousData,
    refetchInterval: options.live ? 5_000 : false,
  });

export const useRuns = (query: RunSearch, options: { live?: boolean } = {}) =>
  useQuery(runsQueryOptions(query, options));
