import { buildNodes, cellCount, type GridParams } from './graded-grid';
import { gridParamsOf, rebuildDerived, recentreAfterRemap, type FlowRun } from './flow-run';
import { remapMonotone } from './monotone-remap';

/**
 * Refinement toward a forming singularity (numerics.md §2). With λ = 1/max|∇u| at a
 * pole, the near-uniform core of the graded grid (distance d < δ/κ, where the cell
 * size δ + κd is ≈ δ) is kept a small fraction u = δ/(κλ) of λ, so the collapsing
 * profile lives in the geometric part of the grid, which is invariant under the
 * scaling r → (1+κ)r: a fixed number of cells per λ (≈ ln(1 + 1/u)/κ) at every
 * scale. This matters in two dimensions, where the energy is scale invariant and
 * a non-geometric core would pin the shrinking bubble to the grid. When u exceeds
 * CORE_FRACTION_MAX, δ is lowered to CORE_FRACTION_TARGET·κλ, the grid rebuilt
 * (graded-grid.ts) and h remapped monotonically. Each regrid adds about
 * ln(CORE_FRACTION_MAX/CORE_FRACTION_TARGET)/κ points, so λ can fall by many
 * decades with a bounded number of points, up to the spec's grid.maxPoints.
 */
/** Refinement starts once λ is below this fraction of the graded zone (min(R/4, π/4)). */
export const REFINE_BELOW_ZONE_FRACTION = 0.1;
export const CORE_FRACTION_TARGET = 0.001;
export const CORE_FRACTION_MAX = 0.002;
/** A core larger than λ with no room to refine: the run cannot be trusted any more. */
export const CORE_FRACTION_FLOOR = 1;

export function maybeRefine(run: FlowRun): void {
  const model = run.model;
  const lambda = 1 / run.gradMax;
  const at = run.op.rMid[run.gradMaxCell]!;
  const zone = Math.min(model.length / 4, Math.PI / 4);
  let side: 'left' | 'right' | null = null;
  if (model.leftPole && at <= zone) side = 'left';
  else if (model.rightPole && model.length - at <= zone) side = 'right';
  // Refinement is for concentration well below the bulk scale, not for smooth data.
  if (side === null || lambda > REFINE_BELOW_ZONE_FRACTION * zone) return;
  const delta = side === 'left' ? run.s.deltaLeft : run.s.deltaRight;
  const kappa = run.s.kappa;
  const core = delta / (kappa * lambda);
  if (core <= CORE_FRACTION_MAX) return;
  const params: GridParams = gridParamsOf(run);
  const newDelta = CORE_FRACTION_TARGET * kappa * lambda;
  if (side === 'left') params.deltaLeft = newDelta;
  else params.deltaRight = newDelta;
  const cells = cellCount(params);
  if (cells + 1 > run.spec.grid.maxPoints) {
    if (core > CORE_FRACTION_FLOOR) run.s.refinementCapped = 1;
    return;
  }
  const r = buildNodes(params, cells);
  const h = new Float64Array(r.length);
  remapMonotone(run.r, run.h, r, h);
  const before = run.energy;
  run.r = r;
  run.h = h;
  if (side === 'left') run.s.deltaLeft = newDelta;
  else run.s.deltaRight = newDelta;
  run.s.regrids += 1;
  rebuildDerived(run);
  recentreAfterRemap(run);
  run.s.regridEnergyChange += run.energy - before;
}
