import type { CreateSweepRequest, Sweep } from '@kiln/shared';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { sweepKeys } from './sweep-keys';

/** `POST /api/sweeps` (201 → the sweep with its run counts). */
export const createSweep = (body: CreateSweepRequest) => api.post<Sweep>('/sweeps', body);

export function useCreateSweep() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createSweep,
    onSuccess: (sweep) => {
      queryClient.setQueryData(sweepKeys.detail(sweep.id), sweep);
      void queryClient.invalidateQueries({ queryKey: sweepKeys.forStudy(sweep.studyId) });
      void queryClient.invalidateQueries({ queryKey: ['runs'] });
      void queryClient.invalidateQueries({ queryKey: ['quota'] });
    },
  });
}
