import type { Run } from '@kiln/shared';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { mobiusKeys } from './mobius-keys';

/**
 * `POST /api/checkpoints/:id/jump-to-maximiser {overrides}` → 201, a new run (a fork)
 * starting from h∘γ_{s*}. EXPERIMENTAL: not a step of any flow; refused (400) for
 * the normalized flow and on the ball.
 */
export const jumpToMaximiser = (checkpointId: string, overrides: Record<string, unknown> = {}) =>
  api.post<Run>(`/checkpoints/${checkpointId}/jump-to-maximiser`, { overrides });

export function useJumpToMaximiser() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ checkpointId, overrides }: { checkpointId: string; overrides?: Record<string, unknown> }) =>
      jumpToMaximiser(checkpointId, overrides),
    onSuccess: (run) => {
      queryClient.setQueryData(mobiusKeys.runDetail(run.id), run);
      void queryClient.invalidateQueries({ queryKey: ['runs', 'list'] });
      void queryClient.invalidateQueries({ queryKey: ['studies'] });
      void queryClient.invalidateQueries({ queryKey: ['quota'] });
    },
  });
}
