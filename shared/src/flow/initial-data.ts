import type { DomainSpec, InitialSpec, RunSpec } from '../spec';

/** Möbius dilation of the polar angle: tan(γ_s(r)/2) = s·tan(r/2) (numerics.md §1). */
export function dilate(s: number, r: number): number {
  return 2 * Math.atan2(s * Math.sin(0.5 * r), Math.cos(0.5 * r));
}

/**
 * h₀(r) of numerics.md §5:
 * - identity: h₀ = r on the sphere, α·r on the ball;
 * - linear (ball): h₀ = slope·r inside, the boundary value α is imposed at r = 1
 *   (incompatible data are smoothed at once by the flow);
 * - dilated (sphere): h₀ = γ_s(r);
 * - perturbed: h₀ = r + A·sin(k·r) on the sphere (k an integer keeps h(π) = π), and
 *   α·r + A·sin(kπ·r) on the ball (keeps h(1) = α).
 */
export function initialValue(domain: DomainSpec, initial: InitialSpec, r: number): number {
  const ball = domain.kind === 'ball';
  const alpha = ball ? domain.boundaryAngle : Math.PI;
  switch (initial.kind) {
    case 'identity':
      return ball ? alpha * r : r;
    case 'linear':
      return ball && r >= 1 ? alpha : initial.slope * r;
    case 'dilated':
      return dilate(initial.s, r);
    case 'perturbed':
      return ball
        ? alpha * r + initial.amplitude * Math.sin(initial.mode * Math.PI * r)
        : r + initial.amplitude * Math.sin(initial.mode * r);
    case 'table':
      throw new Error(`initial.kind "table" is an uploaded profile (${initial.uploadId}): pass it as createFlowRun(spec, { initialProfile })`);
  }
}

/**
 * h₀ on n equally spaced points of the whole domain ([0, π] or [0, 1]), for a
 * preview plot (cheap: no grid, no operator). Throws for `table` data.
 */
export function initialProfile(spec: Pick<RunSpec, 'domain' | 'initial'>, n: number): { r: Float64Array; h: Float64Array } {
  const count = Math.max(2, Math.floor(n));
  const length = spec.domain.kind === 'ball' ? 1 : Math.PI;
  const r = new Float64Array(count);
  const h = new Float64Array(count);
  for (let i = 0; i < count; i++) {
    r[i] = i === count - 1 ? length : (i * length) / (count - 1);
    h[i] = initialValue(spec.domain, spec.initial, r[i]!);
  }
  return { r, h };
}
