import { RUN_SPEC_DEFAULTS, RUN_SPEC_LIMITS as L, type UploadInfo } from '@kiln/shared';
import { Alert, Card, Form, Radio, Select } from 'antd';
import { Link } from 'react-router-dom';
import { paths } from '@/config/paths';
import { formatDateTime, formatNumber } from '@/lib/format';
import { NumberField } from './number-field';
import { initialProfileUploads, targetProfileUploads, uploadRows, type FieldErrors, type SpecDraft } from './spec-draft';

type Patch = (patch: Partial<SpecDraft>) => void;

const FIELDS_SHOWN = new Set([
  'domain.kind', 'domain.dim', 'domain.boundaryAngle', 'target.kind', 'target.axisRatio', 'target.uploadId', 'flow', 'initial.kind', 'initial.uploadId',
  'initial.slope', 'initial.s', 'initial.amplitude', 'initial.mode', 'symmetry', 'grid.points', 'grid.maxPoints',
  'time.tMax', 'time.maxStep', 'time.tolerance', 'stop.tension', 'stop.gradientBound',
]);

/** The person's uploads of one kind as a select; an empty state that points to the Account page. */
function UploadSelect({
  label,
  uploads,
  uploadsError,
  value,
  onChange,
  error,
  emptyNote,
}: {
  label: string;
  /** Undefined while loading. */
  uploads: UploadInfo[] | undefined;
  uploadsError: unknown;
  value: string | null;
  onChange: (id: string) => void;
  error: string | undefined;
  /** Said after "No uploads yet" when the person has none that fit. */
  emptyNote?: string;
}) {
  if (uploadsError) {
    return (
      <Form.Item label={label} validateStatus="error" help="Kiln could not list your uploads; reload the page to try again.">
        <Select disabled aria-label={label} style={{ width: 380 }} />
      </Form.Item>
    );
  }
  if (uploads && uploads.length === 0) {
    return (
      <Form.Item label={label} validateStatus={error ? 'error' : undefined} help={error}>
        <p className="muted spec-form__empty-uploads">
          No uploads yet — upload a profile on your <Link to={paths.account.getHref()}>Account page</Link>
          {emptyNote ? ` (${emptyNote})` : ''}.
        </p>
      </Form.Item>
    );
  }
  return (
    <Form.Item label={label} validateStatus={error ? 'error' : undefined} help={error}>
      <Select
        aria-label={label}
        loading={!uploads}
        // An upload that no longer fits (another domain) is not shown as a raw id; the error under the field says why.
        value={value !== null && uploads?.some((u) => u.id === value) ? value : undefined}
        placeholder={uploads ? 'Choose an upload' : 'Loading your uploads…'}
        onChange={onChange}
        style={{ width: 380 }}
        options={(uploads ?? []).map((u) => {
          const rows = uploadRows(u);
          return { value: u.id, label: `${u.filename}${rows !== null ? ` · ${rows} rows` : ''} · ${formatDateTime(u.createdAt)}` };
        })}
      />
    </Form.Item>
  );
}

/** The base spec of a sweep (numerics.md §5), field by field, with units, ranges and the schema's messages. */
export function SpecForm({
  draft,
  onChange,
  errors,
  uploads,
  uploadsError,
}: {
  draft: SpecDraft;
  onChange: Patch;
  errors: FieldErrors;
  /** The person's uploads (`GET /api/uploads`); undefined while loading. */
  uploads: UploadInfo[] | undefined;
  uploadsError: unknown;
}) {
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
                { value: 'profile', label: 'Profile (uploaded)' },
              ]}
              optionType="button"
            />
          </Form.Item>
          {draft.targetKind === 'ellipsoid' ? (
            <NumberField label="Axis ratio b" value={draft.axisRatio} onChange={(axisRatio) => onChange({ axisRatio })} hint={`${L.axisRatioMin} – ${L.axisRatioMax}`} error={errors['target.axisRatio']} />
          ) : null}
          {draft.targetKind === 'profile' ? (
            <UploadSelect
              label="Target profile"
              uploads={uploads && targetProfileUploads(uploads)}
              uploadsError={uploadsError}
              value={draft.targetUploadId}
              onChange={(targetUploadId) => onChange({ targetUploadId })}
              error={errors['target.uploadId']}
              emptyNote="a target profile, CSV h,f,z"
            />
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
              aria-label="Initial data h₀"
              value={draft.initialKind}
              onChange={(initialKind) => onChange({ initialKind })}
              style={{ width: 230 }}
              options={[
                { value: 'identity', label: ball ? 'Identity  h₀ = α·r' : 'Identity  h₀ = r' },
                { value: 'linear', label: 'Linear  h₀ = slope·r (ball)' },
                { value: 'dilated', label: 'Dilated  h₀ = γₛ(r) (sphere)' },
                { value: 'perturbed', label: 'Perturbed  + A·sin(k·r)' },
                { value: 'table', label: 'Table (uploaded)' },
              ]}
            />
          </Form.Item>
          {draft.initialKind === 'table' ? (
            <UploadSelect
              label={`Initial profile for the ${ball ? 'ball' : 'sphere'}`}
              uploads={uploads && initialProfileUploads(uploads, draft.domainKind)}
              uploadsError={uploadsError}
              value={draft.initialUploadId}
              onChange={(initialUploadId) => onChange({ initialUploadId })}
              error={errors['initial.uploadId']}
              emptyNote={`an initial profile, CSV r,h with r from 0 to ${ball ? '1' : 'π'}`}
            />
          ) : null}
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
