import type { RunSpec } from '../spec';
import { DiscreteOperator } from './discrete-operator';
import { createFlowModel, type FlowModel, type SymmetryUsed } from './flow-model';
import {
  HISTORY_CAPACITY,
  HISTORY_FIELDS,
  HISTORY_LOG_GROWTH,
  HISTORY_STEP_INTERVAL,
  H_DT,
  H_ENERGY,
  H_GRAD_AT,
  H_LOG_GRAD,
  H_TENSION,
  H_T_HI,
  H_T_LO,
} from './flow-history';
import { buildNodes, cellCount, initialGridParams, type GridParams } from './graded-grid';
import { initialValue } from './initial-data';
import { interpolateProfile, resolveStart, type FlowResources } from './flow-resources';
import type { TargetGeometry } from './target-geometry';
import { StepperWorkspace } from './tr-bdf2-stepper';
import { maybeRefine } from './singularity-refinement';
import { functionSource, profileSource, recentreOnGrid } from './mobius-dilations';

/** How a run ended (numerics.md §3). */
export type FlowOutcome = 'converged' | 'blowup' | 'time-limit' | 'numerics-failed' | 'degenerate';

/** Which indicator ended the run. */
export type OutcomeReason =
  | 'tension'
  | 'gradient-bound'
  | 'step-collapse'
  | 'resolution-cap'
  | 't-max'
  | 'cpu-budget'
  | 'non-finite'
  | 'newton-failure'
  | 'concentration'
  | 'sigma-denominator';

export const OUTCOME_CODES: readonly (FlowOutcome | null)[] = [
  null,
  'converged',
  'blowup',
  'time-limit',
  'numerics-failed',
  'degenerate',
];
export const REASON_CODES: readonly (OutcomeReason | null)[] = [
  null,
  'tension',
  'gradient-bound',
  'step-collapse',
  'resolution-cap',
  't-max',
  'cpu-budget',
  'non-finite',
  'newton-failure',
  'concentration',
  'sigma-denominator',
];

/**
 * Every scalar of the stepper, controller, refinement and diagnostics state, in
 * checkpoint order (docs/checkpoint-format.md). Integers are stored as float64.
 */
export const SCALAR_NAMES = [
  'tHi',
  'tLo',
  'dt',
  'step',
  'rejectedSteps',
  'newtonIterations',
  'pointIterations',
  'regrids',
  'consecutiveRejections',
  'deltaLeft',
  'deltaRight',
  'kappa',
  'spacingMax',
  'energyInitial',
  'gradMaxInitial',
  'regridEnergyChange',
  'historyHead',
  'historyCount',
  'lastHistoryLogGrad',
  'lastHistoryStep',
  'lastSampleLogLambda',
  'lastSampleStep',
  'outcomeCode',
  'reasonCode',
  'refinementCapped',
  'samplesDropped',
  // Version 3 (normalized flow, numerics.md §1): what re-centring did and σ at t = 0, for the summary.
  'recentreS',
  'recentreCenterBefore',
  'recentreEnergyBefore',
  'recentreEnergyAfter',
  'sigmaInitial',
] as const;
/** Scalars of checkpoint versions 1 and 2 (the first 26 of {@link SCALAR_NAMES}). */
export const SCALAR_COUNT_V2 = 26;
export type ScalarName = (typeof SCALAR_NAMES)[number];
export type FlowScalars = Record<ScalarName, number>;

/** One diagnostic sample (numerics.md §3). */
export interface DiagnosticSample {
  t: number;
  dt: number;
  step: number;
  energy: number;
  tension: number;
  gradMax: number;
  /** r where max|∇u| sits (cell midpoint, full-domain coordinate). */
  gradMaxAt: number;
  /** λ = 1 / max|∇u|. */
  lambda: number;
  /** Center X (sphere domain; 0 under reflection symmetry); null on the ball. */
  center: number | null;
  /** σ of the normalized flow (0 for the standard flow); null on the ball. */
  sigma: number | null;
  /**
   * Denominator of σ = −L[τ]/L[sin r·h_r]: dX along the dilation generator, L[sin r·h_r]
   * (normalized flow on the whole sphere; null otherwise).
   */
  sigmaDenominator: number | null;
  points: number;
  /** Newton iterations since the start of the run. */
  newtonIterations: number;
  rejectedSteps: number;
  regrids: number;
}

/** Tuning of the engine that is not part of the spec (fixed, documented here). */
export const ENGINE_SETTINGS = {
  /** Step-size controller: safety factor and growth limits (exponent 1/3 for a 2nd-order method). */
  safety: 0.9,
  growthMax: 5,
  shrinkMin: 0.1,
  /** Step collapse: dt·max|∇u|² below this (dt far below the local diffusion time λ²). */
  collapse: 1e-12,
  /** Rejections in a row that count as a collapse. */
  maxConsecutiveRejections: 40,
  /** Gradient growth (relative to the start) that marks a collapse as tied to a singularity. */
  blowupGrowth: 100,
  /** A metric sample is appended every this many steps… */
  sampleEverySteps: 25,
  /** …or when λ changed by this factor. */
  sampleLambdaFactor: 1.25,
  /** Bound on the sample buffer the caller drains. */
  sampleBufferSize: 4096,
  /**
   * A run that reaches the tension threshold after max|∇u| grew by this factor at
   * a pole has not found a smooth harmonic map: the concentrated profile is held
   * by the grid (its scale shrinks with the grid spacing). It ends as `blowup`
   * (reason `concentration`), never as `converged`.
   */
  concentrationGrowth: 1e4,
  /**
   * Normalized flow: the σ-equation is degenerate when |L·w| falls below this fraction
   * of its scale ‖L‖_{M⁻¹}‖w‖_M (Cauchy–Schwarz bound, so the ratio lies in [0, 1]):
   * outcome `degenerate` (reason `sigma-denominator`).
   */
  degenerateRatio: 1e-8,
} as const;

/**
 * A run of the flow: spec, model, grid, solution and every piece of state needed to
 * continue it. Create with {@link createFlowRun} or `deserializeCheckpoint`; advance
 * with {@link advanceFlowRun}. Treat the fields as read-only outside the engine.
 */
export interface FlowRun {
  readonly spec: RunSpec;
  readonly model: FlowModel;
  /** Checkpointed scalars. */
  s: FlowScalars;
  /** Checkpointed arrays: grid nodes, solution, history ring. */
  r: Float64Array;
  h: Float64Array;
  history: Float64Array;
  /** Derived from r (rebuilt on regrid / resume). */
  op: DiscreteOperator;
  ws: StepperWorkspace;
  /** Exact discrete tension τ = F(h) at the current state (the next step's F_n). */
  tau: Float64Array;
  /** Cached diagnostics of the current state. */
  energy: number;
  tension: number;
  gradMax: number;
  gradMaxCell: number;
  center: number;
  /** Normalized flow on the whole sphere (σ is an unknown); false for standard runs and under reflection symmetry (σ ≡ 0). */
  normalized: boolean;
  /** Instantaneous σ = −L·τ/L·w (numerics.md §1), its denominator (×|S^(m−1)|) and |L·w|/(‖L‖_{M⁻¹}‖w‖_M). */
  sigma: number;
  sigmaDenominator: number;
  sigmaRatio: number;
  /** F_n handed to the stepper: τ (standard, the same array) or τ + σ·w (normalized). */
  velocity: Float64Array;
  /** Samples waiting to be drained by the caller (not checkpointed: drain before saving). */
  samples: DiagnosticSample[];
  /** Scratch for DiscreteOperator.diagnostics. */
  readonly scratch3: Float64Array;
}

function emptyScalars(): FlowScalars {
  const s = {} as FlowScalars;
  for (const k of SCALAR_NAMES) s[k] = 0;
  return s;
}

export function gridParamsOf(run: Pick<FlowRun, 's' | 'model'>): GridParams {
  return {
    length: run.model.length,
    leftPole: run.model.leftPole,
    rightPole: run.model.rightPole,
    deltaLeft: run.s.deltaLeft,
    deltaRight: run.s.deltaRight,
    kappa: run.s.kappa,
    spacingMax: run.s.spacingMax,
  };
}

/** t of the run (the double-double tHi + tLo rounded to a double). */
export function runTime(run: FlowRun): number {
  return run.s.tHi + run.s.tLo;
}

/** Rebuilds operator, workspace and diagnostics after the grid (r) or h changed. */
export function rebuildDerived(run: FlowRun): void {
  run.op = new DiscreteOperator(run.model, run.r);
  run.ws = new StepperWorkspace(run.op, run.normalized);
  run.tau = new Float64Array(run.r.length);
  run.velocity = run.normalized ? new Float64Array(run.r.length) : run.tau;
  refreshDiagnostics(run);
}

/** Energy, exact tension (into run.tau), max|∇u| and center at the current h. */
export function refreshDiagnostics(run: FlowRun): void {
  const op = run.op;
  const grad = run.ws.grad;
  const e = op.diagnostics(run.h, grad, run.scratch3);
  const t2 = op.tension(grad, run.tau);
  const f = run.model.energyFactor;
  run.energy = f * e;
  run.tension = Math.sqrt(f * t2);
  run.gradMax = run.scratch3[0]!;
  run.gradMaxCell = run.scratch3[1]!;
  run.center = run.model.symmetry === 'reflection' ? 0 : run.model.sphereArea * run.scratch3[2]!;
  if (run.normalized) refreshSigma(run);
}

/**
 * σ of the normalized flow at the current state (numerics.md §1): σ = −L·τ / L·w with
 * L = ∂X_h/∂h and w = sin r·h_r, and the velocity τ + σw. Uses the masses of the
 * diagnostics pass just made. With a degenerate denominator σ is left at 0 (the
 * caller ends the run as `degenerate`; nothing is divided by it).
 */
function refreshSigma(run: FlowRun): void {
  const op = run.op;
  const L = run.ws.cgrad;
  const w = run.ws.wdrift;
  op.centerGradient(run.h, L);
  op.drift(run.h, w);
  const cm = op.cellMass;
  const n = op.cells;
  let lt = 0;
  let lw = 0;
  let ll = 0;
  let ww = 0;
  for (let i = 1; i < n; i++) {
    const mass = cm[i - 1]! + cm[i]!;
    lt += L[i]! * run.tau[i]!;
    lw += L[i]! * w[i]!;
    ll += (L[i]! * L[i]!) / mass;
    ww += mass * w[i]! * w[i]!;
  }
  const scale = Math.sqrt(ll * ww);
  run.sigmaRatio = scale > 0 ? Math.abs(lw) / scale : 0;
  run.sigmaDenominator = run.model.sphereArea * lw;
  run.sigma = run.sigmaRatio >= ENGINE_SETTINGS.degenerateRatio ? -lt / lw : 0;
  const v = run.velocity;
  for (let i = 0; i <= n; i++) v[i] = run.tau[i]! + run.sigma * w[i]!;
}

/**
 * Builds grid, initial data and symmetry for a normalized spec (see `parseRunSpec`).
 * Uploaded tables the spec names (`initial.kind = "table"`, `target.kind = "profile"`)
 * come in `resources` (flow-resources.ts); a missing or mismatched one is a clear error.
 * Throws a clear error for features of later issues (normalized flow).
 */
export function createFlowRun(spec: RunSpec, resources: FlowResources = {}): FlowRun {
  const start = resolveStart(spec, resources);
  const model = createFlowModel(spec, start.overrides);
  const params = start.grid?.params ?? initialGridParams(model.length, model.leftPole, model.rightPole, spec.grid.points);
  const r = start.grid?.r.slice() ?? buildNodes(params, spec.grid.points - 1);
  const h = new Float64Array(r.length);
  if (start.profile) interpolateProfile(start.profile, r, h);
  else for (let i = 0; i < r.length; i++) h[i] = initialValue(spec.domain, spec.initial, r[i]!);
  h[0] = model.leftValue;
  h[r.length - 1] = model.rightValue;
  const s = emptyScalars();
  s.deltaLeft = params.deltaLeft;
  s.deltaRight = params.deltaRight;
  s.kappa = params.kappa;
  s.spacingMax = params.spacingMax;
  const run = {
    spec,
    model,
    s,
    r,
    h,
    history: new Float64Array(HISTORY_CAPACITY * HISTORY_FIELDS),
    samples: [],
    scratch3: new Float64Array(3),
    normalized: isNormalized(spec, model),
    sigma: 0,
    sigmaDenominator: 0,
    sigmaRatio: 0,
  } as unknown as FlowRun;
  rebuildDerived(run);
  s.recentreS = 1;
  s.recentreCenterBefore = run.center;
  s.recentreEnergyBefore = run.energy;
  if (run.normalized) {
    // The normalized flow starts from X = 0 (numerics.md §1): h₀ → h₀∘γ_s, X_h(h₀∘γ_s) = 0
    // on this grid. Throws RecentreError when no dilation centres the data.
    const source = start.profile
      ? profileSource(start.profile)
      : functionSource((x) => initialValue(spec.domain, spec.initial, x));
    const res = recentreOnGrid(run.op, source, run.h, model.sphereArea);
    s.recentreS = res.s;
    s.recentreCenterBefore = res.centerBefore;
    refreshDiagnostics(run);
  }
  s.recentreEnergyAfter = run.energy;
  s.sigmaInitial = run.sigma;
  s.energyInitial = run.energy;
  s.gradMaxInitial = run.gradMax;
  s.dt = initialStep(run);
  s.lastSampleLogLambda = -Math.log(run.gradMax);
  s.lastHistoryLogGrad = -Infinity;
  recordHistory(run, true);
  pushSample(run);
  if (!(Number.isFinite(run.energy) && Number.isFinite(run.tension))) {
    setOutcome(run, 'numerics-failed', 'non-finite');
  } else if (run.tension <= spec.stop.tension) {
    setOutcome(run, 'converged', 'tension');
  } else if (run.normalized && run.sigmaRatio < ENGINE_SETTINGS.degenerateRatio) {
    setOutcome(run, 'degenerate', 'sigma-denominator');
  }
  return run;
}

/**
 * Rebuilds a run from checkpointed state (used by `deserializeCheckpoint`). The
 * derived arrays are recomputed from r and h exactly as the running engine computes
 * them, so the resumed run continues bit for bit.
 */
export function restoreFlowRun(
  spec: RunSpec,
  scalars: FlowScalars,
  r: Float64Array,
  h: Float64Array,
  history: Float64Array,
  target?: TargetGeometry,
): FlowRun {
  // The grid says which symmetry the run started with (it ends at π/2 under reflection).
  const symmetry = spec.domain.kind === 'sphere' && r[r.length - 1]! < 0.75 * Math.PI ? 'reflection' : 'none';
  const model = createFlowModel(spec, { target, symmetry });
  const run = {
    spec,
    model,
    s: { ...scalars },
    r,
    h,
    history,
    samples: [],
    scratch3: new Float64Array(3),
    normalized: isNormalized(spec, model),
    sigma: 0,
    sigmaDenominator: 0,
    sigmaRatio: 0,
  } as unknown as FlowRun;
  rebuildDerived(run);
  return run;
}

/**
 * Normalized flow after a regrid: the monotone remap moves X_h off zero by the
 * interpolation error; a few Newton steps along the dilation generator,
 * h ← h − (X_h/L·w)·w, put it back to round-off (the next implicit stage would do it
 * anyway, but the samples and the energy bookkeeping of the regrid then see X = 0).
 */
export function recentreAfterRemap(run: FlowRun): void {
  if (!run.normalized) return;
  const op = run.op;
  const L = run.ws.cgrad;
  const w = run.ws.wdrift;
  const n = op.cells;
  for (let it = 0; it < 3; it++) {
    const X = op.centerGradient(run.h, L);
    op.drift(run.h, w);
    let lw = 0;
    for (let i = 1; i < n; i++) lw += L[i]! * w[i]!;
    const shift = -X / lw;
    if (!Number.isFinite(shift) || shift === 0) break;
    for (let i = 1; i < n; i++) run.h[i] = run.h[i]! + shift * w[i]!;
    if (Math.abs(shift) < 1e-15) break;
  }
  refreshDiagnostics(run);
}

/** The normalized flow needs σ only on the whole sphere: under reflection symmetry X ≡ 0 and σ ≡ 0 (numerics.md §1). */
function isNormalized(spec: RunSpec, model: FlowModel): boolean {
  return spec.flow === 'normalized' && model.domain === 'sphere' && model.symmetry === 'none';
}

function initialStep(run: FlowRun): number {
  let fmax = 0;
  for (let i = 0; i < run.velocity.length; i++) fmax = Math.max(fmax, Math.abs(run.velocity[i]!));
  const tol = run.spec.time.tolerance;
  const guess = fmax > 0 ? (0.1 * Math.cbrt(tol)) / fmax : run.spec.time.maxStep;
  return Math.min(run.spec.time.maxStep, guess, run.spec.time.tMax);
}

export function setOutcome(run: FlowRun, outcome: FlowOutcome, reason: OutcomeReason): void {
  run.s.outcomeCode = OUTCOME_CODES.indexOf(outcome);
  run.s.reasonCode = REASON_CODES.indexOf(reason);
}

export function runOutcome(run: FlowRun): { outcome: FlowOutcome | null; reason: OutcomeReason | null } {
  return { outcome: OUTCOME_CODES[run.s.outcomeCode] ?? null, reason: REASON_CODES[run.s.reasonCode] ?? null };
}

export function recordHistory(run: FlowRun, force: boolean): void {
  const s = run.s;
  const logG = Math.log(run.gradMax);
  if (!force && logG - s.lastHistoryLogGrad < HISTORY_LOG_GROWTH && s.step - s.lastHistoryStep < HISTORY_STEP_INTERVAL) {
    return;
  }
  const o = s.historyHead * HISTORY_FIELDS;
  const b = run.history;
  b[o + H_T_HI] = s.tHi;
  b[o + H_T_LO] = s.tLo;
  b[o + H_LOG_GRAD] = logG;
  b[o + H_TENSION] = run.tension;
  b[o + H_ENERGY] = run.energy;
  b[o + H_DT] = s.dt;
  b[o + H_GRAD_AT] = run.op.rMid[run.gradMaxCell]!;
  s.historyHead = (s.historyHead + 1) % HISTORY_CAPACITY;
  s.historyCount = Math.min(HISTORY_CAPACITY, s.historyCount + 1);
  s.lastHistoryLogGrad = logG;
  s.lastHistoryStep = s.step;
}

/** The current diagnostic sample (numerics.md §3). */
export function runDiagnostics(run: FlowRun): DiagnosticSample {
  const sphere = run.model.domain === 'sphere';
  return {
    t: runTime(run),
    dt: run.s.dt,
    step: run.s.step,
    energy: run.energy,
    tension: run.tension,
    gradMax: run.gradMax,
    gradMaxAt: run.op.rMid[run.gradMaxCell]!,
    lambda: 1 / run.gradMax,
    center: sphere ? run.center : null,
    sigma: sphere ? run.sigma : null,
    sigmaDenominator: run.normalized ? run.sigmaDenominator : null,
    points: run.r.length,
    newtonIterations: run.s.newtonIterations,
    rejectedSteps: run.s.rejectedSteps,
    regrids: run.s.regrids,
  };
}

export function pushSample(run: FlowRun): void {
  const s = run.s;
  if (run.samples.length >= ENGINE_SETTINGS.sampleBufferSize) {
    run.samples.shift();
    s.samplesDropped += 1;
  }
  run.samples.push(runDiagnostics(run));
  s.lastSampleStep = s.step;
  s.lastSampleLogLambda = -Math.log(run.gradMax);
}

/** Takes the samples collected since the last call (every k steps and every λ change by 1.25×). */
export function drainSamples(run: FlowRun): DiagnosticSample[] {
  const out = run.samples;
  run.samples = [];
  return out;
}

/** Options of {@link advanceFlowRun}. */
export interface AdvanceOptions {
  /** Accepted steps to take at most in this call (default: until an outcome). */
  maxSteps?: number;
  /** Checked before every step; return true to end the slice (the run stays resumable). */
  shouldStop?: () => boolean;
  /**
   * CPU seconds the run has used so far, as the caller measures them (a number, or
   * a function the engine calls between steps). The engine never reads a clock.
   */
  cpuSecondsUsed?: number | (() => number);
  /** CPU budget in seconds: when used ≥ budget the run ends with `time-limit` (reason `cpu-budget`). */
  cpuBudgetSeconds?: number;
}

export interface AdvanceResult {
  /** An outcome was reached (the run is finished unless it is a CPU-budget time-limit). */
  done: boolean;
  outcome: FlowOutcome | null;
  reason: OutcomeReason | null;
  /** Accepted steps taken in this call. */
  steps: number;
}

function cpuExhausted(opts: AdvanceOptions): boolean {
  if (opts.cpuBudgetSeconds === undefined || opts.cpuSecondsUsed === undefined) return false;
  const used = typeof opts.cpuSecondsUsed === 'function' ? opts.cpuSecondsUsed() : opts.cpuSecondsUsed;
  return used >= opts.cpuBudgetSeconds;
}

/**
 * Advances the run by whole accepted steps until an outcome, `maxSteps`, or
 * `shouldStop()`. Results do not depend on how a run is cut into slices. A run that
 * ended with `time-limit` for its CPU budget continues when called with a larger budget.
 */
export function advanceFlowRun(run: FlowRun, opts: AdvanceOptions = {}): AdvanceResult {
  const { outcome, reason } = runOutcome(run);
  if (outcome === 'time-limit' && reason === 'cpu-budget' && !cpuExhausted(opts)) {
    run.s.outcomeCode = 0;
    run.s.reasonCode = 0;
  }
  const maxSteps = opts.maxSteps ?? Infinity;
  let steps = 0;
  while (run.s.outcomeCode === 0 && steps < maxSteps) {
    if (cpuExhausted(opts)) {
      setOutcome(run, 'time-limit', 'cpu-budget');
      break;
    }
    if (opts.shouldStop?.()) break;
    if (stepOnce(run)) steps++;
  }
  const o = runOutcome(run);
  return { done: o.outcome !== null, outcome: o.outcome, reason: o.reason, steps };
}

/** Adds dt to the double-double time (two-sum), so t keeps full precision near T. */
function addTime(s: FlowScalars, dt: number): void {
  const sum = s.tHi + dt;
  const bb = sum - s.tHi;
  const err = s.tHi - (sum - bb) + (dt - bb);
  const lo = s.tLo + err;
  const hi = sum + lo;
  s.tLo = lo - (hi - sum);
  s.tHi = hi;
}

function failStep(run: FlowRun, reason: OutcomeReason): void {
  // A collapse tied to strong gradient growth is the singularity, otherwise numerics (§3).
  const grown = run.gradMax >= ENGINE_SETTINGS.blowupGrowth * run.s.gradMaxInitial;
  setOutcome(run, grown ? 'blowup' : 'numerics-failed', grown ? 'step-collapse' : reason);
}

/** One accepted step (with its rejected attempts). Returns true when a step was accepted. */
function stepOnce(run: FlowRun): boolean {
  const s = run.s;
  const spec = run.spec;
  const E = ENGINE_SETTINGS;
  const tol = spec.time.tolerance;
  for (;;) {
    const remaining = spec.time.tMax - s.tHi - s.tLo;
    if (!(remaining > 0)) {
      setOutcome(run, 'time-limit', 't-max');
      return false;
    }
    let dt = Math.min(s.dt, spec.time.maxStep);
    const last = dt >= remaining;
    if (last) dt = remaining;
    const ws = run.ws;
    ws.sigma = run.sigma;
    const ok = ws.attempt(run.h, run.velocity, dt, tol);
    const error = ws.lastError;
    s.newtonIterations += ws.lastIterations;
    s.pointIterations += ws.lastIterations * (run.op.cells - 1);
    if (!ok || error > 1) {
      s.rejectedSteps += 1;
      s.consecutiveRejections += 1;
      const factor = ok ? Math.max(E.shrinkMin, E.safety * Math.pow(error, -1 / 3)) : 0.25;
      s.dt = dt * factor;
      if (s.dt * run.gradMax * run.gradMax < E.collapse || s.consecutiveRejections > E.maxConsecutiveRejections) {
        failStep(run, ok ? 'step-collapse' : 'newton-failure');
        return false;
      }
      continue;
    }
    // Accept.
    run.h.set(ws.y1);
    addTime(s, dt);
    s.step += 1;
    s.consecutiveRejections = 0;
    const growth = Math.min(E.growthMax, E.safety * Math.pow(Math.max(error, 1e-10), -1 / 3));
    s.dt = Math.min(spec.time.maxStep, dt * growth);
    refreshDiagnostics(run);
    afterStep(run, last);
    return true;
  }
}

function afterStep(run: FlowRun, reachedEnd: boolean): void {
  const s = run.s;
  const spec = run.spec;
  if (!(Number.isFinite(run.energy) && Number.isFinite(run.tension) && Number.isFinite(run.gradMax))) {
    setOutcome(run, 'numerics-failed', 'non-finite');
    pushSample(run);
    return;
  }
  maybeRefine(run);
  recordHistory(run, false);
  if (run.normalized && run.sigmaRatio < ENGINE_SETTINGS.degenerateRatio) setOutcome(run, 'degenerate', 'sigma-denominator');
  else if (run.tension <= spec.stop.tension) {
    const concentrated =
      run.gradMax >= ENGINE_SETTINGS.concentrationGrowth * s.gradMaxInitial && atPole(run);
    if (concentrated) setOutcome(run, 'blowup', 'concentration');
    else setOutcome(run, 'converged', 'tension');
  }
  else if (run.gradMax >= spec.stop.gradientBound) setOutcome(run, 'blowup', 'gradient-bound');
  else if (s.refinementCapped > 0) {
    // Fewer than two cells per λ and no room to refine: the singularity outran the cap.
    const grown = run.gradMax >= ENGINE_SETTINGS.blowupGrowth * s.gradMaxInitial;
    setOutcome(run, grown ? 'blowup' : 'numerics-failed', 'resolution-cap');
  } else if (reachedEnd || spec.time.tMax - s.tHi - s.tLo <= 0) setOutcome(run, 'time-limit', 't-max');
  const E = ENGINE_SETTINGS;
  const done = s.outcomeCode !== 0;
  if (
    done ||
    s.step - s.lastSampleStep >= E.sampleEverySteps ||
    Math.abs(-Math.log(run.gradMax) - s.lastSampleLogLambda) >= Math.log(E.sampleLambdaFactor)
  ) {
    if (done) recordHistory(run, true);
    pushSample(run);
  }
}

/** Whether max|∇u| sits in the graded zone of a pole. */
function atPole(run: FlowRun): boolean {
  const at = run.op.rMid[run.gradMaxCell]!;
  const zone = Math.min(run.model.length / 4, Math.PI / 4);
  return (run.model.leftPole && at <= zone) || (run.model.rightPole && run.model.length - at <= zone);
}

/** Symmetry mode used by the run. */
export function runSymmetry(run: FlowRun): SymmetryUsed {
  return run.model.symmetry;
}

/**
 * The profile (r, h) on the whole domain, for plots: under reflection symmetry the
 * computed half is mirrored, h(π − r) = π − h(r). Returns copies.
 */
export function flowProfile(run: FlowRun): { r: Float64Array; h: Float64Array } {
  if (run.model.symmetry !== 'reflection') return { r: run.r.slice(), h: run.h.slice() };
  const n = run.r.length;
  const r = new Float64Array(2 * n - 1);
  const h = new Float64Array(2 * n - 1);
  for (let i = 0; i < n; i++) {
    r[i] = run.r[i]!;
    h[i] = run.h[i]!;
    r[2 * n - 2 - i] = Math.PI - run.r[i]!;
    h[2 * n - 2 - i] = Math.PI - run.h[i]!;
  }
  r[n - 1] = Math.PI / 2;
  h[n - 1] = Math.PI / 2;
  return { r, h };
}
