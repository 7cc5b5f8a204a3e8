// Small run specs for tests of the plumbing (not of the numerics).

/** S³ → ellipsoid, coarse grid: converges to a steady state in well under a second of CPU. */
export const QUICK_SPHERE_SPEC = {
  domain: { kind: 'sphere', dim: 3 },
  target: { kind: 'ellipsoid', axisRatio: 1.5 },
  flow: 'standard',
  initial: { kind: 'identity' },
  grid: { points: 60 },
  time: { tMax: 20, maxStep: 0.5, tolerance: 1e-5 },
  stop: { tension: 1e-6, gradientBound: 1e6 },
} as const;

/** Ball B² → S² with h₀ = α·r, α = 0.9π: converges (Chang & Ding, 1991). */
export const QUICK_BALL_SPEC = {
  domain: { kind: 'ball', dim: 2, boundaryAngle: 0.9 * Math.PI },
  target: { kind: 'sphere' },
  initial: { kind: 'identity' },
  grid: { points: 60 },
  time: { tMax: 5, maxStep: 0.1, tolerance: 1e-5 },
  stop: { tension: 1e-6, gradientBound: 1e6 },
} as const;
