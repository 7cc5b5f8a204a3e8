import type { RunSpec } from '../spec';
import { createFlowRun, type FlowRun } from './flow-run';
import { dilationProfileMaximumOfRun, wholeSphereOperator } from './dilation-profile';
import { ForkError, forkIncompatibility } from './fork-flow-run';
import { composeDilation, profileSource, type DilationProfileOptions } from './mobius-dilations';
import { ProfileTarget } from './profile-target';

/** What {@link jumpToDilationMaximum} did. */
export interface DilationJump {
  run: FlowRun;
  /** The maximiser s* of F(s) = D(h∘γ_s) for the parent's state, F(s*), and the gap F(s*) − F(1). */
  sStar: number;
  energyAtMax: number;
  gap: number;
}

/**
 * EXPERIMENTAL — "jump to the maximiser": a new run of `spec` whose initial state is
 * h∘γ_{s*} of the parent's current state, s* the maximiser of the Möbius energy
 * profile F(s) = D(h∘γ_s) (numerics.md §1; found on a log grid and refined by golden
 * section, `dilationProfileMaximum`). The intent is to move a state along its
 * dilation orbit to the top of F (for the identity of S^m, m ≥ 3, that is the
 * centred map) and let the standard flow continue from there. It is not a step of
 * any flow: energy is *added* (the gap), the result depends on the s-range searched
 * and on the interpolation of the profile (monotone Steffen), and no published
 * method stands behind it. The API records the new run as a fork of the parent.
 *
 * Rules as for `forkFlowRun`: same domain, dimension and target (a {@link ForkError}
 * names the difference); sphere domain only; the new run starts on the spec's own
 * grid, on the whole sphere (h∘γ_s is not reflection-symmetric), with the parent's
 * time t carried over. Refused for `flow: "normalized"`: that flow re-centres its
 * initial data, which would undo the jump.
 */
export function jumpToDilationMaximum(parent: FlowRun, spec: RunSpec, opts: DilationProfileOptions = {}): DilationJump {
  const problem = forkIncompatibility(parent.spec, spec);
  if (problem !== null) throw new ForkError(`cannot jump: ${problem}`);
  if (parent.model.domain !== 'sphere') throw new ForkError('cannot jump: dilations act on the sphere domain only');
  if (spec.flow === 'normalized') {
    throw new ForkError('cannot jump into flow "normalized": it re-centres its initial data, which undoes the jump (use "standard")');
  }
  if (spec.symmetry === 'reflection') {
    throw new ForkError('cannot jump with symmetry "reflection": h∘γ_s is not reflection-symmetric for s ≠ 1');
  }
  for (let i = 0; i < parent.h.length; i++) {
    if (!Number.isFinite(parent.h[i]!)) throw new ForkError('cannot jump: the parent state is not finite');
  }
  const max = dilationProfileMaximumOfRun(parent, opts);
  const { profile } = wholeSphereOperator(parent);
  const h = new Float64Array(profile.r.length);
  composeDilation(profileSource(profile), max.sStar, profile.r, h, new Float64Array(profile.r.length));
  const target =
    parent.model.target instanceof ProfileTarget
      ? ProfileTarget.fromKnots(parent.model.target.knotsH, parent.model.target.knotsF, parent.model.target.knotsZ)
      : undefined;
  const run = createFlowRun({ ...spec, symmetry: 'none' }, { start: { profile: { r: profile.r, h }, symmetric: false, target } });
  run.s.tHi = parent.s.tHi;
  run.s.tLo = parent.s.tLo;
  run.samples = [];
  return { run, sStar: max.sStar, energyAtMax: max.energyAtMax, gap: max.gap };
}
