import { RUN_SPEC_DEFAULTS, RUN_SPEC_LIMITS as L } from '@kiln/shared';
import { Alert, Card, Form, Radio, Select } from 'antd';
import { formatNumber } from '@/lib/format';
import { NumberField } from './number-field';
import type { FieldErrors, SpecDraft } from './spec-draft';

type Patch = (patch: Partial<SpecDraft>) => void;

const FIELDS_SHOWN = new Set([
  'domain.kind', 'domain.dim', 'domain.boundaryAngle', 'target.kind', 'target.axisRatio', 'flow', 'initial.kind',
  'initial.slope', 'initial.s', 'initial.amplitude', 'initial.mode', 'symmetry', 'grid.points', 'grid.maxPoints',
  'time.tMax', 'time.maxStep', 'time.tolerance', 'stop.tension', 'stop.gradientBound',
]);

/** The base spec of a sweep (numerics.md §5), field by field, with units, ranges and the schema's messages. */
export function SpecForm({ draft, onChange, errors }: { draft: SpecDraft; onChange: Patch; errors: FieldErrors }) {
  const ball = draft.domainKind === 'ball';
  const other = Object.entries(errors).filter(([path]) => !FIELDS_SHOWN.has(path));
  return (
    <Form layout="vertical" component="div" className="spec-form" requiredMark={false}>
      {other.length ? (
        <Alert type="error" showIcon title="The base spec is not valid" description={other.map(([p, m]) => `${p}: ${m}`).join('; ')} />
      ) : null}
      <Card title="Domain and target" className="panel" size="small">
        <div className="spec-form__row">
          <Form.Item label="Domain" validateStatus={errors['domain.kind'] ? 'error' : undefined} help={errors['domain.kind']}>
            <Radio.Group
              value={draft.domainKind}
              onChange={(e) => onChange({ domainKind: e.target.value })}
              options={[
                { value: 'sphere', label: 'Sphere Sᵐ' },
                { value: 'ball', label: 'Ball Bᵐ' },
              ]}
              optionType="button"
            />
          </Form.Item>
          <NumberField label="Dimension m" value={draft.dim} onChange={(dim) => onChange({ dim })} hint={`integer ${L.dimMin} – ${L.dimMax}`} error={errors['domain.dim']} />
          {ball ? (
            <NumberField
              label="Boundary angle α"
              value={draft.boundaryAngle}
              onChange={(boundaryAngle) => onChange({ boundaryAngle })}
              unit="rad"
              hint={`|α| ≤ 4π; type 0.9π for 0.9·π${draft.boundaryAngle !== null && Number.isFinite(draft.boundaryAngle) ? ` (now ${formatNumber(draft.boundaryAngle / Math.PI, 4)}π)` : ''}`}
              error={errors['domain.boundaryAngle']}
            />
          ) : null}
        </div>
        <div className="spec-form__row">
          <Form.Item label="Target N" validateStatus={errors['target.kind'] ? 'error' : undefined} help={errors['target.kind']}>
            <Radio.Group
              value={draft.targetKind}
              onChange={(e) => onChange({ targetKind: e.target.value })}
              options={[
                { value: 'sphere', label: 'Round sphere' },
                { value: 'ellipsoid', label: 'Ellipsoid' },
              ]}
              optionType="button"
            />
          </Form.Item>
          {draft.targetKind === 'ellipsoid' ? (
            <NumberField label="Axis ratio b" value={draft.axisRatio} onChange={(axisRatio) => onChange({ axisRatio })} hint={`${L.axisRatioMin} – ${L.axisRatioMax}`} error={errors['target.axisRatio']} />
          ) : null}
        </div>
      </Card>

      <Card title="Flow and initial data" className="panel" size="small">
        <div className="spec-form__row">
          <Form.Item label="Flow" validateStatus={errors.flow ? 'error' : undefined} help={errors.flow}>
            <Radio.Group
              value={draft.flow}
              onChange={(e) => onChange({ flow: e.target.value })}
              options={[
                { value: 'standard', label: 'Standard' },
                { value: 'normalized', label: 'Möbius-normalized' },
              ]}
              optionType="button"
            />
          </Form.Item>
          <Form.Item label="Symmetry" validateStatus={errors.symmetry ? 'error' : undefined} help={errors.symmetry}>
            <Select
              value={draft.symmetry}
              onChange={(symmetry) => onChange({ symmetry })}
              style={{ width: 150 }}
              options={[
                { value: 'auto', label: 'Automatic' },
                { value: 'reflection', label: 'Reflection' },
                { value: 'none', label: 'None' },
              ]}
            />
          </Form.Item>
        </div>
        <div className="spec-form__row">
          <Form.Item label="Initial data h₀" validateStatus={errors['initial.kind'] ? 'error' : undefined} help={errors['initial.kind']}>
            <Select
              value={draft.initialKind}
              onChange={(initialKind) => onChange({ initialKind })}
              style={{ width: 230 }}
              options={[
                { value: 'identity', label: ball ? 'Identity  h₀ = α·r' : 'Identity  h₀ = r' },
                { value: 'linear', label: 'Linear  h₀ = slope·r (ball)' },
                { value: 'dilated', label: 'Dilated  h₀ = γₛ(r) (sphere)' },
                { value: 'perturbed', label: 'Perturbed  + A·sin(k·r)' },
              ]}
            />
          </Form.Item>
          {draft.initialKind === 'linear' ? (
            <NumberField label="Slope" value={draft.slope} onChange={(slope) => onChange({ slope })} unit="rad" hint={`|slope| ≤ ${L.slopeMax}; 1.5π works`} error={errors['initial.slope']} />
          ) : null}
          {draft.initialKind === 'dilated' ? (
            <NumberField label="Dilation s" value={draft.s} onChange={(s) => onChange({ s })} hint={`${L.dilationMin} – ${L.dilationMax}`} error={errors['initial.s']} />
          ) : null}
          {draft.initialKind === 'perturbed' ? (
            <>
              <NumberField label="Amplitude A" value={draft.amplitude} onChange={(amplitude) => onChange({ amplitude })} unit="rad" hint={`|A| ≤ ${L.amplitudeMax}`} error={errors['initial.amplitude']} />
              <NumberField label="Mode k" value={draft.mode} onChange={(mode) => onChange({ mode })} hint={`integer ${L.modeMin} – ${L.modeMax}`} error={errors['initial.mode']} />
            </>
          ) : null}
        </div>
      </Card>

      <Card title="Grid and time" className="panel" size="small">
        <div className="spec-form__row">
          <NumberField label="Grid points" value={draft.points} onChange={(points) => onChange({ points })} hint={`integer ${L.pointsMin} – ${L.pointsMax}`} error={errors['grid.points']} />
          <NumberField label="Refinement cap" value={draft.maxPoints} onChange={(maxPoints) => onChange({ maxPoints })} placeholder="default" hint={`points after refinement, ≤ ${L.refinedPointsMax}; empty: 4 × grid points`} error={errors['grid.maxPoints']} />
        </div>
        <div className="spec-form__row">
          <NumberField label="End time t_max" value={draft.tMax} onChange={(tMax) => onChange({ tMax })} hint={`> 0, ≤ ${formatNumber(L.tMaxMax)} (flow time)`} error={errors['time.tMax']} />
          <NumberField label="Largest step" value={draft.maxStep} onChange={(maxStep) => onChange({ maxStep })} placeholder="1 % of t_max" hint="> 0, ≤ t_max; empty: 1 % of t_max" error={errors['time.maxStep']} />
          <NumberField label="Tolerance" value={draft.tolerance} onChange={(tolerance) => onChange({ tolerance })} unit="rad" placeholder={String(RUN_SPEC_DEFAULTS.tolerance)} hint={`local error on h, ${L.toleranceMin} – ${L.toleranceMax}`} error={errors['time.tolerance']} />
        </div>
      </Card>

      <Card title="When a run stops" className="panel" size="small">
        <div className="spec-form__row">
          <NumberField label="Tension threshold" value={draft.tension} onChange={(tension) => onChange({ tension })} placeholder={String(RUN_SPEC_DEFAULTS.tension)} hint={`converged when ‖τ‖ falls below; ${L.tensionMin} – ${L.tensionMax}`} error={errors['stop.tension']} />
          <NumberField label="Gradient bound" value={draft.gradientBound} onChange={(gradientBound) => onChange({ gradientBound })} placeholder={String(RUN_SPEC_DEFAULTS.gradientBound)} hint={`blow-up when max|∇u| passes; ${L.gradientBoundMin} – ${formatNumber(L.gradientBoundMax)}`} error={errors['stop.gradientBound']} />
        </div>
      </Card>
    </Form>
  );
}
