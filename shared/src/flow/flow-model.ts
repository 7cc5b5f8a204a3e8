import type { RunSpec } from '../spec';
import { initialIsReflectionSymmetric } from '../spec';
import { createTarget, type TargetGeometry } from './target-geometry';

/** Symmetry mode actually used by a run (numerics.md, "Reflection symmetry"). */
export type SymmetryUsed = 'reflection' | 'none';

/**
 * The continuous problem a run solves (numerics.md §1), after the symmetry decision:
 * the interval [0, R] actually discretised, its warping function g, which ends are
 * poles (g = 0, where h ≈ c·r) and the fixed end values.
 */
export interface FlowModel {
  readonly m: number;
  readonly domain: 'sphere' | 'ball';
  readonly target: TargetGeometry;
  readonly symmetry: SymmetryUsed;
  /** Right end of the computational interval: 1 (ball), π (sphere), π/2 (sphere with reflection). */
  readonly length: number;
  /** Whether r = 0 and r = length are poles that the grid grades toward. */
  readonly leftPole: boolean;
  readonly rightPole: boolean;
  /** Dirichlet values h(0) and h(length). */
  readonly leftValue: number;
  readonly rightValue: number;
  /** |S^(m−1)| times the number of copies of the computed interval (2 with reflection). */
  readonly energyFactor: number;
  /** |S^(m−1)|. */
  readonly sphereArea: number;
}

/** |S^k|, the area of the unit k-sphere: |S^0| = 2, |S^1| = 2π, |S^k| = 2π/(k−1)·|S^(k−2)|. */
export function unitSphereArea(k: number): number {
  let a = k % 2 === 0 ? 2 : 2 * Math.PI;
  for (let j = k % 2 === 0 ? 2 : 3; j <= k; j += 2) a *= (2 * Math.PI) / (j - 1);
  return a;
}

/** g(r) of the domain: sin r on the sphere, r on the ball. */
export function warp(domain: 'sphere' | 'ball', r: number): number {
  return domain === 'sphere' ? Math.sin(r) : r;
}

/**
 * What the spec alone cannot say (flow-resources.ts, fork-flow-run.ts): the target
 * geometry of an uploaded profile, whether tabulated or forked initial data are
 * reflection-symmetric, and (on resume) the symmetry a run already uses.
 */
export interface FlowModelOverrides {
  target?: TargetGeometry;
  /** Replaces the spec's verdict on its initial data in the `auto`/`reflection` decision. */
  initialSymmetric?: boolean;
  /** The symmetry decided when the run started (a checkpoint's grid says which); skips the decision. */
  symmetry?: SymmetryUsed;
}

/** Decides the symmetry mode and builds the model. */
export function createFlowModel(spec: RunSpec, overrides: FlowModelOverrides = {}): FlowModel {
  if (spec.flow === 'normalized' && spec.domain.kind !== 'sphere') {
    throw new Error('flow "normalized" is defined only on the sphere domain');
  }
  const target = overrides.target ?? createTarget(spec.target);
  const m = spec.domain.dim;
  const area = unitSphereArea(m - 1);
  if (spec.domain.kind === 'ball') {
    return {
      m,
      domain: 'ball',
      target,
      symmetry: 'none',
      length: 1,
      leftPole: true,
      rightPole: false,
      leftValue: 0,
      rightValue: spec.domain.boundaryAngle,
      energyFactor: area,
      sphereArea: area,
    };
  }
  const dataSymmetric = overrides.initialSymmetric ?? initialIsReflectionSymmetric(spec.initial) === true;
  let symmetry: SymmetryUsed = 'none';
  if (overrides.symmetry !== undefined) {
    symmetry = overrides.symmetry;
  } else if (spec.symmetry === 'reflection') {
    if (!dataSymmetric || !target.reflectionSymmetric) {
      throw new Error('symmetry "reflection" needs reflection-symmetric initial data and target');
    }
    symmetry = 'reflection';
  } else if (spec.symmetry === 'auto') {
    symmetry = dataSymmetric && target.reflectionSymmetric ? 'reflection' : 'none';
  }
  const half = symmetry === 'reflection';
  return {
    m,
    domain: 'sphere',
    target,
    symmetry,
    length: half ? Math.PI / 2 : Math.PI,
    leftPole: true,
    rightPole: !half,
    leftValue: 0,
    rightValue: half ? Math.PI / 2 : Math.PI,
    energyFactor: half ? 2 * area : area,
    sphereArea: area,
  };
}
