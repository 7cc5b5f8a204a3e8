import type { TargetSpec } from '../spec';

/**
 * The target N, a hypersurface of revolution (f(h)·ω, z(h)) parametrised by its polar
 * angle h ∈ [0, π] (numerics.md §1). The operator needs only
 *   P = ρ² = f'² + z'²  and  Q = f²  with their first two derivatives in h,
 * because the discrete energy (§2) is ½·P(h̄)·h_r² + ½·(m−1)·Q(h̄)/g².
 * A tabulated `profile` target implements the same interface from its splines:
 *   P = f'² + z'², P' = 2(f'f'' + z'z''), P'' = 2(f''² + f'f''' + z''² + z'z'''),
 *   Q = f², Q' = 2ff', Q'' = 2(f'² + ff'').
 */
export interface TargetGeometry {
  readonly kind: 'sphere' | 'ellipsoid' | 'profile';
  /** f(π − h) = f(h) and z(π − h) = −z(h): the reflection class of numerics.md is invariant. */
  readonly reflectionSymmetric: boolean;
  /** Writes [P, P', P'', Q, Q', Q''] at angle h into out[0..5]. Hot path: no allocation. */
  evaluate(h: number, out: Float64Array): void;
  /** P(h) = ρ(h)² alone (the lumped mass). */
  rhoSquared(h: number): number;
  /** d/dh ρ(h)². */
  rhoSquaredPrime(h: number): number;
  /** Profile functions, for plots and tests. */
  f(h: number): number;
  z(h: number): number;
  /** ρ(π/2), the stretch of the equator (numerics.md §4.6). */
  readonly equatorRho: number;
}

/** The round sphere: f = sin h, z = cos h, ρ ≡ 1. */
export class SphereTarget implements TargetGeometry {
  readonly kind = 'sphere' as const;
  readonly reflectionSymmetric = true;
  readonly equatorRho = 1;
  evaluate(h: number, out: Float64Array): void {
    const s2 = Math.sin(2 * h);
    const c2 = Math.cos(2 * h);
    out[0] = 1;
    out[1] = 0;
    out[2] = 0;
    out[3] = 0.5 - 0.5 * c2; // sin²h
    out[4] = s2; // 2 sin h cos h
    out[5] = 2 * c2; // 2 cos 2h
  }
  rhoSquared(): number {
    return 1;
  }
  rhoSquaredPrime(): number {
    return 0;
  }
  f(h: number): number {
    return Math.sin(h);
  }
  z(h: number): number {
    return Math.cos(h);
  }
}

/** The ellipsoid with axis ratio b: f = sin h, z = b cos h, ρ² = cos²h + b² sin²h. */
export class EllipsoidTarget implements TargetGeometry {
  readonly kind = 'ellipsoid' as const;
  readonly reflectionSymmetric = true;
  readonly equatorRho: number;
  private readonly k: number; // b² − 1
  constructor(readonly axisRatio: number) {
    this.k = axisRatio * axisRatio - 1;
    this.equatorRho = axisRatio;
  }
  evaluate(h: number, out: Float64Array): void {
    const s2 = Math.sin(2 * h);
    const c2 = Math.cos(2 * h);
    const sin2 = 0.5 - 0.5 * c2;
    out[0] = 1 + this.k * sin2;
    out[1] = this.k * s2;
    out[2] = 2 * this.k * c2;
    out[3] = sin2;
    out[4] = s2;
    out[5] = 2 * c2;
  }
  rhoSquared(h: number): number {
    const s = Math.sin(h);
    return 1 + this.k * s * s;
  }
  rhoSquaredPrime(h: number): number {
    return this.k * Math.sin(2 * h);
  }
  f(h: number): number {
    return Math.sin(h);
  }
  z(h: number): number {
    return this.axisRatio * Math.cos(h);
  }
}

/** Builds the target geometry of a spec. A `profile` target is built from its upload (flow-resources.ts, profile-target.ts). */
export function createTarget(spec: TargetSpec): TargetGeometry {
  switch (spec.kind) {
    case 'sphere':
      return new SphereTarget();
    case 'ellipsoid':
      return new EllipsoidTarget(spec.axisRatio);
    case 'profile':
      throw new Error(`target.kind "profile" needs the uploaded target profile ${spec.uploadId}: pass it as createFlowRun(spec, { targetProfile })`);
  }
}
