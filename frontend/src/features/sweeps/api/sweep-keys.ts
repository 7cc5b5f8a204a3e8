import type { RunListQuery } from '@kiln/shared';

/** Cache keys of sweeps; mutations invalidate by prefix. */
export const sweepKeys = {
  all: ['sweeps'] as const,
  detail: (sweepId: string) => [...sweepKeys.all, 'detail', sweepId] as const,
  runs: (sweepId: string, query: Partial<RunListQuery>) => [...sweepKeys.all, 'runs', sweepId, query] as const,
  allRuns: (sweepId: string) => [...sweepKeys.all, 'all-runs', sweepId] as const,
  preview: (body: unknown) => [...sweepKeys.all, 'preview', body] as const,
  forStudy: (studyId: string) => [...sweepKeys.all, 'study', studyId] as const,
};
