import type { DilationProfileView } from '@kiln/shared';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { mobiusKeys } from './mobius-keys';

/** `GET /api/checkpoints/:id/dilation-profile`: F(s) = D(h∘γ_s) of the state, s* and the gap (sphere domain). */
export const getDilationProfile = (checkpointId: string, signal?: AbortSignal) =>
  api.get<DilationProfileView>(`/checkpoints/${checkpointId}/dilation-profile`, signal);

export const dilationProfileQueryOptions = (checkpointId: string) =>
  queryOptions({
    queryKey: mobiusKeys.dilationProfile(checkpointId),
    queryFn: ({ signal }) => getDilationProfile(checkpointId, signal),
    // A checkpoint never changes, so neither does its profile.
    staleTime: Infinity,
    retry: 1,
  });

export const useDilationProfile = (checkpointId: string | undefined) =>
  useQuery({ ...dilationProfileQueryOptions(checkpointId ?? ''), enabled: !!checkpointId });
