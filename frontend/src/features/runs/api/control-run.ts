import type { Run } from '@kiln/shared';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { runKeys } from './run-keys';

export type RunControl = 'pause' | 'resume' | 'cancel';

/** `POST /api/runs/:id/pause|resume|cancel` (202 → the run; 409 when not allowed now). */
export const controlRun = (runId: string, action: RunControl) => api.post<Run>(`/runs/${runId}/${action}`);

export function useControlRun(runId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (action: RunControl) => controlRun(runId, action),
    onSuccess: (run) => {
      queryClient.setQueryData(runKeys.detail(runId), run);
      void queryClient.invalidateQueries({ queryKey: runKeys.all });
      void queryClient.invalidateQueries({ queryKey: ['sweeps'] });
      void queryClient.invalidateQueries({ queryKey: ['quota'] });
    },
  });
}
