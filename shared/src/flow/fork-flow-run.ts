import type { RunSpec } from '../spec';
import { createFlowModel, type FlowModel } from './flow-model';
import {
  createFlowRun,
  flowProfile,
  gridParamsOf,
  pushSample,
  recordHistory,
  type FlowRun,
} from './flow-run';
import { buildNodes, cellCount, initialGridParams, type GridParams } from './graded-grid';
import type { FlowStartState } from './flow-resources';
import { ProfileTarget } from './profile-target';
import { RecentreError } from './mobius-dilations';

/** Error for a fork whose spec cannot continue the parent's state; the message says which field. */
export class ForkError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'ForkError';
  }
}

/**
 * A new run of `spec` that starts from the parent's current state (issue 5, "fork from
 * any checkpoint with spec overrides"): the parent's profile h(·, t) on the whole
 * domain (mirrored if the parent used reflection symmetry) carried onto the fork's
 * grid by monotone piecewise-cubic interpolation (Steffen's slopes, monotone-remap.ts:
 * no new extrema, exact for h ≈ c·r at a pole), with the end values imposed exactly.
 *
 * What may change: `grid` (finer, coarser, another cap), `time` (t_max, largest step,
 * tolerance), `stop`, `symmetry` (reflection → none always; none → reflection is
 * refused, the parent's profile is not exactly symmetric), `flow` (standard →
 * normalized: the carried profile is re-centred, h∘γ_s with X_h = 0 on the fork's grid,
 * as a new normalized run's initial data; the `recentre` record of the summary says
 * by which s), and `initial`,
 * which is ignored: the state comes from the parent.
 * What must not change (a {@link ForkError} names it): the domain kind, its dimension,
 * the ball's boundary angle (h(1) = α is part of the state) and the target.
 *
 * What carries over:
 * - the time t (double-double), so plots of the fork continue the parent's;
 * - the energy and max|∇u| at the parent's t = 0 (`energyInitial`, `gradMaxInitial`),
 *   so the growth tests of the blow-up heuristics and "energy lost" keep their origin;
 * - the history ring the blow-up fit reads (rows are time-stamped), plus one new row
 *   at the fork's start;
 * - refinement toward a pole: when the grid is rebuilt, the pole cell sizes are the
 *   new spec's ones times the parent's refinement ratio δ/δ₀ (so a forming
 *   singularity stays resolved), within `grid.maxPoints`;
 * - an uploaded `profile` target: its spline knots (no upload needed).
 * What does not: the step-size history (the first step is chosen afresh as for a new
 * run), the step, rejection, Newton and regrid counters (the fork counts its own
 * work), the outcome, and undrained samples. `regridEnergyChange` starts at the
 * energy change caused by the transfer (0 when the grid is kept).
 *
 * Same spec (same `grid.points` and the same symmetry): the parent's grid is kept
 * node for node, so the fork's profile, energy and tension at the start are
 * bit-identical to the parent's; its continuation differs from the parent's only
 * through the fresh step-size sequence, i.e. within the time-stepping tolerance.
 * Another grid: the start differs from the parent by the interpolation error
 * (fourth order in the spacing where h is smooth), the continuation by the grid error.
 */
export function forkFlowRun(parent: FlowRun, spec: RunSpec): FlowRun {
  checkCompatible(parent.spec, spec);
  for (let i = 0; i < parent.h.length; i++) {
    if (!Number.isFinite(parent.h[i]!)) throw new ForkError('cannot fork: the parent state is not finite (the parent run failed numerically)');
  }
  const symmetric = parent.model.symmetry === 'reflection';
  const target = parent.model.target instanceof ProfileTarget
    ? ProfileTarget.fromKnots(parent.model.target.knotsH, parent.model.target.knotsF, parent.model.target.knotsZ)
    : undefined;
  let model: FlowModel;
  try {
    model = createFlowModel(spec, { target, initialSymmetric: symmetric });
  } catch (e) {
    const message = (e as Error).message;
    if (spec.flow === 'normalized' && /normalized/.test(message)) {
      throw new ForkError(`cannot fork into flow "normalized": ${message}`);
    }
    if (spec.symmetry === 'reflection' && !symmetric) {
      throw new ForkError(
        'cannot fork with symmetry "reflection": the parent ran without it, so its profile is not exactly reflection-symmetric',
      );
    }
    throw new ForkError(`cannot fork: ${message}`);
  }
  const start: FlowStartState = { profile: flowProfile(parent), symmetric, target, grid: forkGrid(parent, spec, model) };
  let run: FlowRun;
  try {
    run = createFlowRun(spec, { start });
  } catch (e) {
    if (e instanceof RecentreError) throw new ForkError(`cannot fork into flow "normalized": ${e.message}`);
    throw e;
  }
  const s = run.s;
  const p = parent.s;
  s.tHi = p.tHi;
  s.tLo = p.tLo;
  s.energyInitial = p.energyInitial;
  s.gradMaxInitial = p.gradMaxInitial;
  s.regridEnergyChange = run.energy - parent.energy;
  run.history.set(parent.history);
  s.historyHead = p.historyHead;
  s.historyCount = p.historyCount;
  s.lastHistoryLogGrad = -Infinity;
  s.lastHistoryStep = 0;
  recordHistory(run, true);
  run.samples = [];
  pushSample(run);
  return run;
}

/** The fork's grid: the parent's own when nothing about the grid changed, else the new spec's with the parent's refinement. */
function forkGrid(parent: FlowRun, spec: RunSpec, model: FlowModel): { params: GridParams; r: Float64Array } {
  if (spec.grid.points === parent.spec.grid.points && model.symmetry === parent.model.symmetry) {
    if (parent.r.length > spec.grid.maxPoints) {
      throw new ForkError(`cannot fork: the parent's refined grid has ${parent.r.length} points, more than grid.maxPoints (${spec.grid.maxPoints})`);
    }
    return { params: gridParamsOf(parent), r: parent.r };
  }
  const pm = parent.model;
  const parentStart = initialGridParams(pm.length, pm.leftPole, pm.rightPole, parent.spec.grid.points);
  const ratioLeft = Math.min(1, parent.s.deltaLeft / parentStart.deltaLeft);
  // A half-domain parent is mirrored: its right pole is refined as its left one.
  const ratioRight = pm.rightPole ? Math.min(1, parent.s.deltaRight / parentStart.deltaRight) : ratioLeft;
  const params = initialGridParams(model.length, model.leftPole, model.rightPole, spec.grid.points);
  let cells = spec.grid.points - 1;
  if (ratioLeft < 1 || ratioRight < 1) {
    params.deltaLeft *= ratioLeft;
    params.deltaRight *= ratioRight;
    cells = Math.max(cells, cellCount(params));
  }
  if (cells + 1 > spec.grid.maxPoints) {
    throw new ForkError(
      `cannot fork: keeping the parent's refinement toward the pole needs ${cells + 1} points, more than grid.maxPoints (${spec.grid.maxPoints})`,
    );
  }
  return { params, r: buildNodes(params, cells) };
}

function checkCompatible(a: RunSpec, b: RunSpec): void {
  const problem = forkIncompatibility(a, b);
  if (problem !== null) throw new ForkError(`cannot fork: ${problem}`);
}

/**
 * Why a fork with spec `fork` cannot continue a run of spec `parent` (the domain,
 * its dimension, the ball's boundary angle or the target differ), or null. Cheap and
 * state-free, so the API can refuse such a fork before creating it; `forkFlowRun`
 * applies the same check.
 */
export function forkIncompatibility(parent: RunSpec, fork: RunSpec): string | null {
  const a = parent;
  const b = fork;
  if (a.domain.kind !== b.domain.kind) {
    return `domain.kind "${b.domain.kind}" differs from the parent's "${a.domain.kind}" (the profile lives on the parent's domain)`;
  }
  if (a.domain.dim !== b.domain.dim) return `domain.dim ${b.domain.dim} differs from the parent's ${a.domain.dim}`;
  if (a.domain.kind === 'ball' && b.domain.kind === 'ball' && a.domain.boundaryAngle !== b.domain.boundaryAngle) {
    return `domain.boundaryAngle ${b.domain.boundaryAngle} differs from the parent's ${a.domain.boundaryAngle} (h(1) = α is part of the state)`;
  }
  const key = (t: RunSpec['target']) =>
    t.kind === 'ellipsoid' ? `ellipsoid ${t.axisRatio}` : t.kind === 'profile' ? `profile ${t.uploadId}` : t.kind;
  if (key(a.target) !== key(b.target)) {
    return `target ${JSON.stringify(b.target)} differs from the parent's ${JSON.stringify(a.target)}`;
  }
  return null;
}
