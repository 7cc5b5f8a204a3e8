import type { RunListQuery } from '@kiln/shared';

/** Cache keys of sweeps; mutations invalidate by prefix. */
export const sweepKeys = {
  all: ['sweeps'] as const,
  detail: (sweepId: string) => [...sweepKeys.all, 'detail', sweepId] as const,
  /** `version` (the sweep's counts by state) changes the key when a run changes state, so the last change is always read. */
  runs: (sweepId: string, query: Partial<RunListQuery>, version = '') => [...sweepKeys.all, 'runs', sweepId, query, version] as const,
  allRuns: (sweepId: string, version = '') => [...sweepKeys.all, 'all-runs', sweepId, version] as const,
  preview: (body: unknown) => [...sweepKeys.all, 'preview', body] as const,
  forStudy: (studyId: string) => [...sweepKeys.all, 'study', studyId] as const,
};
