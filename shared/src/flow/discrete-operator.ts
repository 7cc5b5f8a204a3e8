import type { FlowModel } from './flow-model';
import { warp } from './flow-model';

/**
 * The variational finite-volume operator (numerics.md §2). On cells [r_j, r_{j+1}]
 * (width Δ_j, midpoint r̄_j, slope s_j = (h_{j+1} − h_j)/Δ_j, h̄_j = (h_j + h_{j+1})/2)
 * the discrete energy is the midpoint rule of §1's energy:
 *
 *   D_h = |S^(m−1)| Σ_j [ ½ a_j Δ_j P(h̄_j) s_j² + ½ c_j Q(h̄_j) ],
 *   a_j = g(r̄_j)^(m−1),  c_j = (m−1) Δ_j g(r̄_j)^(m−3),   P = ρ², Q = f².
 *
 * (This is P1 finite elements with midpoint quadrature, hence second order.) The
 * flow is its gradient over the lumped mass (the same midpoint rule applied to the
 * L² metric ∫ρ²|δh|² g^(m−1) dr, shared half and half by a cell's two nodes)
 *   M_i = |S^(m−1)| ½ (P(h̄_{i−1}) a_{i−1}Δ_{i−1} + P(h̄_i) a_iΔ_i):
 *   M_i ḣ_i = −∂D_h/∂h_i,  i.e. ḣ_i = τ_i, the
 * discrete tension; so dD_h/dt = −Σ M_i τ_i² = −‖τ‖_h² exactly (§1, §4.7). At a
 * pole g(r̄_0) = r̄_0 > 0, so no special formula is needed: with h ≈ c·r the
 * first cell's terms are exact for linear h.
 *
 * The common factor |S^(m−1)| is left out of G and H below (it cancels in the flow).
 */
export class DiscreteOperator {
  /** Number of cells; nodes are 0..cells, nodes 0 and cells carry Dirichlet values. */
  readonly cells: number;
  readonly r: Float64Array;
  readonly dr: Float64Array;
  readonly rMid: Float64Array;
  /** a_j = g(r̄_j)^(m−1). */
  readonly a: Float64Array;
  /** c_j = (m−1) Δ_j g(r̄_j)^(m−3). */
  readonly c: Float64Array;
  /** (m−1)/g(r̄_j)², for |∇u|². */
  readonly potential: Float64Array;
  /** V_i, the dual-cell volume ½(a_{i−1}Δ_{i−1} + a_iΔ_i) (the lumped mass for ρ ≡ 1). */
  readonly volume: Float64Array;
  /** cos r̄_j, for the center integral. */
  readonly cosMid: Float64Array;
  /**
   * The dilation generator sin r·h_r at interior node i (numerics.md §1, normalized flow) as
   * driftLower[i]·h_{i−1} + driftDiag[i]·h_i + driftUpper[i]·h_{i+1}: the three-point
   * second-order derivative on the non-uniform grid times sin r_i (0 at the ends and on the ball).
   */
  readonly driftLower: Float64Array;
  readonly driftDiag: Float64Array;
  readonly driftUpper: Float64Array;
  /** Filled by assemble: a cell's share ½P(h̄_j)a_jΔ_j of the lumped mass of each of its nodes… */
  readonly cellMass: Float64Array;
  /** …and its derivative in either node value, ¼P'(h̄_j)a_jΔ_j. */
  readonly cellMassSlope: Float64Array;
  /** Scratch for the target values [P, P', P'', Q, Q', Q'']. */
  private readonly tv = new Float64Array(6);

  constructor(
    readonly model: FlowModel,
    r: Float64Array,
  ) {
    const n = r.length - 1;
    this.cells = n;
    this.r = r;
    this.dr = new Float64Array(n);
    this.rMid = new Float64Array(n);
    this.a = new Float64Array(n);
    this.c = new Float64Array(n);
    this.potential = new Float64Array(n);
    this.volume = new Float64Array(n + 1);
    this.cosMid = new Float64Array(n);
    this.cellMass = new Float64Array(n);
    this.cellMassSlope = new Float64Array(n);
    this.driftLower = new Float64Array(n + 1);
    this.driftDiag = new Float64Array(n + 1);
    this.driftUpper = new Float64Array(n + 1);
    const m = model.m;
    for (let j = 0; j < n; j++) {
      const d = r[j + 1]! - r[j]!;
      const rm = 0.5 * (r[j]! + r[j + 1]!);
      const g = model.domain === 'sphere' && model.rightPole && rm > 0.5 * Math.PI
        ? Math.sin(Math.PI - rm) // distance to the far pole keeps relative accuracy there
        : warp(model.domain, rm);
      this.dr[j] = d;
      this.rMid[j] = rm;
      this.a[j] = Math.pow(g, m - 1);
      this.c[j] = (m - 1) * d * Math.pow(g, m - 3);
      this.potential[j] = (m - 1) / (g * g);
      this.cosMid[j] = Math.cos(rm);
    }
    for (let i = 1; i < n; i++) {
      this.volume[i] = 0.5 * (this.a[i - 1]! * this.dr[i - 1]! + this.a[i]! * this.dr[i]!);
    }
    if (model.domain === 'sphere') {
      for (let i = 1; i < n; i++) {
        const dl = r[i]! - r[i - 1]!;
        const du = r[i + 1]! - r[i]!;
        const ri = r[i]!;
        const sinR = model.rightPole && ri > 0.5 * Math.PI ? Math.sin(Math.PI - ri) : Math.sin(ri);
        const cu = dl / ((dl + du) * du);
        const cl = du / ((dl + du) * dl);
        this.driftUpper[i] = sinR * cu;
        this.driftLower[i] = -sinR * cl;
        this.driftDiag[i] = sinR * (cl - cu);
      }
    }
    this.volume[0] = 0.5 * this.a[0]! * this.dr[0]!;
    this.volume[n] = 0.5 * this.a[n - 1]! * this.dr[n - 1]!;
  }

  /** X_h/|S^(m−1)| at the h of the last {@link assemble} given a `cgrad` array. */
  assembledCenter = 0;

  /**
   * Gradient G = ∂D_h/∂h (without |S^(m−1)|) into `grad`; with `diag`/`upper` also the
   * tridiagonal Hessian (upper[i] couples i and i+1); with `cgrad` also L = ∂X_h/∂h as
   * {@link centerGradient} gives it, in the same pass (X_h in {@link assembledCenter}).
   * Returns D_h/|S^(m−1)|.
   */
  assemble(
    h: Float64Array,
    grad: Float64Array,
    diag: Float64Array | null,
    upper: Float64Array | null,
    cgrad: Float64Array | null = null,
  ): number {
    const n = this.cells;
    const tv = this.tv;
    const target = this.model.target;
    const dr = this.dr;
    const aw = this.a;
    const cw = this.c;
    const cm = this.cellMass;
    const cs = this.cellMassSlope;
    let energy = 0;
    let hl = h[0]!;
    // Carries: a cell completes its left node and starts its right node, so each
    // entry is written once (no clearing pass, no read-modify-write).
    let gCarry = 0;
    let dCarry = 0;
    let cCarry = 0;
    let center = 0;
    const withJacobian = diag !== null && upper !== null;
    for (let j = 0; j < n; j++) {
      const hr = h[j + 1]!;
      const d = dr[j]!;
      const a = aw[j]!;
      const c = cw[j]!;
      const s = (hr - hl) / d;
      target.evaluate(0.5 * (hl + hr), tv);
      const P = tv[0]!;
      const P1 = tv[1]!;
      const Q = tv[3]!;
      const aP = a * P;
      const A = aP * s;
      const B = 0.25 * (a * d * P1 * s * s + c * tv[4]!);
      grad[j] = gCarry - A + B;
      gCarry = A + B;
      energy += 0.5 * (aP * d * s * s + c * Q);
      cm[j] = 0.5 * aP * d;
      cs[j] = 0.25 * a * d * P1;
      if (cgrad !== null) {
        const cj = this.cosMid[j]!;
        cgrad[j] = cCarry - cj * A + cj * B;
        cCarry = cj * A + cj * B;
        center += cj * (P * s * s + this.potential[j]! * Q) * a * d;
      }
      if (withJacobian) {
        const C0 = 0.125 * (a * d * tv[2]! * s * s + c * tv[5]!);
        const C1 = 0.5 * a * P1 * s;
        const k = aP / d;
        diag[j] = dCarry + k - 2 * C1 + C0;
        dCarry = k + 2 * C1 + C0;
        upper[j] = C0 - k;
      }
      hl = hr;
    }
    grad[n] = gCarry;
    if (withJacobian) diag[n] = dCarry;
    if (cgrad !== null) {
      cgrad[n] = cCarry;
      this.assembledCenter = 0.5 * center;
    }
    return energy;
  }

  /** D_h/|S^(m−1)| alone (midpoint rule of §1's energy). */
  energy(h: Float64Array): number {
    const n = this.cells;
    const tv = this.tv;
    const target = this.model.target;
    let energy = 0;
    for (let j = 0; j < n; j++) {
      const s = (h[j + 1]! - h[j]!) / this.dr[j]!;
      target.evaluate(0.5 * (h[j]! + h[j + 1]!), tv);
      energy += 0.5 * (this.a[j]! * tv[0]! * this.dr[j]! * s * s + this.c[j]! * tv[3]!);
    }
    return energy;
  }

  /**
   * τ_i = −G_i / M_i at interior nodes (0 at the Dirichlet ends) into `tau`, given the
   * gradient and the masses of the last {@link assemble} at the same h. Returns
   * Σ M_i τ_i² (‖τ‖_h² without |S^(m−1)|).
   */
  tension(grad: Float64Array, tau: Float64Array): number {
    const n = this.cells;
    const cm = this.cellMass;
    let norm2 = 0;
    tau[0] = 0;
    tau[n] = 0;
    for (let i = 1; i < n; i++) {
      const mass = cm[i - 1]! + cm[i]!;
      const t = -grad[i]! / mass;
      tau[i] = t;
      norm2 += mass * t * t;
    }
    return norm2;
  }

  /**
   * One pass for the diagnostics of numerics.md §3: gradient, energy (returned, without
   * |S^(m−1)|), masses, and into out[0..2] max over cells of |∇u| = sqrt(P(h̄)s² +
   * (m−1)Q(h̄)/g²), its cell, and the center integral Σ cos r̄_j e_j a_j Δ_j (§1).
   */
  diagnostics(h: Float64Array, grad: Float64Array, out: Float64Array): number {
    const n = this.cells;
    const tv = this.tv;
    const target = this.model.target;
    const dr = this.dr;
    const aw = this.a;
    const cw = this.c;
    const cm = this.cellMass;
    const cs = this.cellMassSlope;
    const pot = this.potential;
    const cosMid = this.cosMid;
    grad.fill(0);
    let energy = 0;
    let best = -1;
    let at = 0;
    let center = 0;
    let hl = h[0]!;
    for (let j = 0; j < n; j++) {
      const hr = h[j + 1]!;
      const d = dr[j]!;
      const a = aw[j]!;
      const c = cw[j]!;
      const s = (hr - hl) / d;
      target.evaluate(0.5 * (hl + hr), tv);
      const P = tv[0]!;
      const Q = tv[3]!;
      const aP = a * P;
      const A = aP * s;
      const B = 0.25 * (a * d * tv[1]! * s * s + c * tv[4]!);
      grad[j] = grad[j]! - A + B;
      grad[j + 1] = grad[j + 1]! + A + B;
      energy += 0.5 * (aP * d * s * s + c * Q);
      cm[j] = 0.5 * aP * d;
      cs[j] = 0.25 * a * d * tv[1]!;
      const e2 = P * s * s + pot[j]! * Q;
      if (e2 > best) {
        best = e2;
        at = j;
      }
      center += cosMid[j]! * e2 * a * d;
      hl = hr;
    }
    out[0] = Math.sqrt(best);
    out[1] = at;
    out[2] = 0.5 * center;
    return energy;
  }

  /**
   * Center X_h/|S^(m−1)| = ½ Σ_j cos r̄_j (P(h̄_j) s_j² + (m−1)Q(h̄_j)/g(r̄_j)²) a_j Δ_j: the
   * midpoint rule of §1's X = |S^(m−1)| ∫ cos r · e · sin^(m−1) r dr, cell by cell the energy
   * density of D_h weighted by cos r̄_j (the same sum {@link diagnostics} accumulates).
   */
  center(h: Float64Array): number {
    const n = this.cells;
    const tv = this.tv;
    const target = this.model.target;
    let center = 0;
    for (let j = 0; j < n; j++) {
      const d = this.dr[j]!;
      const s = (h[j + 1]! - h[j]!) / d;
      target.evaluate(0.5 * (h[j]! + h[j + 1]!), tv);
      const e2 = tv[0]! * s * s + this.potential[j]! * tv[3]!;
      center += this.cosMid[j]! * e2 * this.a[j]! * d;
    }
    return 0.5 * center;
  }

  /**
   * L = ∂X_h/∂h (without |S^(m−1)|) into `out`, so that L·v is the derivative of the
   * center along a variation v (numerics.md §1): the gradient of D_h with every cell's
   * weights multiplied by cos r̄_j. Returns X_h/|S^(m−1)| at h.
   */
  centerGradient(h: Float64Array, out: Float64Array): number {
    const n = this.cells;
    const tv = this.tv;
    const target = this.model.target;
    let carry = 0;
    let center = 0;
    for (let j = 0; j < n; j++) {
      const d = this.dr[j]!;
      const a = this.a[j]!;
      const cj = this.cosMid[j]!;
      const s = (h[j + 1]! - h[j]!) / d;
      target.evaluate(0.5 * (h[j]! + h[j + 1]!), tv);
      const A = cj * a * tv[0]! * s;
      const B = 0.25 * cj * (a * d * tv[1]! * s * s + this.c[j]! * tv[4]!);
      out[j] = carry - A + B;
      carry = A + B;
      center += cj * (tv[0]! * s * s + this.potential[j]! * tv[3]!) * a * d;
    }
    out[n] = carry;
    return 0.5 * center;
  }

  /** The dilation generator w = sin r·h_r at the nodes into `out` (0 at the ends). */
  drift(h: Float64Array, out: Float64Array): void {
    const n = this.cells;
    out[0] = 0;
    out[n] = 0;
    for (let i = 1; i < n; i++) {
      out[i] = this.driftLower[i]! * h[i - 1]! + this.driftDiag[i]! * h[i]! + this.driftUpper[i]! * h[i + 1]!;
    }
  }
}
