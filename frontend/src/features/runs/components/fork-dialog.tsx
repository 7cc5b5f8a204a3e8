import { RUN_SPEC_DEFAULTS, RUN_SPEC_LIMITS as L, safeParseRunSpec, type CheckpointInfo, type RunSpec } from '@kiln/shared';
import { Alert, Form, Input, Modal, Radio } from 'antd';
import { useEffect, useId, useMemo, useState } from 'react';
import { ApiRequestError } from '@/lib/api-client';
import { describeError } from '@/lib/describe-error';
import { formatForInput, formatNumber } from '@/lib/format';
import { useForkCheckpoint } from '../api/checkpoint-actions';

interface ForkDraft {
  points: string;
  maxPoints: string;
  tMax: string;
  maxStep: string;
  tolerance: string;
  tension: string;
  gradientBound: string;
  flow: RunSpec['flow'];
}

const toNumber = (text: string) => (text.trim() === '' ? undefined : Number(text.trim()));

function draftOf(spec: RunSpec): ForkDraft {
  return {
    points: formatForInput(spec.grid.points),
    maxPoints: '',
    tMax: formatForInput(spec.time.tMax),
    maxStep: formatForInput(spec.time.maxStep),
    tolerance: formatForInput(spec.time.tolerance),
    tension: formatForInput(spec.stop.tension),
    gradientBound: formatForInput(spec.stop.gradientBound),
    flow: spec.flow,
  };
}

/** Only the fields that differ from the parent's spec, nested as the API expects. */
function overridesOf(spec: RunSpec, d: ForkDraft): Record<string, Record<string, unknown> | string> {
  const o: Record<string, Record<string, unknown> | string> = {};
  const set = (section: string, field: string, value: unknown, parent: unknown) => {
    if (value === parent) return;
    (o[section] = (o[section] as Record<string, unknown>) ?? {})[field] = value;
  };
  const points = toNumber(d.points);
  set('grid', 'points', points, spec.grid.points);
  const maxPoints = toNumber(d.maxPoints);
  if (maxPoints !== undefined) set('grid', 'maxPoints', maxPoints, spec.grid.maxPoints);
  else if (points !== spec.grid.points && typeof points === 'number' && Number.isInteger(points)) {
    // A new grid gets the default refinement cap for its size, as a new run would.
    set('grid', 'maxPoints', Math.min(L.refinedPointsMax, Math.max(RUN_SPEC_DEFAULTS.maxPointsFactor * points, points + RUN_SPEC_DEFAULTS.maxPointsExtra)), spec.grid.maxPoints);
  }
  set('time', 'tMax', toNumber(d.tMax), spec.time.tMax);
  set('time', 'maxStep', toNumber(d.maxStep), spec.time.maxStep);
  set('time', 'tolerance', toNumber(d.tolerance), spec.time.tolerance);
  set('stop', 'tension', toNumber(d.tension), spec.stop.tension);
  set('stop', 'gradientBound', toNumber(d.gradientBound), spec.stop.gradientBound);
  if (d.flow !== spec.flow) o.flow = d.flow;
  return o;
}

/** The spec the fork will run: the parent's with the overrides merged field by field (as the API does). */
function merged(spec: RunSpec, overrides: Record<string, unknown>): Record<string, unknown> {
  const out: Record<string, unknown> = structuredClone(spec) as unknown as Record<string, unknown>;
  for (const [key, value] of Object.entries(overrides)) {
    const current = out[key];
    out[key] = typeof value === 'object' && value !== null && typeof current === 'object' && current !== null ? { ...current, ...value } : value;
  }
  return out;
}

function Field({ label, value, onChange, error, hint }: { label: string; value: string; onChange: (v: string) => void; error?: string; hint?: string }) {
  const id = useId();
  return (
    <Form.Item label={label} htmlFor={id} validateStatus={error ? 'error' : undefined} help={error} extra={error ? undefined : hint}>
      <Input id={id} value={value} onChange={(e) => onChange(e.target.value)} inputMode="decimal" />
    </Form.Item>
  );
}

/**
 * Fork: a new run from this checkpoint with some spec fields changed (finer grid,
 * other step size or tolerance, normalized flow, longer t_max). Checked against
 * the run-spec schema as you type; the API applies the same merge and schema.
 */
export function ForkDialog({
  checkpoint,
  spec,
  onClose,
  onForked,
}: {
  checkpoint: CheckpointInfo | null;
  spec: RunSpec;
  onClose: () => void;
  onForked: (runId: string) => void;
}) {
  const [draft, setDraft] = useState<ForkDraft>(() => draftOf(spec));
  const fork = useForkCheckpoint();
  useEffect(() => {
    if (checkpoint) {
      setDraft(draftOf(spec));
      fork.reset();
    }
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [checkpoint?.id]);

  const overrides = useMemo(() => overridesOf(spec, draft), [spec, draft]);
  const errors = useMemo(() => {
    const result = safeParseRunSpec(merged(spec, overrides));
    const out: Record<string, string> = {};
    if (!result.success) for (const issue of result.issues) out[issue.path] ??= issue.message;
    return out;
  }, [spec, overrides]);
  const valid = Object.keys(errors).length === 0;
  const changed = Object.keys(overrides).length > 0;
  const patch = (p: Partial<ForkDraft>) => setDraft((d) => ({ ...d, ...p }));
  const sphere = spec.domain.kind === 'sphere';
  const otherErrors = Object.entries(errors).filter(([p]) => !['grid.points', 'grid.maxPoints', 'time.tMax', 'time.maxStep', 'time.tolerance', 'stop.tension', 'stop.gradientBound', 'flow'].includes(p));

  return (
    <Modal
      title={checkpoint ? `Fork from checkpoint #${checkpoint.seq} (t = ${formatNumber(checkpoint.t, 4)})` : 'Fork'}
      open={checkpoint !== null}
      onCancel={onClose}
      okText="Start the fork"
      okButtonProps={{ disabled: !valid }}
      confirmLoading={fork.isPending}
      width={620}
      onOk={() => {
        if (!checkpoint || !valid) return;
        fork.mutate({ checkpointId: checkpoint.id, overrides }, { onSuccess: (run) => onForked(run.id) });
      }}
    >
      <p className="muted">
        The new run starts from this checkpoint's profile, carried onto the new grid, and counts against your own quota.
        Change only what the new run should do differently.
      </p>
      <Form layout="vertical" component="div" requiredMark={false} className="fork-form">
        <div className="spec-form__row">
          <Field label="Grid points" value={draft.points} onChange={(points) => patch({ points })} error={errors['grid.points']} hint={`now ${spec.grid.points}; ${L.pointsMin} – ${L.pointsMax}`} />
          <Field label="Refinement cap" value={draft.maxPoints} onChange={(maxPoints) => patch({ maxPoints })} error={errors['grid.maxPoints']} hint={`now ${spec.grid.maxPoints}; empty: default for the grid`} />
        </div>
        <div className="spec-form__row">
          <Field label="End time t_max" value={draft.tMax} onChange={(tMax) => patch({ tMax })} error={errors['time.tMax']} hint={`now ${formatNumber(spec.time.tMax)}`} />
          <Field label="Largest step" value={draft.maxStep} onChange={(maxStep) => patch({ maxStep })} error={errors['time.maxStep']} hint={`now ${formatNumber(spec.time.maxStep)}`} />
          <Field label="Tolerance" value={draft.tolerance} onChange={(tolerance) => patch({ tolerance })} error={errors['time.tolerance']} hint={`now ${formatNumber(spec.time.tolerance)}`} />
        </div>
        <div className="spec-form__row">
          <Field label="Tension threshold" value={draft.tension} onChange={(tension) => patch({ tension })} error={errors['stop.tension']} hint={`now ${formatNumber(spec.stop.tension)}`} />
          <Field label="Gradient bound" value={draft.gradientBound} onChange={(gradientBound) => patch({ gradientBound })} error={errors['stop.gradientBound']} hint={`now ${formatNumber(spec.stop.gradientBound)}`} />
        </div>
        {sphere ? (
          <Form.Item label="Flow" validateStatus={errors.flow ? 'error' : undefined} help={errors.flow}>
            <Radio.Group
              value={draft.flow}
              onChange={(e) => patch({ flow: e.target.value })}
              optionType="button"
              options={[
                { value: 'standard', label: 'Standard' },
                { value: 'normalized', label: 'Möbius-normalized' },
              ]}
            />
          </Form.Item>
        ) : null}
      </Form>
      {otherErrors.length ? <Alert type="error" showIcon title={otherErrors.map(([p, m]) => `${p}: ${m}`).join('; ')} /> : null}
      {!changed ? <Alert type="info" showIcon title="Nothing changed: the fork would repeat the parent from this checkpoint." /> : null}
      {fork.error ? (
        <Alert
          type="error"
          showIcon
          title="The fork was not started"
          description={
            <>
              <div>{describeError(fork.error).problem}</div>
              {fork.error instanceof ApiRequestError
                ? fork.error.details.map((d, i) => (
                    <div key={i}>
                      {d.path}: {d.message}
                    </div>
                  ))
                : null}
              <div>{describeError(fork.error).remedy}</div>
            </>
          }
        />
      ) : null}
    </Modal>
  );
}
