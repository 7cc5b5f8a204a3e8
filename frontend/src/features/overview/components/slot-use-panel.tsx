import { Card } from 'antd';
import { plural } from '@/lib/format';

/** The signed-in person's runs in flight, against their slot cap when it is known. */
export function SlotUsePanel({
  running,
  queued,
  waiting,
  slots,
}: {
  running: number | undefined;
  queued: number | undefined;
  waiting: number | undefined;
  slots: number | null;
}) {
  const known = running !== undefined;
  const used = running ?? 0;
  return (
    <Card title="Your slots" className="panel" size="small">
      {known ? (
        <>
          {slots !== null ? (
            <div className="slot-meter" role="img" aria-label={`${used} of ${slots} slots in use`}>
              {Array.from({ length: Math.max(slots, used) }, (_, i) => (
                <span key={i} className={`slot-pip slot-pip--lg${i < used ? ' slot-pip--busy' : ''}`} />
              ))}
            </div>
          ) : null}
          <div className="figure__value figure__value--sm" data-testid="slot-use">
            {slots !== null ? `${used} of ${plural(slots, 'slot', 'slots')} in use` : `${plural(used, 'run', 'runs')} computing`}
          </div>
          <p className="panel__note">
            {queued ?? 0} in the queue, {waiting ?? 0} waiting. Your runs compute at most {slots ?? 'your slot cap'} at a time; the
            rest wait their turn fairly with everyone else's.
          </p>
        </>
      ) : (
        <p className="muted">Counting your runs…</p>
      )}
    </Card>
  );
}
