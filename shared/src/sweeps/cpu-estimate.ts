import type { RunSpec } from '../spec';

/**
 * A rough, deliberately simple prediction of a run's CPU time, for the sweep
 * preview against a quota. It is not a promise: blow-up runs refine their grid
 * and take many small steps, steady states may stop early.
 *
 * Model: cost ≈ points × steps × Newton iterations × seconds per point-iteration,
 * with steps ≈ min(tMax / maxStep + 200, 10⁶) and 3 Newton iterations a step.
 * The per-point cost is the order measured by `npm run bench:flow` (docs/benchmarks.md).
 */
export const CPU_ESTIMATE_MODEL = {
  secondsPerPointIteration: 1e-7,
  newtonIterationsPerStep: 3,
  maxSteps: 1_000_000,
  extraSteps: 200,
} as const;

export function estimateRunCpuSeconds(spec: RunSpec): number {
  const m = CPU_ESTIMATE_MODEL;
  const steps = Math.min(spec.time.tMax / spec.time.maxStep + m.extraSteps, m.maxSteps);
  const points = (spec.grid.points + spec.grid.maxPoints) / 2;
  return points * steps * m.newtonIterationsPerStep * m.secondsPerPointIteration;
}
