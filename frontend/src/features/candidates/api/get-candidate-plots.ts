import type { CandidatePlots } from '@kiln/shared';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { candidateKeys } from './candidate-keys';

/** `GET /api/candidates/:id/plots`: computed on request from the run's metrics and checkpoints. */
export const getCandidatePlots = (candidateId: string, signal?: AbortSignal) =>
  api.get<CandidatePlots>(`/candidates/${candidateId}/plots`, signal);

export const candidatePlotsQueryOptions = (candidateId: string) =>
  queryOptions({
    queryKey: candidateKeys.plots(candidateId),
    queryFn: ({ signal }) => getCandidatePlots(candidateId, signal),
    staleTime: 30_000,
  });

/** `live` while the candidate's run is still computing: its history and checkpoints grow, so the plots are read again. */
export const useCandidatePlots = (candidateId: string, live = false) =>
  useQuery({ ...candidatePlotsQueryOptions(candidateId), refetchInterval: live ? 5_000 : false });
