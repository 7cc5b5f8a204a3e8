import type { CreateStudyRequest, Study } from '@kiln/shared';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { studyKeys } from './study-keys';

/** `POST /api/studies`: the caller becomes its owner. */
export const createStudy = (body: CreateStudyRequest) => api.post<Study>('/studies', body);

export function useCreateStudy() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createStudy,
    onSuccess: (study) => {
      queryClient.setQueryData(studyKeys.detail(study.id), study);
      void queryClient.invalidateQueries({ queryKey: studyKeys.all });
    },
  });
}
