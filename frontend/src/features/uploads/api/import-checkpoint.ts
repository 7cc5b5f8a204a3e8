import type { Run } from '@kiln/shared';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';

/** `POST /api/uploads/:id/import {studyId}`: resume an uploaded checkpoint as a new run in one of your studies. */
export const importCheckpoint = (uploadId: string, studyId: string) => api.post<Run>(`/uploads/${uploadId}/import`, { studyId });

export function useImportCheckpoint() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ uploadId, studyId }: { uploadId: string; studyId: string }) => importCheckpoint(uploadId, studyId),
    onSuccess: () => {
      void queryClient.invalidateQueries({ queryKey: ['runs'] });
      void queryClient.invalidateQueries({ queryKey: ['studies'] });
      void queryClient.invalidateQueries({ queryKey: ['quota'] });
    },
  });
}
