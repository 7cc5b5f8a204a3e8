import type { RunSearchQuery } from '@kiln/shared';

/** Cache keys of everything about runs; mutations invalidate by prefix. */
export const runKeys = {
  all: ['runs'] as const,
  lists: () => [...runKeys.all, 'list'] as const,
  list: (query: Partial<RunSearchQuery>) => [...runKeys.lists(), query] as const,
  detail: (runId: string) => [...runKeys.all, 'detail', runId] as const,
  metrics: (runId: string) => [...runKeys.all, 'metrics', runId] as const,
  checkpoints: (runId: string) => [...runKeys.all, 'checkpoints', runId] as const,
  profile: (checkpointId: string) => [...runKeys.all, 'profile', checkpointId] as const,
};
