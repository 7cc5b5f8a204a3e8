import type { DiscreteOperator } from './discrete-operator';
import { solveTridiagonal, solveTridiagonal2 } from './tridiagonal';

/**
 * One step of TR-BDF2 (Bank et al., IEEE Trans. Electron Devices 32, 1985; error
 * estimate and its stiff filter after Hosea & Shampine, Appl. Numer. Math. 20, 1996)
 * for the semi-discrete flow M(h) ḣ = −G(h) (numerics.md §2): L-stable, second
 * order, one-step (so a regrid needs no history), and both implicit stages share
 * the matrix form  M(z)(z − rhs) + θ·G(z) = 0  with θ = d·dt, solved by Newton on
 * the tridiagonal Jacobian with the Thomas algorithm.
 *
 *   γ = 2 − √2, d = γ/2
 *   trapezoidal stage:  z  − d·dt·F(z)  = y_n + d·dt·F(y_n)
 *   BDF2 stage:         y₊ − d·dt·F(y₊) = w₁ z − w₀ y_n,  w₁ = (√2+1)/2, w₀ = (√2−1)/2
 *   error estimate:     e = 2C·dt·(F_n/γ − F_γ/(γ(1−γ)) + F₊/(1−γ)),
 *                       C = (−3γ² + 4γ − 2)/(12(2 − γ)),  filtered by (M + θH) ê = M e
 *                       (and filtered a second time before a rejection).
 *
 * Möbius-normalized flow (numerics.md §1), `normalized = true`: the flow is
 * M ḣ = −G + σ M w, w = sin r·h_r (DiscreteOperator.drift), with the scalar σ an
 * unknown of every implicit stage, fixed by the constraint X_h(stage value) = 0
 * (the center stays at round-off; its derivative form L·ḣ = 0 is the σ of §1).
 * The stage system for (z, σ) is bordered tridiagonal:
 *   [ J   b ] [δ ]   [R]     R_i = M_i(z_i − rhs_i) + θG_i − θσ M_i w_i,   b = ∂R/∂σ = −θ M w,
 *   [ Lᵀ  0 ] [δσ] = [C],    C = X_h(z),  L = ∂X_h/∂z,
 * solved per Newton iteration with two Thomas solves (J x = R, J y = b) and the
 * scalar Schur complement: δσ = (L·x − C)/(L·y), δ = x − δσ·y (block elimination
 * of a bordered system, as in Sherman–Morrison; O(N)). F_n passed to `attempt` is
 * then τ + σ_n w with the instantaneous σ_n = −L·τ/L·w.
 */
export const TR_GAMMA = 2 - Math.SQRT2;
export const TR_D = TR_GAMMA / 2;
const W1 = (Math.SQRT2 + 1) / 2;
const W0 = (Math.SQRT2 - 1) / 2;
const C_LTE = (-3 * TR_GAMMA * TR_GAMMA + 4 * TR_GAMMA - 2) / (12 * (2 - TR_GAMMA));
const E_N = 1 / TR_GAMMA;
const E_G = -1 / (TR_GAMMA * (1 - TR_GAMMA));
const E_1 = 1 / (1 - TR_GAMMA);
/** Newton gives up after this many iterations in one stage… */
const NEWTON_MAX_ITERATIONS = 8;
/** …or when an update is not at least this much smaller than the one before (no contraction). */
const NEWTON_MIN_CONTRACTION = 1;
/**
 * A step may move no node by more than this (radians). A larger move means Newton
 * found another root of the implicit equations (the stiff core at a pole has
 * several), not the continuation of the flow; the step is treated as a failure.
 */
export const STEP_CHANGE_MAX = 0.5;


/** Arrays of one stepper, preallocated per grid (reallocated only on regrid). */
export class StepperWorkspace {
  readonly z: Float64Array;
  readonly y1: Float64Array;
  readonly rhs1: Float64Array;
  readonly rhs2: Float64Array;
  readonly fg: Float64Array;
  readonly f1: Float64Array;
  readonly grad: Float64Array;
  readonly hDiag: Float64Array;
  readonly hUpper: Float64Array;
  readonly jDiag: Float64Array;
  readonly jUpper: Float64Array;
  readonly jLower: Float64Array;
  readonly delta: Float64Array;
  readonly work: Float64Array;
  /** Normalized flow only (length 0 otherwise): L = ∂X_h/∂z, the drift w, the border column b and its solve. */
  readonly cgrad: Float64Array;
  readonly wdrift: Float64Array;
  readonly border: Float64Array;
  /** σ of the current stage: set `sigma` to the starting guess before {@link attempt}; after it, σ of the BDF2 stage. */
  sigma = 0;
  /** Result of the last {@link attempt} (fields, not a returned object: no allocation per step). */
  lastOk = false;
  /** Scaled error estimate of the last attempt (accept when ≤ 1); Infinity when Newton failed. */
  lastError = Infinity;
  /** Newton iterations of the last attempt (both stages). */
  lastIterations = 0;
  constructor(
    readonly op: DiscreteOperator,
    readonly normalized = false,
  ) {
    const n = op.cells + 1;
    const nn = normalized ? n : 0;
    this.cgrad = new Float64Array(nn);
    this.wdrift = new Float64Array(nn);
    this.border = new Float64Array(nn);
    this.z = new Float64Array(n);
    this.y1 = new Float64Array(n);
    this.rhs1 = new Float64Array(n);
    this.rhs2 = new Float64Array(n);
    this.fg = new Float64Array(n);
    this.f1 = new Float64Array(n);
    this.grad = new Float64Array(n);
    this.hDiag = new Float64Array(n);
    this.hUpper = new Float64Array(n);
    this.jDiag = new Float64Array(n);
    this.jUpper = new Float64Array(n);
    this.jLower = new Float64Array(n);
    this.delta = new Float64Array(n);
    this.work = new Float64Array(n);
  }

  /**
   * Newton for M(z)(z − rhs) + θ G(z) = 0 on the interior nodes; z holds the guess
   * on entry (and the Dirichlet values at both ends). Returns iterations used, or −1.
   */
  private newton(rhs: Float64Array, z: Float64Array, theta: number, tol: number): number {
    if (this.normalized) return this.newtonBordered(rhs, z, theta, tol);
    const op = this.op;
    const n = op.cells;
    const cm = op.cellMass;
    const cs = op.cellMassSlope;
    const { grad, hDiag, hUpper, jDiag, jUpper, jLower, delta, work } = this;
    let previous = Infinity;
    for (let it = 1; it <= NEWTON_MAX_ITERATIONS; it++) {
      op.assemble(z, grad, hDiag, hUpper);
      // Row i: M_i(z)(z_i − rhs_i) + θ G_i(z); M_i = cm[i−1] + cm[i] depends on z_{i−1}, z_i, z_{i+1}.
      for (let i = 1; i < n; i++) {
        const diff = z[i]! - rhs[i]!;
        const sl = cs[i - 1]!;
        const sr = cs[i]!;
        delta[i] = (cm[i - 1]! + cm[i]!) * diff + theta * grad[i]!;
        jDiag[i] = cm[i - 1]! + cm[i]! + (sl + sr) * diff + theta * hDiag[i]!;
        jLower[i - 1] = sl * diff + theta * hUpper[i - 1]!;
        jUpper[i] = sr * diff + theta * hUpper[i]!;
      }
      if (!solveTridiagonal(1, n - 1, jLower, jDiag, jUpper, delta, work)) return -1;
      let size = 0;
      for (let i = 1; i < n; i++) {
        const di = delta[i]!;
        z[i] = z[i]! - di;
        const ad = Math.abs(di);
        if (ad > size) size = ad;
      }
      if (!(size < Infinity)) return -1;
      if (size <= tol) return it;
      if (it >= 2 && size > NEWTON_MIN_CONTRACTION * previous) return -1;
      previous = size;
    }
    return -1;
  }

  /**
   * Newton for the bordered stage system of the normalized flow (see the file comment):
   * unknowns z (interior) and σ (this.sigma, guess on entry). Returns iterations used, or −1.
   */
  private newtonBordered(rhs: Float64Array, z: Float64Array, theta: number, tol: number): number {
    const op = this.op;
    const n = op.cells;
    const cm = op.cellMass;
    const cs = op.cellMassSlope;
    const wl = op.driftLower;
    const wd = op.driftDiag;
    const wu = op.driftUpper;
    const { grad, hDiag, hUpper, jDiag, jUpper, jLower, delta, work, cgrad, wdrift, border } = this;
    let sigma = this.sigma;
    let previous = Infinity;
    for (let it = 1; it <= NEWTON_MAX_ITERATIONS; it++) {
      op.assemble(z, grad, hDiag, hUpper, cgrad);
      const C = op.assembledCenter;
      op.drift(z, wdrift);
      const ts = theta * sigma;
      let wmax = 0;
      for (let i = 1; i < n; i++) {
        const diff = z[i]! - rhs[i]!;
        const sl = cs[i - 1]!;
        const sr = cs[i]!;
        const mass = cm[i - 1]! + cm[i]!;
        const w = wdrift[i]!;
        if (Math.abs(w) > wmax) wmax = Math.abs(w);
        delta[i] = mass * diff + theta * grad[i]! - ts * mass * w;
        jDiag[i] = mass + (sl + sr) * diff + theta * hDiag[i]! - ts * ((sl + sr) * w + mass * wd[i]!);
        jLower[i - 1] = sl * diff + theta * hUpper[i - 1]! - ts * (sl * w + mass * wl[i]!);
        jUpper[i] = sr * diff + theta * hUpper[i]! - ts * (sr * w + mass * wu[i]!);
        border[i] = -theta * mass * w;
      }
      // Two Thomas solves with the same matrix, in one sweep: x = J⁻¹R (in delta), y = J⁻¹b (in border).
      if (!solveTridiagonal2(1, n - 1, jLower, jDiag, jUpper, delta, border, work)) return -1;
      let lx = 0;
      let ly = 0;
      for (let i = 1; i < n; i++) {
        lx += cgrad[i]! * delta[i]!;
        ly += cgrad[i]! * border[i]!;
      }
      const dSigma = (lx - C) / ly;
      if (!Number.isFinite(dSigma)) return -1;
      let size = 0;
      for (let i = 1; i < n; i++) {
        const di = delta[i]! - dSigma * border[i]!;
        z[i] = z[i]! - di;
        const ad = Math.abs(di);
        if (ad > size) size = ad;
      }
      sigma -= dSigma;
      this.sigma = sigma;
      // A change of σ moves the stage by θ·δσ·w: count it in the step size of Newton.
      size = Math.max(size, Math.abs(theta * dSigma) * wmax);
      if (!(size < Infinity)) return -1;
      if (size <= tol) return it;
      if (it >= 2 && size > NEWTON_MIN_CONTRACTION * previous) return -1;
      previous = size;
    }
    return -1;
  }

  /**
   * Attempts one TR-BDF2 step of size dt from y with F(y) = fn given (exact discrete
   * tension at y). On success y1 holds the new solution; y and fn are not touched.
   * Returns whether Newton converged; the error estimate is in {@link lastError}.
   */
  attempt(y: Float64Array, fn: Float64Array, dt: number, tolerance: number): boolean {
    const op = this.op;
    const n = op.cells;
    const cm = op.cellMass;
    const { z, y1, rhs1, rhs2, fg, f1, delta, work, jDiag, jUpper, jLower } = this;
    const theta = TR_D * dt;
    const newtonTol = 1e-3 * tolerance;
    // σ guess (normalized flow): the caller's, for both predictors of the first stage.
    const sigma0 = this.sigma;
    z[0] = y[0]!;
    z[n] = y[n]!;
    y1[0] = y[0]!;
    y1[n] = y[n]!;
    // Predictors: explicit extrapolation first (good where the flow is smooth in t);
    // if Newton fails from it, the previous value (good in a stiff core at a pole,
    // where dt·F is huge), before the caller shrinks the step.
    for (let i = 1; i < n; i++) {
      rhs1[i] = y[i]! + theta * fn[i]!;
      z[i] = y[i]! + TR_GAMMA * dt * fn[i]!;
    }
    let it1 = this.newton(rhs1, z, theta, newtonTol);
    let spent = 0;
    if (it1 < 0) {
      spent += NEWTON_MAX_ITERATIONS;
      for (let i = 1; i < n; i++) z[i] = y[i]!;
      this.sigma = sigma0;
      it1 = this.newton(rhs1, z, theta, newtonTol);
      if (it1 < 0) return this.result(false, Infinity, spent + NEWTON_MAX_ITERATIONS);
    }
    it1 += spent;
    const sigma1 = this.sigma;
    for (let i = 1; i < n; i++) {
      fg[i] = (z[i]! - rhs1[i]!) / theta;
      rhs2[i] = W1 * z[i]! - W0 * y[i]!;
      y1[i] = y[i]! + (z[i]! - y[i]!) / TR_GAMMA;
    }
    let it2 = this.newton(rhs2, y1, theta, newtonTol);
    if (it2 < 0) {
      for (let i = 1; i < n; i++) y1[i] = z[i]!;
      this.sigma = sigma1;
      it2 = this.newton(rhs2, y1, theta, newtonTol);
      if (it2 < 0) return this.result(false, Infinity, it1 + 2 * NEWTON_MAX_ITERATIONS);
      it2 += NEWTON_MAX_ITERATIONS;
    }
    let move = 0;
    for (let i = 1; i < n; i++) {
      const d = Math.abs(y1[i]! - y[i]!);
      if (d > move) move = d;
    }
    if (!(move <= STEP_CHANGE_MAX)) return this.result(false, Infinity, it1 + it2);
    const scale = 2 * C_LTE * dt;
    for (let i = 1; i < n; i++) {
      const f = (y1[i]! - rhs2[i]!) / theta;
      f1[i] = f;
      const e = scale * (E_N * fn[i]! + E_G * fg[i]! + E_1 * f);
      delta[i] = (cm[i - 1]! + cm[i]!) * e;
    }
    // Stiff filter (Hosea & Shampine): ê = (M + θH)⁻¹ M e, with the last Newton matrix.
    if (!solveTridiagonal(1, n - 1, jLower, jDiag, jUpper, delta, work)) {
      return this.result(false, Infinity, it1 + it2);
    }
    let err = this.maxAbs(delta, n);
    if (err > tolerance) {
      // About to reject: filter once more (Hosea & Shampine). Stiff components, e.g. the
      // high-frequency remainder of a remap after a regrid, are damped by the L-stable
      // BDF2 stage and must not force the step down to the stiff time scale.
      for (let i = 1; i < n; i++) delta[i] = (cm[i - 1]! + cm[i]!) * delta[i]!;
      if (!solveTridiagonal(1, n - 1, jLower, jDiag, jUpper, delta, work)) {
        return this.result(false, Infinity, it1 + it2);
      }
      err = this.maxAbs(delta, n);
    }
    err /= tolerance;
    if (!(err < Infinity)) return this.result(false, Infinity, it1 + it2);
    return this.result(true, err, it1 + it2);
  }

  private maxAbs(v: Float64Array, n: number): number {
    let m = 0;
    for (let i = 1; i < n; i++) {
      const a = Math.abs(v[i]!);
      if (a > m) m = a;
    }
    return m;
  }

  private result(ok: boolean, error: number, iterations: number): boolean {
    this.lastOk = ok;
    this.lastError = error;
    this.lastIterations = iterations;
    return ok;
  }
}
