import type { CandidateListQuery } from '@kiln/shared';

/** Cache keys of everything about candidates; mutations invalidate by prefix. */
export const candidateKeys = {
  all: ['candidates'] as const,
  lists: () => [...candidateKeys.all, 'list'] as const,
  list: (query: Partial<CandidateListQuery>) => [...candidateKeys.lists(), query] as const,
  detail: (candidateId: string) => [...candidateKeys.all, 'detail', candidateId] as const,
  plots: (candidateId: string) => [...candidateKeys.all, 'plots', candidateId] as const,
};
