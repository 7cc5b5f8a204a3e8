import { Matrix, inverse, solve } from 'ml-matrix';
import type { HistoryRow } from './flow-history';

/** Kind of singularity (numerics.md §3, §5). */
export type BlowupKind = 'type-I' | 'type-II' | 'infinite-time' | 'inconclusive';

/** A first blow-up estimate with the evidence a researcher needs to judge it. */
export interface BlowupEstimate {
  /** Estimated blow-up time T̂ (null for infinite-time or when no finite T̂ fits). */
  T: number | null;
  TUncertainty: number | null;
  /** Exponent p of max|∇u| ≈ C (T − t)^(−p) (null when no power law fits). */
  exponent: number | null;
  exponentUncertainty: number | null;
  kind: BlowupKind;
  /** 0 … 1, how strongly the evidence supports `kind`. */
  confidence: number;
  evidence: {
    /** Rows of the history used and the decades of max|∇u| they span. */
    samples: number;
    decades: number;
    /** RMS residuals (in ln max|∇u|) of the power-law and exponential fits. */
    powerLawRms: number | null;
    exponentialRms: number | null;
    /** Growth rate μ of max|∇u| ≈ C e^(μt) on the window. */
    exponentialRate: number | null;
    /** Growth rates d ln max|∇u|/dt on the older and newer half of the window. */
    rateEarly: number | null;
    rateLate: number | null;
    /** T̂ from the older part of the window, to see whether the estimate recedes. */
    earlierT: number | null;
    /** ‖τ‖ at the end of the window over ‖τ‖ at its start (< 1: tension falling). */
    tensionRatio: number;
    /** Energy lost so far, D(0) − D(t) (filled by `blowupEstimate(run)`). */
    energyLost: number | null;
    /**
     * Energy of one bubble, for m = 2: the area of the target, 2π∫₀^π f ρ dh (a
     * degree-one harmonic sphere covers N once). Null for m ≥ 3, where a shrinking
     * profile carries no energy (D scales like λ^(m−2)).
     */
    bubbleEnergy: number | null;
    /** Remarks in words (look-alike, too few decades, …). */
    notes: string[];
  };
}

/** Window of the fit: the rows within this many decades of max|∇u| below the last. */
export const FIT_DECADES = 3;
export const FIT_MIN_ROWS = 8;

interface PowerFit {
  a: number;
  p: number;
  /** T − t_last (≥ 0). */
  tail: number;
  rss: number;
  covariance: Matrix | null;
}

/** Linear least squares (ml-matrix QR) for ln G = a − p·ln(tail + s_i). */
function linearFit(s: Float64Array, y: Float64Array, tail: number): { a: number; p: number; rss: number } {
  const n = s.length;
  const X = new Matrix(n, 2);
  const Y = new Matrix(n, 1);
  for (let i = 0; i < n; i++) {
    X.set(i, 0, 1);
    X.set(i, 1, -Math.log(tail + s[i]!));
    Y.set(i, 0, y[i]!);
  }
  const beta = solve(X, Y);
  const a = beta.get(0, 0);
  const p = beta.get(1, 0);
  let rss = 0;
  for (let i = 0; i < n; i++) {
    const r = y[i]! - a + p * Math.log(tail + s[i]!);
    rss += r * r;
  }
  return { a, p, rss };
}

/**
 * Nonlinear least squares for ln G_i = a − p ln(T − t_i): (a, p) linear for fixed
 * T, T found by a scan and golden-section search in ln(T − t_last), uncertainties
 * from the Gauss–Newton covariance s²(JᵀJ)⁻¹. Times enter as s_i = t_last − t_i,
 * computed from double-double times, so the fit keeps its accuracy when T − t is
 * far below the rounding of t itself.
 */
function powerLawFit(s: Float64Array, y: Float64Array, span: number): PowerFit | null {
  const n = s.length;
  if (n < 4 || !(span > 0)) return null;
  const lo = Math.log(span * 1e-12);
  const hi = Math.log(span * 1e4);
  const steps = 160;
  let best = -1;
  let bestRss = Infinity;
  const rssAt = (u: number) => linearFit(s, y, Math.exp(u)).rss;
  for (let k = 0; k <= steps; k++) {
    const u = lo + ((hi - lo) * k) / steps;
    const r = rssAt(u);
    if (r < bestRss) {
      bestRss = r;
      best = k;
    }
  }
  let a0 = lo + ((hi - lo) * Math.max(0, best - 1)) / steps;
  let b0 = lo + ((hi - lo) * Math.min(steps, best + 1)) / steps;
  const g = (Math.sqrt(5) - 1) / 2;
  let c = b0 - g * (b0 - a0);
  let d = a0 + g * (b0 - a0);
  let fc = rssAt(c);
  let fd = rssAt(d);
  for (let it = 0; it < 80; it++) {
    if (fc < fd) {
      b0 = d;
      d = c;
      fd = fc;
      c = b0 - g * (b0 - a0);
      fc = rssAt(c);
    } else {
      a0 = c;
      c = d;
      fc = fd;
      d = a0 + g * (b0 - a0);
      fd = rssAt(d);
    }
  }
  const tail = Math.exp(0.5 * (a0 + b0));
  const { a, p, rss } = linearFit(s, y, tail);
  let covariance: Matrix | null = null;
  if (n > 3) {
    const J = new Matrix(n, 3);
    for (let i = 0; i < n; i++) {
      J.set(i, 0, 1);
      J.set(i, 1, -Math.log(tail + s[i]!));
      J.set(i, 2, -p / (tail + s[i]!));
    }
    try {
      covariance = inverse(J.transpose().mmul(J)).mul(rss / (n - 3));
    } catch {
      covariance = null;
    }
  }
  return { a, p, tail, rss, covariance };
}

function exponentialFit(t: Float64Array, y: Float64Array): { mu: number; rss: number } {
  const n = t.length;
  const X = new Matrix(n, 2);
  const Y = new Matrix(n, 1);
  for (let i = 0; i < n; i++) {
    X.set(i, 0, 1);
    X.set(i, 1, t[i]!);
    Y.set(i, 0, y[i]!);
  }
  const beta = solve(X, Y);
  let rss = 0;
  for (let i = 0; i < n; i++) {
    const r = y[i]! - beta.get(0, 0) - beta.get(1, 0) * t[i]!;
    rss += r * r;
  }
  return { mu: beta.get(1, 0), rss };
}

function clamp01(x: number): number {
  return x < 0 ? 0 : x > 1 ? 1 : x;
}

/**
 * Fits the recent history (numerics.md §3): power law max|∇u| ≈ C (T − t)^(−p) and
 * exponential growth, then classifies: type-I (p ≈ ½), type-II (p clearly above ½),
 * infinite-time (no finite T̂: it sits far beyond the data or recedes as the window
 * moves, while growth is exponential-like), or inconclusive — which includes the
 * steep-steady-state look-alike (tension falling while the gradient levels off).
 */
export function estimateBlowup(rows: HistoryRow[]): BlowupEstimate {
  const notes: string[] = [];
  const last = rows[rows.length - 1];
  const empty: BlowupEstimate = {
    T: null,
    TUncertainty: null,
    exponent: null,
    exponentUncertainty: null,
    kind: 'inconclusive',
    confidence: 0,
    evidence: {
      samples: rows.length,
      decades: 0,
      powerLawRms: null,
      exponentialRms: null,
      exponentialRate: null,
      rateEarly: null,
      rateLate: null,
      earlierT: null,
      tensionRatio: 1,
      energyLost: null,
      bubbleEnergy: null,
      notes,
    },
  };
  if (!last || rows.length < FIT_MIN_ROWS) {
    notes.push('too few history samples for a fit');
    return empty;
  }
  // Window: the last FIT_DECADES decades of growth (at least FIT_MIN_ROWS rows).
  const floor = last.logGrad - FIT_DECADES * Math.LN10;
  let start = rows.length - FIT_MIN_ROWS;
  while (start > 0 && rows[start - 1]!.logGrad >= floor) start--;
  const win = rows.slice(start);
  const n = win.length;
  const s = new Float64Array(n);
  const y = new Float64Array(n);
  const t = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const r = win[i]!;
    s[i] = last.tHi - r.tHi + (last.tLo - r.tLo);
    t[i] = -s[i]!;
    y[i] = r.logGrad;
  }
  const span = s[0]!;
  let minLog = Infinity;
  for (const r of win) minLog = Math.min(minLog, r.logGrad);
  const decades = (last.logGrad - minLog) / Math.LN10;
  const tensionRatio = last.tension / Math.max(win[0]!.tension, 1e-300);
  empty.evidence.decades = decades;
  empty.evidence.samples = n;
  empty.evidence.tensionRatio = tensionRatio;
  const tLast = last.tHi + last.tLo;

  const pow = powerLawFit(s, y, span);
  const ex = exponentialFit(t, y);
  empty.evidence.exponentialRms = Math.sqrt(ex.rss / n);
  empty.evidence.exponentialRate = ex.mu;
  const half = Math.floor(n / 2);
  const rateEarly = half >= 3 ? exponentialFit(t.slice(0, half), y.slice(0, half)).mu : null;
  const rateLate = n - half >= 3 ? exponentialFit(t.slice(half), y.slice(half)).mu : null;
  empty.evidence.rateEarly = rateEarly;
  empty.evidence.rateLate = rateLate;
  // Older part of the window (drop its newest third) to see whether T̂ recedes.
  const m = Math.max(FIT_MIN_ROWS, Math.floor((2 * n) / 3));
  let earlierT: number | null = null;
  if (m < n) {
    const off = s[m - 1]!;
    const s2 = new Float64Array(m);
    for (let i = 0; i < m; i++) s2[i] = s[i]! - off;
    const y2 = y.slice(0, m);
    const f2 = powerLawFit(s2, y2, s2[0]!);
    if (f2) earlierT = tLast - off + f2.tail;
  }
  empty.evidence.earlierT = earlierT;

  // Steep-steady-state look-alike: tension falling while the gradient levels off.
  const growthLate = y[n - 1]! - y[Math.floor((2 * n) / 3)]!;
  const growthEarly = y[Math.floor((2 * n) / 3)]! - y[0]!;
  const lookAlike = tensionRatio < 0.1 && growthLate < 0.25 * Math.max(growthEarly, 1e-12);
  if (lookAlike) {
    notes.push(
      'tension falling while max|∇u| levels off: looks like a steep steady state, not a singularity; needs a finer run',
    );
  }
  if (decades < 1) notes.push('max|∇u| grew by less than one decade in the window');

  if (!pow) {
    notes.push('power-law fit failed');
    return empty;
  }
  const rmsPow = Math.sqrt(pow.rss / n);
  empty.evidence.powerLawRms = rmsPow;
  const cov = pow.covariance;
  const sigP = cov ? Math.sqrt(Math.max(0, cov.get(1, 1))) : null;
  const sigT = cov ? Math.sqrt(Math.max(0, cov.get(2, 2))) : null;
  const T = tLast + pow.tail;
  // The fit's statistical error says nothing about how well a pure power law models the
  // growth (in two dimensions the rate carries a logarithmic correction); the shift of T̂
  // between the whole window and its older part measures that model error, so the
  // reported uncertainty adds it in quadrature.
  const modelError = earlierT !== null ? Math.abs(T - earlierT) : 0;
  const result: BlowupEstimate = {
    ...empty,
    T,
    TUncertainty: sigT === null ? null : Math.hypot(sigT, modelError),
    exponent: pow.p,
    exponentUncertainty: sigP,
  };
  const beyondData = pow.tail > 10 * span;
  const receding = earlierT !== null && T - earlierT > Math.max(0.05 * span, 3 * (sigT ?? 0));
  if (lookAlike) {
    result.kind = 'inconclusive';
    result.confidence = 0.1;
    return result;
  }
  if (beyondData || receding || pow.p > 5) {
    // No finite T̂ near the data: exponential-like growth in t, T̂ receding.
    if (receding) notes.push('T̂ recedes as the window moves forward');
    if (beyondData) notes.push('best-fitting T̂ lies far beyond the data');
    result.kind = ex.mu > 0 ? 'infinite-time' : 'inconclusive';
    // Approaching a very steep steady state (near an existence threshold) also grows
    // max|∇u| roughly exponentially, but at a falling rate; a genuine infinite-time
    // singularity keeps its rate.
    if (result.kind === 'infinite-time' && rateEarly !== null && rateLate !== null && rateLate < 0.75 * rateEarly) {
      result.kind = 'inconclusive';
      notes.push(
        `growth rate of ln max|∇u| falling (${rateEarly.toPrecision(3)} → ${rateLate.toPrecision(3)}): possibly the approach to a very steep steady state; needs a larger gradient bound or a finer run`,
      );
    }
    // No power law describes such growth: report neither T̂ nor an exponent.
    result.T = null;
    result.TUncertainty = null;
    result.exponent = null;
    result.exponentUncertainty = null;
    result.confidence = result.kind === 'infinite-time' ? clamp01(0.4 + 0.3 * Math.min(decades, 2) / 2 + (receding ? 0.3 : 0)) : 0.1;
    return result;
  }
  const p = pow.p;
  const sp = sigP ?? Infinity;
  const coverage = clamp01(decades / 2);
  if (Math.abs(p - 0.5) <= Math.max(0.05, 3 * sp)) {
    result.kind = 'type-I';
    result.confidence = clamp01((1 - Math.abs(p - 0.5) / 0.1) * coverage * (sp < 0.02 ? 1 : 0.6));
  } else if (p > 0.55 && p - 3 * sp > 0.5) {
    result.kind = 'type-II';
    result.confidence = clamp01(Math.min(1, (p - 0.5) / 0.3) * coverage * (sp < 0.05 ? 1 : 0.6));
  } else {
    result.kind = 'inconclusive';
    result.confidence = 0.2 * coverage;
    notes.push(`exponent ${p.toFixed(3)} fits neither type I (½) nor a faster rate`);
  }
  return result;
}
