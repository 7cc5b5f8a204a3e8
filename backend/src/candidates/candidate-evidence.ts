import { blowupEstimate, runDiagnostics, runTime, type CandidateEvidence, type FlowRun } from '@kiln/shared';

/** Kinds of estimate that make a run a candidate while it is still going. */
const LIVE_KINDS = new Set(['type-I', 'type-II', 'infinite-time']);
/** Confidence an estimate needs to flag a running run (a finished blow-up is always a candidate). */
export const LIVE_CONFIDENCE = 0.5;

/** The evidence a researcher needs to judge a possible singularity, read from one state of the run. */
export function readEvidence(run: FlowRun): CandidateEvidence {
  const estimate = blowupEstimate(run);
  const d = runDiagnostics(run);
  const r = run.r;
  const ballEnd = run.model.domain === 'ball';
  const rEnd = ballEnd ? 1 : Math.PI;
  const at = d.gradMaxAt;
  const lambda = d.lambda;
  // Concentration at a pole: the gradient peaks within a few λ of it.
  const pole = at <= 5 * lambda ? 'r = 0' : rEnd - at <= 5 * lambda ? (ballEnd ? 'r = 1' : 'r = π') : 'interior';
  let smallest = Infinity;
  let within = 0;
  for (let i = 1; i < r.length; i++) {
    const cell = r[i]! - r[i - 1]!;
    if (cell < smallest) smallest = cell;
    const mid = 0.5 * (r[i]! + r[i - 1]!);
    if (Math.abs(mid - at) <= lambda) within++;
  }
  return {
    estimate,
    gradMaxAt: at,
    pole,
    grid: { points: r.length, smallestCell: smallest, cellsWithinLambda: within, lambda },
    t: runTime(run),
    step: run.s.step,
  };
}

/** Whether a running run's evidence is strong enough to show it to a researcher now. */
export function firesWhileRunning(evidence: CandidateEvidence): boolean {
  return LIVE_KINDS.has(evidence.estimate.kind) && evidence.estimate.confidence >= LIVE_CONFIDENCE;
}
