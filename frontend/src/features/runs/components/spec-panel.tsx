import type { RunSpec } from '@kiln/shared';
import { Card } from 'antd';
import { formatAngle, formatNumber } from '@/lib/format';

function initialText(spec: RunSpec): string {
  const i = spec.initial;
  switch (i.kind) {
    case 'identity':
      return spec.domain.kind === 'ball' ? 'identity, h₀ = α·r' : 'identity, h₀ = r';
    case 'linear':
      return `linear, slope ${formatNumber(i.slope, 4)}`;
    case 'dilated':
      return `dilated, s = ${formatNumber(i.s, 4)}`;
    case 'perturbed':
      return `perturbed, A = ${formatNumber(i.amplitude, 3)}, k = ${i.mode}`;
    case 'table':
      return `table ${i.uploadId}`;
  }
}

const SUPERSCRIPT = '⁰¹²³⁴⁵⁶⁷⁸⁹';
const sup = (n: number) => String(n).replace(/\d/g, (d) => SUPERSCRIPT[Number(d)]!);

/** The run's spec (normalized, defaults filled) in words and numbers. */
export function SpecPanel({ spec }: { spec: RunSpec }) {
  const d = spec.domain;
  const t = spec.target;
  return (
    <Card title="Spec" className="panel" size="small">
      <dl className="facts facts--two">
        <dt>Domain</dt>
        <dd>{d.kind === 'ball' ? `ball B${sup(d.dim)}, boundary angle α = ${formatAngle(d.boundaryAngle)}` : `sphere S${sup(d.dim)}`}</dd>
        <dt>Target</dt>
        <dd>{t.kind === 'ellipsoid' ? `ellipsoid, axis ratio b = ${formatNumber(t.axisRatio, 4)}` : t.kind === 'sphere' ? 'round sphere' : `profile ${t.uploadId}`}</dd>
        <dt>Flow</dt>
        <dd>{spec.flow === 'normalized' ? 'Möbius-normalized' : 'standard'}</dd>
        <dt>Initial data</dt>
        <dd>{initialText(spec)}</dd>
        <dt>Symmetry</dt>
        <dd>{spec.symmetry}</dd>
        <dt>Grid</dt>
        <dd>
          {spec.grid.points} points, refinement up to {spec.grid.maxPoints}
        </dd>
        <dt>Time</dt>
        <dd>
          t_max {formatNumber(spec.time.tMax)}, largest step {formatNumber(spec.time.maxStep)}, tolerance {formatNumber(spec.time.tolerance)}
        </dd>
        <dt>Stops at</dt>
        <dd>
          ‖τ‖ &lt; {formatNumber(spec.stop.tension)} (converged) or max|∇u| &gt; {formatNumber(spec.stop.gradientBound)} (blow-up)
        </dd>
      </dl>
    </Card>
  );
}
