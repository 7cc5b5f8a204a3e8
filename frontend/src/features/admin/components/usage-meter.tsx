import { IconWarning } from '@/components/icons';
import { formatNumber } from '@/lib/format';

/**
 * CPU-hours used of a monthly allowance: a bar with the numbers beside it. Near
 * and past the allowance it says so in words and with an icon, not colour alone.
 */
export function UsageMeter({ used, allowance, compact = false }: { used: number; allowance: number; compact?: boolean }) {
  const share = allowance > 0 ? used / allowance : used > 0 ? Infinity : 0;
  const level = share >= 1 ? 'out' : share >= 0.8 ? 'near' : 'ok';
  const percent = Number.isFinite(share) ? Math.round(share * 100) : null;
  return (
    <div className={`usage-meter usage-meter--${level}${compact ? ' usage-meter--compact' : ''}`}>
      <div
        className="usage-meter__track"
        role="meter"
        aria-valuemin={0}
        aria-valuemax={allowance}
        aria-valuenow={used}
        aria-label={`${formatNumber(used, 3)} of ${formatNumber(allowance, 4)} CPU-hours used this month`}
      >
        <span className="usage-meter__fill" style={{ width: `${Math.min(100, (Number.isFinite(share) ? share : 1) * 100)}%` }} />
      </div>
      <div className="usage-meter__text">
        {level !== 'ok' ? <IconWarning /> : null}
        <span>
          <strong>{formatNumber(used, used < 10 ? 2 : 3)}</strong> of {formatNumber(allowance, 4)} CPU-h
          {percent !== null ? ` · ${percent} %` : ''}
          {level === 'out' ? ' · used up' : level === 'near' ? ' · nearly used' : ''}
        </span>
      </div>
    </div>
  );
}
