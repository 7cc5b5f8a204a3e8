import type { CheckpointInfo } from '@kiln/shared';
import { useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { mobiusKeys } from './mobius-keys';

/** `GET /api/runs/:id/checkpoints` of the parent run, to name the checkpoint a jump started from. */
export const useParentCheckpoints = (runId: string | null) =>
  useQuery({
    queryKey: mobiusKeys.runCheckpoints(runId ?? ''),
    queryFn: ({ signal }) => api.get<CheckpointInfo[]>(`/runs/${runId}/checkpoints`, signal),
    staleTime: 5_000,
    enabled: !!runId,
  });
