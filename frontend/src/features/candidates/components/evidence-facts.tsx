import { formatNumber } from '@/lib/format';
import type { CandidateDetail } from '../api/get-candidate';
import { formatConfidence, formatEstimate } from './candidate-format';

/** The numbers behind the call: fit, energy, where it concentrates, and how well the grid resolves it. */
export function EvidenceFacts({ candidate }: { candidate: CandidateDetail }) {
  const { estimate, pole, gradMaxAt, grid, t, step } = candidate.evidence;
  const e = estimate.evidence;
  const bubbleShare = e.energyLost !== null && e.bubbleEnergy ? e.energyLost / e.bubbleEnergy : null;
  return (
    <dl className="facts evidence-facts" data-testid="evidence-facts">
      <dt>Blow-up time T̂</dt>
      <dd className="numeric-cell">{formatEstimate(candidate.T, candidate.TUncertainty)}</dd>
      <dt>Exponent p</dt>
      <dd className="numeric-cell">
        {formatEstimate(candidate.exponent, candidate.exponentUncertainty)}
        <span className="muted"> (self-similar: ½)</span>
      </dd>
      <dt>Confidence</dt>
      <dd className="numeric-cell">{formatConfidence(candidate.confidence)}</dd>
      <dt>Fit window</dt>
      <dd className="numeric-cell">
        {e.samples} samples over {formatNumber(e.decades, 2)} decades of max|∇u|
      </dd>
      <dt>Fit residuals (RMS in ln)</dt>
      <dd className="numeric-cell">
        power law {formatNumber(e.powerLawRms, 2)} · exponential {formatNumber(e.exponentialRms, 2)}
        {e.exponentialRate !== null ? ` (μ = ${formatNumber(e.exponentialRate, 3)})` : ''}
      </dd>
      <dt>T̂ from the older half</dt>
      <dd className="numeric-cell">{formatNumber(e.earlierT, 5)}</dd>
      <dt>Tension, end ÷ start of window</dt>
      <dd className="numeric-cell">
        {formatNumber(e.tensionRatio, 3)}
        <span className="muted">{e.tensionRatio < 1 ? ' (falling)' : ' (not falling)'}</span>
      </dd>
      <dt>Energy lost</dt>
      <dd className="numeric-cell">
        {formatNumber(e.energyLost, 4)}
        {e.bubbleEnergy !== null ? (
          <span className="muted">
            {' '}
            vs one bubble {formatNumber(e.bubbleEnergy, 4)}
            {bubbleShare !== null ? ` (${formatNumber(bubbleShare, 3)} bubbles)` : ''}
          </span>
        ) : (
          <span className="muted"> (no bubble energy in this dimension)</span>
        )}
      </dd>
      <dt>Where it concentrates</dt>
      <dd>
        {pole ?? 'no pole'}
        {gradMaxAt !== null ? <span className="muted numeric-cell"> · max|∇u| at r = {formatNumber(gradMaxAt, 4)}</span> : null}
      </dd>
      <dt>Grid near the pole</dt>
      <dd className="numeric-cell">
        {grid
          ? `${grid.cellsWithinLambda} cells within λ = ${formatNumber(grid.lambda, 3)}; smallest cell ${formatNumber(grid.smallestCell, 3)}; ${grid.points} points`
          : '—'}
      </dd>
      <dt>Read at</dt>
      <dd className="numeric-cell">
        t = {formatNumber(t, 6)}, step {step}
      </dd>
    </dl>
  );
}

/** The engine's remarks in words. */
export function EngineNotes({ notes }: { notes: string[] }) {
  if (notes.length === 0) return <p className="muted">The engine made no remarks on this fit.</p>;
  return (
    <ul className="engine-notes">
      {notes.map((note) => (
        <li key={note}>{note}</li>
      ))}
    </ul>
  );
}
