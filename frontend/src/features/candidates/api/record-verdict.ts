import type { VerdictRequest } from '@kiln/shared';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { candidateKeys } from './candidate-keys';
import type { CandidateDetail } from './get-candidate';

/** `POST /api/candidates/:id/verdict {verdict, note}` (audited). */
export const recordVerdict = (candidateId: string, body: VerdictRequest) =>
  api.post<CandidateDetail>(`/candidates/${candidateId}/verdict`, body);

export function useRecordVerdict(candidateId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: VerdictRequest) => recordVerdict(candidateId, body),
    onSuccess: (candidate) => {
      queryClient.setQueryData(candidateKeys.detail(candidateId), candidate);
      void queryClient.invalidateQueries({ queryKey: candidateKeys.lists() });
    },
  });
}
