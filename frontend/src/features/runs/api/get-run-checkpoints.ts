import type { CheckpointInfo, CheckpointProfile } from '@kiln/shared';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { runKeys } from './run-keys';

/** `GET /api/runs/:id/checkpoints`, oldest first. */
export const getRunCheckpoints = (runId: string, signal?: AbortSignal) =>
  api.get<CheckpointInfo[]>(`/runs/${runId}/checkpoints`, signal);

export const runCheckpointsQueryOptions = (runId: string) =>
  queryOptions({
    queryKey: runKeys.checkpoints(runId),
    queryFn: ({ signal }) => getRunCheckpoints(runId, signal),
    staleTime: 5_000,
  });

export const useRunCheckpoints = (runId: string) => useQuery(runCheckpointsQueryOptions(runId));

/** `GET /api/checkpoints/:id/profile`: h(r) stored in a checkpoint, decoded by the server. */
export const getCheckpointProfile = (checkpointId: string, signal?: AbortSignal) =>
  api.get<CheckpointProfile>(`/checkpoints/${checkpointId}/profile`, signal);

export const checkpointProfileQueryOptions = (checkpointId: string) =>
  queryOptions({
    queryKey: runKeys.profile(checkpointId),
    queryFn: ({ signal }) => getCheckpointProfile(checkpointId, signal),
    // A checkpoint never changes.
    staleTime: Infinity,
  });

export const useCheckpointProfile = (checkpointId: string | undefined) =>
  useQuery({ ...checkpointProfileQueryOptions(checkpointId ?? ''), enabled: !!checkpointId });
