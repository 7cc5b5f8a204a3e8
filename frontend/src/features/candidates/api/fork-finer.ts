import type { Run } from '@kiln/shared';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { candidateKeys } from './candidate-keys';

/** `POST /api/candidates/:id/fork-finer`: twice the grid, a ten times tighter tolerance, from the checkpoint before the indicators fired. */
export const forkFiner = (candidateId: string) => api.post<Run>(`/candidates/${candidateId}/fork-finer`);

export function useForkFiner(candidateId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => forkFiner(candidateId),
    onSuccess: () => {
      void queryClient.invalidateQueries({ queryKey: candidateKeys.all });
      void queryClient.invalidateQueries({ queryKey: ['runs'] });
      void queryClient.invalidateQueries({ queryKey: ['quota'] });
    },
  });
}
