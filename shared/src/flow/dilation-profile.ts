import { DiscreteOperator } from './discrete-operator';
import type { FlowModel } from './flow-model';
import { flowProfile, type FlowRun } from './flow-run';
import {
  dilationEnergies,
  dilationProfileMaximum,
  profileSource,
  type DilationProfileMaximum,
  type DilationProfileOptions,
} from './mobius-dilations';

/**
 * The Möbius energy profile F(s) = D(h∘γ_s) of a run's current state (numerics.md §1):
 * initial data (a fresh run), any step, any checkpoint (`deserializeCheckpoint`).
 * Sphere domain only. The state is taken on the whole sphere (mirrored under
 * reflection symmetry, `flowProfile`), composed with γ_s at the nodes of that same
 * grid by monotone interpolation, and measured with the discrete energy D_h.
 */
export function wholeSphereOperator(run: FlowRun): { op: DiscreteOperator; profile: { r: Float64Array; h: Float64Array } } {
  if (run.model.domain !== 'sphere') throw new Error('the Möbius energy profile is defined on the sphere domain only');
  const profile = flowProfile(run);
  if (run.model.symmetry === 'none') return { op: run.op, profile };
  const model: FlowModel = {
    ...run.model,
    symmetry: 'none',
    length: Math.PI,
    rightPole: true,
    rightValue: Math.PI,
    energyFactor: run.model.sphereArea,
  };
  return { op: new DiscreteOperator(model, profile.r), profile };
}

/** [s, F(s)] for the given s values (in the given order, exactly as given). */
export function dilationProfileOfRun(run: FlowRun, sValues: readonly number[]): [number, number][] {
  for (const s of sValues) {
    if (!(s > 0 && Number.isFinite(s))) throw new Error(`dilation s must be a positive finite number (got ${s})`);
  }
  const { op, profile } = wholeSphereOperator(run);
  const F = dilationEnergies(op, profileSource(profile), sValues, run.model.sphereArea);
  return sValues.map((s, k) => [s, F[k]!]);
}

/** F on a log grid of s for the run's current state, its maximiser s* and the gap F(s*) − F(1). */
export function dilationProfileMaximumOfRun(run: FlowRun, opts: DilationProfileOptions = {}): DilationProfileMaximum {
  const { op, profile } = wholeSphereOperator(run);
  return dilationProfileMaximum(op, profileSource(profile), run.model.sphereArea, opts);
}
