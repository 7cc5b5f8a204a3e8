import type { Run } from '@kiln/shared';
import { Alert } from 'antd';
import { Link } from 'react-router-dom';
import { StatusTag } from '@/components/status-tag';
import { paths } from '@/config/paths';
import { formatNumber, shortId } from '@/lib/format';
import { useParentCheckpoints } from '../api/get-parent-checkpoints';
import './mobius.css';

type DilationJumpOrigin = Extract<NonNullable<Run['origin']>, { kind: 'dilation-jump' }>;

/**
 * The badge of a run started by the experimental jump to the maximiser: where it came
 * from (checkpoint and run, linked) and what the jump did, so nobody mistakes it for a
 * step of a flow.
 */
export function ExperimentalOrigin({ run, origin }: { run: Run; origin: DilationJumpOrigin }) {
  const parentRunId = run.parentRunId;
  const checkpoints = useParentCheckpoints(parentRunId);
  const seq = checkpoints.data?.find((c) => c.id === run.parentCheckpointId)?.seq;
  return (
    <Alert
      type="warning"
      showIcon={false}
      className="parent-note mobius-origin"
      data-testid="experimental-origin"
      title={
        <>
          <StatusTag tone="ember" label="Experimental" title="Started by a jump along the dilation orbit, not by a flow" />
          <span data-testid="parent-link">
            Experimental: started from h∘γ<sub>s*</sub> of{' '}
            {seq !== undefined ? `checkpoint #${seq}` : checkpoints.isError ? 'a checkpoint' : 'checkpoint …'}
            {parentRunId ? (
              <>
                {' '}
                of run{' '}
                <Link to={paths.run.getHref(parentRunId)} className="mono-link">
                  {shortId(parentRunId)}
                </Link>
              </>
            ) : (
              ' of a run that no longer exists'
            )}
          </span>
        </>
      }
      description={
        <span className="mobius-origin__numbers">
          s* = {formatNumber(origin.sStar, 5)}; the jump added F(s*) − F(1) = {formatNumber(origin.gap, 4)} of energy (F(s*) ={' '}
          {formatNumber(origin.energyAtMax, 6)}). It is not a step of any flow: read this run as an exploration, not as evidence
          about the parent's flow.
        </span>
      }
    />
  );
}
