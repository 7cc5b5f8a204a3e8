import type { Candidate, CandidateListQuery, Page } from '@kiln/shared';
import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api, toQueryString } from '@/lib/api-client';
import { candidateKeys } from './candidate-keys';

export type CandidateSearch = Partial<CandidateListQuery>;

/** `GET /api/candidates`: possible singularities in the studies the caller can see. */
export const getCandidates = (query: CandidateSearch, signal?: AbortSignal) =>
  api.get<Page<Candidate>>(`/candidates${toQueryString(query)}`, signal);

export const candidatesQueryOptions = (query: CandidateSearch) =>
  queryOptions({
    queryKey: candidateKeys.list(query),
    queryFn: ({ signal }) => getCandidates(query, signal),
    staleTime: 5_000,
    // The scanner flags running runs as it goes, so the queue keeps itself current.
    refetchInterval: 10_000,
    placeholderData: keepPreviousData,
  });

export const useCandidates = (query: CandidateSearch) => useQuery(candidatesQueryOptions(query));
