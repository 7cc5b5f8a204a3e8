import type { FlowSummary, Run } from '@kiln/shared';
import { Card } from 'antd';
import { EvidenceCaution } from '@/components/evidence-caution';
import { OutcomeTag, RunStateTag } from '@/components/run-status';
import { formatCpu, formatNumber } from '@/lib/format';

const reasonText: Record<string, string> = {
  tension: 'the tension norm fell below the threshold',
  'gradient-bound': 'max|∇u| passed the gradient bound',
  'step-collapse': 'the step size collapsed',
  'resolution-cap': 'refinement reached its point cap',
  't-max': 't reached t_max',
  'cpu-budget': 'the CPU budget ran out',
  'non-finite': 'a value became non-finite',
  'newton-failure': 'Newton iterations failed',
};

const kindText: Record<string, string> = {
  'type-I': 'finite-time, self-similar (type I)',
  'type-II': 'finite-time, faster than self-similar (type II)',
  'infinite-time': 'infinite-time (gradient grows while T̂ recedes)',
  unknown: 'not classified',
};

const pm = (value: number | null, sigma: number | null, digits = 4) =>
  value === null ? '—' : sigma === null ? formatNumber(value, digits) : `${formatNumber(value, digits)} ± ${formatNumber(sigma, 2)}`;

/** How the run ended and the evidence, with the caution that a call is numerical evidence. */
export function OutcomePanel({ run }: { run: Run }) {
  const summary = run.summary as FlowSummary | null;
  const p = run.progress;
  return (
    <Card title="Outcome" className="panel" size="small" extra={<OutcomeTag outcome={run.outcome} />}>
      {run.state !== 'finished' ? (
        <div className="outcome-pending">
          <RunStateTag state={run.state} />
          <span>
            {run.state === 'waiting'
              ? run.waitReason ?? 'Waiting for a free slot.'
              : run.state === 'failed'
                ? `A software error stopped the run: ${run.error ?? 'no message'}. Resume it from a checkpoint, or tell your lab admin if it repeats.`
                : run.state === 'running'
                  ? 'No outcome yet; the plots follow the run live.'
                  : run.state === 'paused'
                    ? 'Paused with a checkpoint; resume it to continue.'
                    : run.state === 'cancelled'
                      ? 'Cancelled; its checkpoints are kept for resuming or forking.'
                      : 'No outcome yet.'}
          </span>
        </div>
      ) : null}
      {summary ? (
        <dl className="facts facts--two">
          <dt>Why it ended</dt>
          <dd>{summary.reason ? reasonText[summary.reason] ?? summary.reason : run.outcomeReason ?? '—'}</dd>
          <dt>Final time t</dt>
          <dd>{formatNumber(summary.tFinal, 5)}</dd>
          <dt>Steps</dt>
          <dd>{summary.steps}</dd>
          <dt>Energy</dt>
          <dd>
            {formatNumber(summary.energyInitial, 5)} → {formatNumber(summary.energyFinal, 5)}
          </dd>
          <dt>Final tension ‖τ‖</dt>
          <dd>{formatNumber(summary.tensionFinal, 3)}</dd>
          <dt>Final max|∇u|</dt>
          <dd>{formatNumber(summary.gradMaxFinal, 3)}</dd>
          <dt>Grid points at the end</dt>
          <dd>{summary.gridPoints}</dd>
          <dt>CPU</dt>
          <dd>{formatCpu(summary.cpuSeconds || run.cpuSeconds)}</dd>
        </dl>
      ) : p ? (
        <dl className="facts facts--two">
          <dt>t</dt>
          <dd>{formatNumber(p.t, 5)}</dd>
          <dt>Step</dt>
          <dd>{p.step}</dd>
          <dt>Energy</dt>
          <dd>{formatNumber(p.energy, 6)}</dd>
          <dt>Tension ‖τ‖</dt>
          <dd>{formatNumber(p.tension, 3)}</dd>
          <dt>max|∇u|</dt>
          <dd>{formatNumber(p.gradMax, 3)}</dd>
          <dt>CPU</dt>
          <dd>{formatCpu(run.cpuSeconds)}</dd>
        </dl>
      ) : null}
      {summary?.blowup ? (
        <div className="blowup-evidence" aria-label="Blow-up estimate">
          <div className="blowup-evidence__title">Blow-up fit max|∇u| ≈ C (T − t)^(−p)</div>
          <dl className="facts facts--two">
            <dt>Estimated time T̂</dt>
            <dd data-testid="blowup-T">{pm(summary.blowup.T, summary.blowup.TUncertainty, 5)}</dd>
            <dt>Exponent p</dt>
            <dd>{pm(summary.blowup.exponent, summary.blowup.exponentUncertainty, 3)}</dd>
            <dt>Kind</dt>
            <dd>{kindText[summary.blowup.kind] ?? summary.blowup.kind}</dd>
            <dt>Fit confidence</dt>
            <dd>{formatNumber(summary.blowup.confidence, 2)}</dd>
          </dl>
        </div>
      ) : null}
      <EvidenceCaution blowup={run.outcome === 'blowup'} compact={run.outcome !== 'blowup'} />
    </Card>
  );
}
