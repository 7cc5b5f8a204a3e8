import type { Candidate, FinerComparison } from '@kiln/shared';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { candidateKeys } from './candidate-keys';

export type CandidateDetail = Candidate & { finer: FinerComparison | null };

const RESTING = ['finished', 'failed', 'cancelled'];

/** `GET /api/candidates/:id`: the candidate, its evidence and the comparison with its finer run. */
export const getCandidate = (candidateId: string, signal?: AbortSignal) =>
  api.get<CandidateDetail>(`/candidates/${candidateId}`, signal);

/**
 * Still moving: its run or its finer run is computing, or the finer run ended in
 * blow-up and its own estimate (for the comparison) is still being made.
 */
export function candidateIsMoving(c: CandidateDetail | undefined): boolean {
  if (!c) return false;
  if (!RESTING.includes(c.runState)) return true;
  if (!c.finer) return false;
  return !RESTING.includes(c.finer.state) || (c.finer.outcome === 'blowup' && c.finer.agrees === null);
}

export const candidateQueryOptions = (candidateId: string) =>
  queryOptions({
    queryKey: candidateKeys.detail(candidateId),
    queryFn: ({ signal }) => getCandidate(candidateId, signal),
    staleTime: 3_000,
    refetchInterval: (query) => (candidateIsMoving(query.state.data) ? 3_000 : false),
  });

export const useCandidate = (candidateId: string) => useQuery(candidateQueryOptions(candidateId));
