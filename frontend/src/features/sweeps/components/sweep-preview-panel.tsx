import type { SweepPreviewResponse } from '@kiln/shared';
import { Alert, Card, Spin } from 'antd';
import { QueryError } from '@/components/query-error';
import { formatCpuAmount, formatCpuHours, plural } from '@/lib/format';
import { FIELD_INFO } from './spec-draft';
import { formatAxisValue } from './sweep-axes';

/** Run count and the rough CPU estimate of the sweep against the person's quota, live as they type. */
export function SweepPreviewPanel({
  localRunCount,
  preview,
  pending,
  error,
  blocked,
}: {
  localRunCount: number | null;
  preview: SweepPreviewResponse | undefined;
  pending: boolean;
  error: unknown;
  /** Why no preview is asked for now (the form's own errors), or null. */
  blocked: string | null;
}) {
  const q = preview?.quota;
  const overBudget = preview && q?.cpuHoursRemaining !== null && q?.cpuHoursRemaining !== undefined && preview.estimatedCpuHours > q.cpuHoursRemaining;
  return (
    <Card
      title="Before you submit"
      className="panel sweep-preview"
      size="small"
      extra={pending ? <Spin size="small" aria-label="Updating the preview" /> : null}
    >
      <div className="sweep-preview__figures" aria-live="polite">
        <div className="figure">
          <div className="figure__name">Runs</div>
          <div className="figure__value" data-testid="preview-run-count">
            {preview && !blocked ? preview.runCount : localRunCount ?? '—'}
          </div>
        </div>
        <div className="figure">
          <div className="figure__name">Estimated CPU</div>
          <div className="figure__value" data-testid="preview-cpu-hours">
            {preview && !blocked ? `≈ ${formatCpuAmount(preview.estimatedCpuHours)}` : '—'}
          </div>
        </div>
      </div>
      {blocked ? (
        <Alert type="info" showIcon title="No preview while the form has errors" description={blocked} />
      ) : error ? (
        <QueryError what="the preview" error={error} />
      ) : preview && q ? (
        <>
          <p className="sweep-preview__note">
            The CPU estimate is rough (grid size × steps); blow-up runs refine and take small steps, converging runs may
            stop early.
          </p>
          <dl className="facts">
            <dt>Your slots</dt>
            <dd>
              {q.slotsInUse} of {plural(q.slots, 'slot', 'slots')} in use; at most {q.slots} of these runs compute at once
            </dd>
            <dt>CPU-hours left</dt>
            <dd>{q.cpuHoursRemaining === null ? 'no monthly limit set for you' : `${formatCpuHours(q.cpuHoursRemaining)} this month`}</dd>
          </dl>
          {overBudget ? (
            <Alert
              type="warning"
              showIcon
              title="This sweep may use more CPU-hours than you have left"
              description="Runs beyond your quota wait until it renews. Ask a lab admin for more, or sweep fewer values."
            />
          ) : null}
          {preview.sample.length ? (
            <div className="sweep-preview__sample">
              <div className="figure__name">First runs</div>
              <ol>
                {preview.sample.map((run, i) => (
                  <li key={i}>
                    {Object.entries(run.axisValues)
                      .map(([path, v]) => `${FIELD_INFO[path as keyof typeof FIELD_INFO]?.label ?? path} = ${formatAxisValue(path, v)}`)
                      .join(', ') || 'the base spec'}
                  </li>
                ))}
              </ol>
            </div>
          ) : null}
        </>
      ) : (
        <p className="muted">Working out the run count and CPU estimate…</p>
      )}
    </Card>
  );
}
