/** Cache keys of studies. */
export const studyKeys = {
  all: ['studies'] as const,
  list: () => [...studyKeys.all, 'list'] as const,
  detail: (studyId: string) => [...studyKeys.all, 'detail', studyId] as const,
};
