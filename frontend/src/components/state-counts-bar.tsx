import { RUN_STATES, type RunState } from '@kiln/shared';
import { runStateLook } from './run-status';

const barColor: Record<RunState, string> = {
  finished: '#1f7a5a',
  running: '#2c6391',
  queued: '#aab4be',
  waiting: '#d4a73a',
  paused: '#7c8893',
  failed: '#b3263e',
  cancelled: '#c9ced4',
};

/** Runs per state as a stacked bar plus a legend of words and counts (never colour alone). */
export function StateCountsBar({
  counts,
  total,
  compact = false,
}: {
  counts: Partial<Record<RunState, number>>;
  total: number;
  compact?: boolean;
}) {
  const order: RunState[] = ['finished', 'running', 'queued', 'waiting', 'paused', 'failed', 'cancelled'];
  const done = (counts.finished ?? 0) + (counts.failed ?? 0) + (counts.cancelled ?? 0);
  return (
    <div className={`state-bar${compact ? ' state-bar--compact' : ''}`}>
      <div
        className="state-bar__track"
        role="img"
        aria-label={`${done} of ${total} runs done`}
      >
        {order.map((state) =>
          counts[state] ? (
            <span
              key={state}
              className={`state-bar__seg state-bar__seg--${state}`}
              style={{ width: `${(100 * counts[state]!) / Math.max(1, total)}%`, background: barColor[state] }}
            />
          ) : null,
        )}
      </div>
      <ul className="state-bar__legend">
        <li className="state-bar__done">
          <strong>{done}</strong> of {total} done
        </li>
        {RUN_STATES.filter((s) => counts[s]).map((state) => (
          <li key={state} data-state={state}>
            <span className="state-bar__swatch" style={{ background: barColor[state] }} aria-hidden="true" />
            {runStateLook[state].icon}
            <span>
              {runStateLook[state].label} <strong>{counts[state]}</strong>
            </span>
          </li>
        ))}
      </ul>
    </div>
  );
}
