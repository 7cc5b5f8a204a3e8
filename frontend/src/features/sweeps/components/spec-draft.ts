import {
  RUN_SPEC_DEFAULTS,
  type UploadInfo,
  RUN_SPEC_LIMITS as L,
  safeParseRunSpec,
  sweepAxesSchema,
  SWEEPABLE_PATHS,
  type SweepablePath,
  type SweepAxis,
} from '@kiln/shared';

/**
 * The sweep builder's base spec as the form holds it: every number may be empty
 * (null) while a person types. `toSpecInput` turns it into what the API receives,
 * and the shared run-spec schema judges it, so the browser shows the API's messages.
 */
export interface SpecDraft {
  domainKind: 'sphere' | 'ball';
  dim: number | null;
  /** Boundary angle α on the ball, in radians. */
  boundaryAngle: number | null;
  targetKind: 'sphere' | 'ellipsoid' | 'profile';
  axisRatio: number | null;
  /** The person's `target-profile` upload behind `target.kind = profile`; null until one is chosen. */
  targetUploadId: string | null;
  flow: 'standard' | 'normalized';
  initialKind: 'identity' | 'linear' | 'dilated' | 'perturbed' | 'table';
  /** The person's `initial-profile` upload behind `initial.kind = table`; null until one is chosen. */
  initialUploadId: string | null;
  slope: number | null;
  s: number | null;
  amplitude: number | null;
  mode: number | null;
  symmetry: 'auto' | 'reflection' | 'none';
  points: number | null;
  /** Empty: the default refinement cap. */
  maxPoints: number | null;
  tMax: number | null;
  /** Empty: 1 % of t_max. */
  maxStep: number | null;
  /** Empty: the default tolerance. */
  tolerance: number | null;
  tension: number | null;
  gradientBound: number | null;
}

export const DEFAULT_SPEC_DRAFT: SpecDraft = {
  domainKind: 'sphere',
  dim: 3,
  boundaryAngle: 0.9 * Math.PI,
  targetKind: 'ellipsoid',
  axisRatio: 2.5,
  targetUploadId: null,
  flow: 'standard',
  initialKind: 'identity',
  initialUploadId: null,
  slope: 2,
  s: 1,
  amplitude: 0.1,
  mode: 2,
  symmetry: 'auto',
  points: 200,
  maxPoints: null,
  tMax: 50,
  maxStep: null,
  tolerance: RUN_SPEC_DEFAULTS.tolerance,
  tension: RUN_SPEC_DEFAULTS.tension,
  gradientBound: RUN_SPEC_DEFAULTS.gradientBound,
};

const num = (value: number | null) => (value === null ? undefined : value);

/** The draft as a run spec object (optional fields left out when empty). */
export function toSpecInput(draft: SpecDraft): Record<string, unknown> {
  const domain =
    draft.domainKind === 'ball'
      ? { kind: 'ball', dim: num(draft.dim), boundaryAngle: num(draft.boundaryAngle) }
      : { kind: 'sphere', dim: num(draft.dim) };
  const target =
    draft.targetKind === 'ellipsoid'
      ? { kind: 'ellipsoid', axisRatio: num(draft.axisRatio) }
      : draft.targetKind === 'profile'
        ? { kind: 'profile', uploadId: draft.targetUploadId ?? undefined }
        : { kind: 'sphere' };
  let initial: Record<string, unknown>;
  switch (draft.initialKind) {
    case 'identity':
      initial = { kind: 'identity' };
      break;
    case 'linear':
      initial = { kind: 'linear', slope: num(draft.slope) };
      break;
    case 'dilated':
      initial = { kind: 'dilated', s: num(draft.s) };
      break;
    case 'perturbed':
      initial = { kind: 'perturbed', amplitude: num(draft.amplitude), mode: num(draft.mode) };
      break;
    case 'table':
      initial = { kind: 'table', uploadId: draft.initialUploadId ?? undefined };
      break;
  }
  const grid: Record<string, unknown> = { points: num(draft.points) };
  if (draft.maxPoints !== null) grid.maxPoints = draft.maxPoints;
  const time: Record<string, unknown> = { tMax: num(draft.tMax) };
  if (draft.maxStep !== null) time.maxStep = draft.maxStep;
  if (draft.tolerance !== null) time.tolerance = draft.tolerance;
  const stop: Record<string, unknown> = {};
  if (draft.tension !== null) stop.tension = draft.tension;
  if (draft.gradientBound !== null) stop.gradientBound = draft.gradientBound;
  return { domain, target, flow: draft.flow, initial, symmetry: draft.symmetry, grid, time, stop };
}

/** Field path → the schema's message for it ('(spec)' for spec-wide ones). */
export type FieldErrors = Record<string, string>;

/**
 * The schema's messages, plus what only the browser knows: whether the chosen
 * uploads are still the person's and fit the domain (the API checks again and
 * answers 400 naming `target.uploadId` or `initial.uploadId`).
 * `uploads` is undefined while the list is loading.
 */
export function validateSpecDraft(draft: SpecDraft, uploads?: UploadInfo[]): FieldErrors {
  const result = safeParseRunSpec(toSpecInput(draft));
  const errors: FieldErrors = {};
  if (!result.success) for (const issue of result.issues) errors[issue.path] ??= issue.message;
  if (draft.targetKind === 'profile') {
    if (draft.targetUploadId === null) errors['target.uploadId'] = 'choose one of your uploaded target profiles';
    else if (uploads && !targetProfileUploads(uploads).some((u) => u.id === draft.targetUploadId)) {
      errors['target.uploadId'] = 'that upload is not one of your target profiles';
    }
  }
  if (draft.initialKind === 'table') {
    if (draft.initialUploadId === null) errors['initial.uploadId'] = `choose one of your uploaded initial profiles for the ${draft.domainKind}`;
    else if (uploads && !initialProfileUploads(uploads, draft.domainKind).some((u) => u.id === draft.initialUploadId)) {
      errors['initial.uploadId'] = `that upload is not one of your initial profiles for the ${draft.domainKind}`;
    }
  }
  return errors;
}

/** The person's target-profile uploads (CSV h,f,z), newest first as the API lists them. */
export const targetProfileUploads = (uploads: UploadInfo[]) => uploads.filter((u) => u.kind === 'target-profile');

/** The person's initial-profile uploads (CSV r,h) whose table spans the given domain. */
export const initialProfileUploads = (uploads: UploadInfo[], domain: 'sphere' | 'ball') =>
  uploads.filter((u) => u.kind === 'initial-profile' && u.summary.domain === domain);

/** Number of data rows the upload's check counted, if it says. */
export const uploadRows = (upload: UploadInfo): number | null => (typeof upload.summary.rows === 'number' ? upload.summary.rows : null);

// ---------- axes ----------

export interface AxisDraft {
  key: number;
  path: SweepablePath;
  mode: 'values' | 'range';
  /** Numbers separated by commas or spaces; `0.8π` or `0.8pi` means 0.8·π. */
  valuesText: string;
  from: number | null;
  to: number | null;
  steps: number | null;
  scale: 'linear' | 'log';
}

/** Parses "1, 2.5 3e-2 0.8π" into numbers; the first token that is not a number is reported. */
export function parseValues(text: string): { values: number[]; bad: string | null } {
  const values: number[] = [];
  for (const token of text.split(/[\s,;]+/).filter(Boolean)) {
    const pi = /^([+-]?(?:\d+\.?\d*|\.\d+)(?:e[+-]?\d+)?)?\s*(π|pi)$/i.exec(token);
    const value = pi ? (pi[1] === undefined ? 1 : Number(pi[1])) * Math.PI : Number(token);
    if (!Number.isFinite(value) || token === '') return { values, bad: token };
    values.push(value);
  }
  return { values, bad: null };
}

export function toAxis(draft: AxisDraft): Record<string, unknown> {
  if (draft.mode === 'values') return { path: draft.path, values: parseValues(draft.valuesText).values };
  return { path: draft.path, range: { from: num(draft.from), to: num(draft.to), steps: num(draft.steps), scale: draft.scale } };
}

/** Axis index → field ('values', 'from', 'to', 'steps', 'path', '') → message. */
export type AxisErrors = Record<number, Record<string, string>>;

export function validateAxes(drafts: AxisDraft[]): { errors: AxisErrors; general: string | null; axes: SweepAxis[] | null } {
  const errors: AxisErrors = {};
  drafts.forEach((draft, index) => {
    if (draft.mode === 'values') {
      const { bad } = parseValues(draft.valuesText);
      if (bad !== null) (errors[index] ??= {}).values = `"${bad}" is not a number (write numbers like 2.5, 1e-3 or 0.8π)`;
    }
  });
  const result = sweepAxesSchema.safeParse(drafts.map(toAxis));
  let general: string | null = null;
  if (!result.success) {
    for (const issue of result.error.issues) {
      const [index, section, field] = issue.path;
      if (typeof index === 'number') {
        const key = section === 'range' ? String(field ?? 'from') : section === 'values' ? 'values' : String(section ?? '');
        (errors[index] ??= {})[key] ??= issue.message;
      } else {
        general ??= issue.message;
      }
    }
  }
  const ok = result.success && Object.keys(errors).length === 0;
  return { errors, general, axes: ok ? result.data : null };
}

/** Units and allowed ranges of the sweepable fields, for labels and hints. */
export const FIELD_INFO: Record<SweepablePath, { label: string; unit?: string; range: string }> = {
  'domain.dim': { label: 'Dimension m', range: `integer ${L.dimMin} – ${L.dimMax}` },
  'domain.boundaryAngle': { label: 'Boundary angle α', unit: 'rad', range: `|α| ≤ 4π` },
  'target.axisRatio': { label: 'Axis ratio b', range: `${L.axisRatioMin} – ${L.axisRatioMax}` },
  'initial.slope': { label: 'Slope', range: `|slope| ≤ ${L.slopeMax}` },
  'initial.s': { label: 'Dilation s', range: `${L.dilationMin} – ${L.dilationMax}` },
  'initial.amplitude': { label: 'Amplitude A', range: `|A| ≤ ${L.amplitudeMax}` },
  'initial.mode': { label: 'Mode k', range: `integer ${L.modeMin} – ${L.modeMax}` },
  'grid.points': { label: 'Grid points', range: `integer ${L.pointsMin} – ${L.pointsMax}` },
  'grid.maxPoints': { label: 'Refinement cap', range: `integer up to ${L.refinedPointsMax}` },
  'time.tMax': { label: 'End time t_max', range: `> 0, ≤ ${L.tMaxMax}` },
  'time.maxStep': { label: 'Largest step', range: '> 0, ≤ t_max' },
  'time.tolerance': { label: 'Tolerance', range: `${L.toleranceMin} – ${L.toleranceMax}` },
  'stop.tension': { label: 'Tension threshold', range: `${L.tensionMin} – ${L.tensionMax}` },
  'stop.gradientBound': { label: 'Gradient bound', range: `${L.gradientBoundMin} – ${L.gradientBoundMax}` },
};

export const SWEEPABLE_OPTIONS = SWEEPABLE_PATHS.map((path) => ({
  value: path,
  label: `${FIELD_INFO[path].label} (${path})`,
}));
