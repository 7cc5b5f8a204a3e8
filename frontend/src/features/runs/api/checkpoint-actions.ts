import type { Run } from '@kiln/shared';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { runKeys } from './run-keys';

/** `POST /api/checkpoints/:id/resume`: continue the same run from this checkpoint. */
export const resumeFromCheckpoint = (checkpointId: string) => api.post<Run>(`/checkpoints/${checkpointId}/resume`);

/** `POST /api/checkpoints/:id/fork {overrides}`: a new run from this checkpoint with spec fields changed. */
export const forkCheckpoint = (checkpointId: string, overrides: Record<string, unknown>) =>
  api.post<Run>(`/checkpoints/${checkpointId}/fork`, { overrides });

export function useResumeFromCheckpoint() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: resumeFromCheckpoint,
    onSuccess: (run) => {
      queryClient.setQueryData(runKeys.detail(run.id), run);
      void queryClient.invalidateQueries({ queryKey: runKeys.all });
      void queryClient.invalidateQueries({ queryKey: ['sweeps'] });
      void queryClient.invalidateQueries({ queryKey: ['quota'] });
    },
  });
}

export function useForkCheckpoint() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ checkpointId, overrides }: { checkpointId: string; overrides: Record<string, unknown> }) =>
      forkCheckpoint(checkpointId, overrides),
    onSuccess: (run) => {
      queryClient.setQueryData(runKeys.detail(run.id), run);
      void queryClient.invalidateQueries({ queryKey: runKeys.lists() });
      void queryClient.invalidateQueries({ queryKey: ['studies'] });
      void queryClient.invalidateQueries({ queryKey: ['quota'] });
    },
  });
}
