import { estimateBlowup, type BlowupEstimate, type BlowupKind } from './blowup-fit';
import { historyRows } from './flow-history';
import { runOutcome, runTime, type FlowOutcome, type FlowRun, type OutcomeReason } from './flow-run';
import type { SymmetryUsed } from './flow-model';
import type { TargetGeometry } from './target-geometry';

/** The result object of numerics.md §5 (what `npm run -s flow` prints). */
export interface FlowSummary {
  outcome: FlowOutcome | null;
  /** Which indicator ended the run (an addition to §5, for humans). */
  reason: OutcomeReason | null;
  tFinal: number;
  steps: number;
  gridPoints: number;
  energyInitial: number;
  energyFinal: number;
  tensionFinal: number;
  gradMaxFinal: number;
  /** Center X on the sphere domain (0 under reflection symmetry); null on the ball. */
  center: number | null;
  symmetry: SymmetryUsed;
  cpuSeconds: number;
  blowup: {
    T: number | null;
    exponent: number | null;
    kind: BlowupKind;
    confidence: number;
    /** Additions to §5: one-sigma uncertainties of T and the exponent. */
    TUncertainty: number | null;
    exponentUncertainty: number | null;
  } | null;
  /**
   * Normalized flow only (numerics.md §1): the re-centring h₀ → h₀∘γ_s that made X = 0
   * (s = 1 when X(h₀) = 0, e.g. under reflection symmetry) and the energies before and after.
   */
  recentre?: { s: number; centerBefore: number; energyBefore: number; energyAfter: number };
  /** Normalized flow only: σ at t = 0 (0 under reflection symmetry). */
  sigmaInitial?: number;
}

/** Full blow-up evidence from the run's history (any time; the summary attaches it to `blowup` outcomes). */
export function blowupEstimate(run: FlowRun): BlowupEstimate {
  const e = estimateBlowup(historyRows(run.history, run.s.historyHead, run.s.historyCount));
  e.evidence.energyLost = run.s.energyInitial - run.energy;
  e.evidence.bubbleEnergy = run.model.m === 2 ? targetArea(run.model.target) : null;
  return e;
}

/** Area 2π∫₀^π f(h) ρ(h) dh of a two-dimensional target (Simpson's rule, 2000 panels). */
export function targetArea(target: TargetGeometry): number {
  const n = 2000;
  const step = Math.PI / n;
  let sum = 0;
  for (let k = 0; k <= n; k++) {
    const h = k * step;
    const w = k === 0 || k === n ? 1 : k % 2 === 1 ? 4 : 2;
    sum += w * Math.abs(target.f(h)) * Math.sqrt(target.rhoSquared(h));
  }
  return (2 * Math.PI * sum * step) / 3;
}

/**
 * The §5 summary of a run. `cpuSeconds` is measured by the caller (the engine
 * never reads clocks). `blowup` is filled for the `blowup` outcome only.
 */
export function summarizeFlowRun(run: FlowRun, cpuSeconds = 0): FlowSummary {
  const { outcome, reason } = runOutcome(run);
  let blowup: FlowSummary['blowup'] = null;
  if (outcome === 'blowup') {
    const e = blowupEstimate(run);
    blowup = {
      T: e.T,
      exponent: e.exponent,
      kind: e.kind,
      confidence: e.confidence,
      TUncertainty: e.TUncertainty,
      exponentUncertainty: e.exponentUncertainty,
    };
  }
  const summary: FlowSummary = {
    outcome,
    reason,
    tFinal: runTime(run),
    steps: run.s.step,
    gridPoints: run.r.length,
    energyInitial: run.s.energyInitial,
    energyFinal: run.energy,
    tensionFinal: run.tension,
    gradMaxFinal: run.gradMax,
    center: run.model.domain === 'sphere' ? run.center : null,
    symmetry: run.model.symmetry,
    cpuSeconds,
    blowup,
  };
  if (run.spec.flow === 'normalized') {
    const s = run.s;
    summary.recentre = {
      s: s.recentreS,
      centerBefore: s.recentreCenterBefore,
      energyBefore: s.recentreEnergyBefore,
      energyAfter: s.recentreEnergyAfter,
    };
    summary.sigmaInitial = s.sigmaInitial;
  }
  return summary;
}
