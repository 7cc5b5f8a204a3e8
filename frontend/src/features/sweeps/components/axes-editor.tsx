import { axisValues, SWEEP_LIMITS, type SweepAxis } from '@kiln/shared';
import { Alert, Button, Card, Form, Input, Radio, Select } from 'antd';
import { IconCross, IconPlus } from '@/components/icons';
import { NumberField } from './number-field';
import { FIELD_INFO, SWEEPABLE_OPTIONS, toAxis, type AxisDraft, type AxisErrors } from './spec-draft';
import { formatAxisValue } from './sweep-axes';

let nextKey = 100;
export const newAxisDraft = (path: AxisDraft['path'] = 'target.axisRatio'): AxisDraft => ({
  key: nextKey++,
  path,
  mode: 'values',
  valuesText: '',
  from: null,
  to: null,
  steps: 5,
  scale: 'linear',
});

function valuesPreview(draft: AxisDraft): string | null {
  try {
    const values = axisValues(toAxis(draft) as SweepAxis).filter(Number.isFinite);
    if (!values.length) return null;
    const shown = values.slice(0, 8).map((v) => formatAxisValue(draft.path, v)).join(', ');
    return `${values.length} value${values.length === 1 ? '' : 's'}: ${shown}${values.length > 8 ? ', …' : ''}`;
  } catch {
    return null;
  }
}

/** The sweep's axes: each varies one spec field over a list of values or a linear/log range. */
export function AxesEditor({
  axes,
  onChange,
  errors,
  general,
}: {
  axes: AxisDraft[];
  onChange: (axes: AxisDraft[]) => void;
  errors: AxisErrors;
  general: string | null;
}) {
  const update = (index: number, patch: Partial<AxisDraft>) =>
    onChange(axes.map((axis, i) => (i === index ? { ...axis, ...patch } : axis)));
  const used = new Set(axes.map((a) => a.path));

  return (
    <Card
      title="Axes"
      className="panel"
      size="small"
      extra={<span className="panel__meta">the sweep runs every combination; the last axis varies fastest</span>}
    >
      <Form layout="vertical" component="div" requiredMark={false}>
        {axes.length === 0 ? (
          <p className="muted">
            No axes yet: the sweep is one run of the base spec. Add an axis to vary a field such as the axis ratio.
          </p>
        ) : null}
        {axes.map((axis, index) => {
          const e = errors[index] ?? {};
          const info = FIELD_INFO[axis.path];
          const preview = valuesPreview(axis);
          return (
            <section key={axis.key} className="axis-row" aria-label={`Axis ${index + 1}`}>
              <div className="axis-row__head">
                <span className="axis-row__index">{index + 1}</span>
                <Form.Item label="Field" validateStatus={e.path ? 'error' : undefined} help={e.path} className="axis-row__path">
                  <Select
                    aria-label={`Axis ${index + 1} field`}
                    value={axis.path}
                    onChange={(path) => update(index, { path })}
                    options={SWEEPABLE_OPTIONS.map((o) => ({ ...o, disabled: o.value !== axis.path && used.has(o.value) }))}
                    showSearch
                  />
                </Form.Item>
                <Form.Item label="Given as">
                  <Radio.Group
                    value={axis.mode}
                    onChange={(ev) => update(index, { mode: ev.target.value })}
                    optionType="button"
                    options={[
                      { value: 'values', label: 'Values' },
                      { value: 'range', label: 'Range' },
                    ]}
                  />
                </Form.Item>
                <Button
                  type="text"
                  icon={<IconCross />}
                  aria-label={`Remove axis ${index + 1}`}
                  onClick={() => onChange(axes.filter((_, i) => i !== index))}
                  className="axis-row__remove"
                />
              </div>
              {axis.mode === 'values' ? (
                <Form.Item
                  label={`Values of ${info.label}${info.unit ? ` (${info.unit})` : ''}`}
                  htmlFor={`axis-values-${axis.key}`}
                  validateStatus={e.values ? 'error' : undefined}
                  help={e.values}
                  extra={e.values ? undefined : `${info.range}; separate with commas or spaces${preview ? ` — ${preview}` : ''}`}
                >
                  <Input
                    id={`axis-values-${axis.key}`}
                    value={axis.valuesText}
                    placeholder="e.g. 1.5, 2, 2.5, 3"
                    onChange={(ev) => update(index, { valuesText: ev.target.value })}
                  />
                </Form.Item>
              ) : (
                <>
                  <div className="spec-form__row">
                    <NumberField label="From" value={axis.from} onChange={(from) => update(index, { from })} unit={info.unit} error={e.from} />
                    <NumberField label="To" value={axis.to} onChange={(to) => update(index, { to })} unit={info.unit} error={e.to} />
                    <NumberField label="Steps" value={axis.steps} onChange={(steps) => update(index, { steps })} hint={`1 – ${SWEEP_LIMITS.maxValuesPerAxis}, ends included`} error={e.steps} />
                    <Form.Item label="Spacing" validateStatus={e.scale ? 'error' : undefined} help={e.scale}>
                      <Radio.Group
                        value={axis.scale}
                        onChange={(ev) => update(index, { scale: ev.target.value })}
                        optionType="button"
                        options={[
                          { value: 'linear', label: 'Linear' },
                          { value: 'log', label: 'Log' },
                        ]}
                      />
                    </Form.Item>
                  </div>
                  <div className="axis-row__preview">{preview ?? `${info.range}`}</div>
                </>
              )}
              {e[''] ? <Alert type="error" showIcon title={e['']} /> : null}
            </section>
          );
        })}
        {general ? <Alert type="error" showIcon title={general} className="axis-general-error" /> : null}
        <Button
          icon={<IconPlus />}
          disabled={axes.length >= SWEEP_LIMITS.maxAxes}
          onClick={() => {
            const free = SWEEPABLE_OPTIONS.find((o) => !used.has(o.value))?.value;
            onChange([...axes, newAxisDraft(free)]);
          }}
        >
          Add an axis
        </Button>
      </Form>
    </Card>
  );
}
