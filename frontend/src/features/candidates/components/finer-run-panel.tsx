import { Alert, Button } from 'antd';
import { Link } from 'react-router-dom';
import { IconCheck, IconCross, IconFork, IconHourglass } from '@/components/icons';
import { StatusTag } from '@/components/status-tag';
import { paths } from '@/config/paths';
import { describeError } from '@/lib/describe-error';
import { formatNumber, shortId } from '@/lib/format';
import { useForkFiner } from '../api/fork-finer';
import type { CandidateDetail } from '../api/get-candidate';
import { formatEstimate } from './candidate-format';

const RESTING = ['finished', 'failed', 'cancelled'];

function Comparison({ candidate }: { candidate: CandidateDetail }) {
  const finer = candidate.finer!;
  const ended = RESTING.includes(finer.state);
  let verdict;
  if (!ended) verdict = <StatusTag tone="info" label="Finer run still computing" icon={<IconHourglass />} />;
  else if (finer.agrees === true) verdict = <StatusTag tone="ok" label="T̂ and p agree within their uncertainties" icon={<IconCheck />} />;
  else if (finer.agrees === false) verdict = <StatusTag tone="warn" label="T̂ or p disagree beyond their uncertainties" icon={<IconCross />} />;
  else if (finer.outcome === 'blowup') verdict = <StatusTag tone="idle" label="Waiting for the finer run's own estimate" icon={<IconHourglass />} />;
  else verdict = <StatusTag tone="warn" label={`The finer run did not blow up (${finer.outcome ?? finer.state})`} icon={<IconCross />} />;
  return (
    <div className="finer-comparison" data-testid="finer-comparison">
      <div>{verdict}</div>
      <table className="finer-comparison__table">
        <thead>
          <tr>
            <th />
            <th>This run</th>
            <th>Finer run</th>
          </tr>
        </thead>
        <tbody>
          <tr>
            <th scope="row">T̂</th>
            <td className="numeric-cell">{formatEstimate(candidate.T, candidate.TUncertainty)}</td>
            <td className="numeric-cell">{formatNumber(finer.T, 8)}</td>
          </tr>
          <tr>
            <th scope="row">p</th>
            <td className="numeric-cell">{formatEstimate(candidate.exponent, candidate.exponentUncertainty)}</td>
            <td className="numeric-cell">{formatNumber(finer.exponent, 5)}</td>
          </tr>
        </tbody>
      </table>
    </div>
  );
}

/** Fork finer in one click; then the finer run's link and, once it ends, the comparison. */
export function FinerRunPanel({ candidate, disabledReason }: { candidate: CandidateDetail; disabledReason: string | null }) {
  const fork = useForkFiner(candidate.id);
  const finerRunId = candidate.finerRunId ?? fork.data?.id ?? null;

  if (finerRunId) {
    return (
      <div className="finer-run">
        <p data-testid="finer-run-link">
          Finer run{' '}
          <Link to={paths.run.getHref(finerRunId)} className="mono-link">
            {shortId(finerRunId)}
          </Link>{' '}
          (twice the grid points, a ten times tighter tolerance, from the checkpoint before the indicators fired).
        </p>
        {candidate.finer ? <Comparison candidate={candidate} /> : <p className="muted">The comparison appears once the finer run has ended.</p>}
      </div>
    );
  }

  const noCheckpoint = !candidate.checkpointId ? 'This candidate has no checkpoint to start a finer run from.' : null;
  const reason = disabledReason ?? noCheckpoint;
  const failure = fork.error ? describeError(fork.error) : null;
  return (
    <div className="finer-run">
      <p className="muted">
        A finer run repeats the flow from the last checkpoint before the indicators fired with twice the grid points and a ten
        times tighter tolerance. A real singularity keeps its T̂ and p; an artefact of the grid moves or vanishes.
      </p>
      {reason ? <p className="muted">{reason}</p> : null}
      <Button type="primary" icon={<IconFork />} disabled={!!reason} loading={fork.isPending} onClick={() => fork.mutate()}>
        Fork finer
      </Button>
      {failure ? <Alert type="error" showIcon role="alert" className="verdict-form__reason" title="No finer run was started." description={`${failure.problem} ${failure.remedy}`} /> : null}
    </div>
  );
}
