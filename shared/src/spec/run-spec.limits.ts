/**
 * Limits of the run spec (numerics.md §5). They protect a shared machine: a spec
 * outside them is rejected before any work starts. Every message of the schema
 * quotes these numbers, so changing one here changes what users read.
 */
export const RUN_SPEC_LIMITS = {
  /** Dimension m of the domain. */
  dimMin: 2,
  dimMax: 12,
  /** Starting number of grid points (nodes, both ends included). */
  pointsMin: 20,
  pointsMax: 20_000,
  /** Cap on the number of points that refinement toward a singularity may reach. */
  refinedPointsMax: 50_000,
  /** Largest end time t_max. */
  tMaxMax: 1e6,
  /** Local error tolerance range of the time stepper. */
  toleranceMin: 1e-12,
  toleranceMax: 1e-2,
  /** Tension threshold range for `converged`. */
  tensionMin: 1e-14,
  tensionMax: 1,
  /** Gradient bound range for `blowup`. */
  gradientBoundMin: 10,
  gradientBoundMax: 1e15,
  /** |boundaryAngle| on the ball, radians. */
  boundaryAngleMax: 4 * Math.PI,
  /** Axis ratio b of the ellipsoid target. */
  axisRatioMin: 0.01,
  axisRatioMax: 100,
  /** Dilation parameter s of the `dilated` initial data. */
  dilationMin: 1e-3,
  dilationMax: 1e3,
  /** |slope| of `linear` initial data and |amplitude| of `perturbed`. */
  slopeMax: 100,
  amplitudeMax: 10,
  /** Mode of `perturbed` initial data (an integer, so h(π) = π on the sphere). */
  modeMin: 1,
  modeMax: 64,
  /** Length of an upload id. */
  uploadIdMaxLength: 200,
} as const;

/** Defaults filled in by {@link withRunSpecDefaults}. */
export const RUN_SPEC_DEFAULTS = {
  flow: 'standard',
  symmetry: 'auto',
  /** Local error tolerance of the time stepper (absolute, on the angle h). */
  tolerance: 1e-6,
  /** Tension threshold for `converged`. */
  tension: 1e-8,
  /** Gradient bound for `blowup`. */
  gradientBound: 1e8,
  /** Largest step, as a fraction of t_max when not given. */
  maxStepFraction: 0.01,
  /** Refinement point cap when not given: max(4·points, points + 2000), at most refinedPointsMax. */
  maxPointsFactor: 4,
  maxPointsExtra: 2000,
} as const;
