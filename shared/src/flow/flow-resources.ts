import type { RunSpec } from '../spec';
import type { InitialProfile, TargetProfile } from '../uploads/profile-csv';
import type { FlowModelOverrides } from './flow-model';
import type { GridParams } from './graded-grid';
import { remapMonotone } from './monotone-remap';
import { ProfileTarget } from './profile-target';
import type { TargetGeometry } from './target-geometry';

/**
 * Inputs a spec names but the engine cannot read itself (it does no I/O): the parsed
 * uploads behind `initial.kind = "table"` and `target.kind = "profile"` (the forms
 * `parseInitialProfileCsv` / `parseTargetProfileCsv` produce and the API stores).
 * Pass them to `createFlowRun(spec, resources)`. Only what the spec names is used.
 */
export interface FlowResources {
  /** The table behind `initial.uploadId`. */
  initialProfile?: InitialProfile;
  /** The table behind `target.uploadId`. */
  targetProfile?: TargetProfile;
  /**
   * A starting state instead of `spec.initial` (used by `forkFlowRun`): a whole-domain
   * profile, whether it is reflection-symmetric, a target geometry to reuse, and
   * optionally the exact grid to start on. Not for callers outside the engine.
   */
  start?: FlowStartState;
}

export interface FlowStartState {
  profile: { r: Float64Array; h: Float64Array };
  symmetric: boolean;
  target?: TargetGeometry;
  grid?: { params: GridParams; r: Float64Array };
}

/** How far the end value of an uploaded ball profile may sit from `domain.boundaryAngle` (radians, relative to max(1, |α|)). */
export const TABLE_BOUNDARY_TOLERANCE = 1e-6;
/** How close h(π − r) + h(r) must be to π (relative to π) for a table to count as reflection-symmetric. */
export const TABLE_SYMMETRY_TOLERANCE = 1e-9;

/** What createFlowRun needs beyond the spec: model overrides, and the profile to interpolate (if any). */
export interface ResolvedStart {
  overrides: FlowModelOverrides;
  profile: { r: Float64Array; h: Float64Array } | null;
  grid: { params: GridParams; r: Float64Array } | null;
}

/**
 * Checks the resources against the spec and says how the run starts. Throws an
 * error naming the mismatch: a missing upload, a table for the other domain, a
 * ball table whose end value is not the boundary angle.
 */
export function resolveStart(spec: RunSpec, resources: FlowResources): ResolvedStart {
  const overrides: FlowModelOverrides = {};
  if (resources.start?.target) {
    overrides.target = resources.start.target;
  } else if (spec.target.kind === 'profile') {
    if (!resources.targetProfile) {
      throw new Error(
        `target.kind "profile" needs the uploaded target profile ${spec.target.uploadId}: pass it as createFlowRun(spec, { targetProfile })`,
      );
    }
    overrides.target = ProfileTarget.fromTable(resources.targetProfile);
  }
  if (resources.start) {
    overrides.initialSymmetric = resources.start.symmetric;
    return { overrides, profile: resources.start.profile, grid: resources.start.grid ?? null };
  }
  if (spec.initial.kind !== 'table') return { overrides, profile: null, grid: null };
  const table = resources.initialProfile;
  if (!table) {
    throw new Error(
      `initial.kind "table" needs the uploaded initial profile ${spec.initial.uploadId}: pass it as createFlowRun(spec, { initialProfile })`,
    );
  }
  const profile = checkedTable(spec, table);
  if (spec.domain.kind === 'sphere') overrides.initialSymmetric = isReflectionSymmetric(profile);
  return { overrides, profile, grid: null };
}

/** The table as typed arrays with exact end abscissae, after checking it fits the spec's domain. */
function checkedTable(spec: RunSpec, table: InitialProfile): { r: Float64Array; h: Float64Array } {
  const domain = spec.domain;
  const where = (d: 'sphere' | 'ball') => (d === 'sphere' ? 'the sphere (r from 0 to π)' : 'the ball (r from 0 to 1)');
  if (table.domain !== domain.kind) {
    throw new Error(`the initial profile spans ${where(table.domain)}, but domain.kind is "${domain.kind}"`);
  }
  const n = table.r.length;
  if (n < 3 || table.h.length !== n) throw new Error('the initial profile needs columns r and h of equal length, at least 3 rows');
  const length = domain.kind === 'ball' ? 1 : Math.PI;
  const r = Float64Array.from(table.r);
  const h = Float64Array.from(table.h);
  for (let i = 0; i < n; i++) {
    if (!(Number.isFinite(r[i]!) && Number.isFinite(h[i]!))) throw new Error(`the initial profile has a non-finite value in row ${i + 1}`);
    if (i > 0 && !(r[i]! > r[i - 1]!)) throw new Error(`the initial profile's r must increase strictly (row ${i + 1})`);
  }
  if (Math.abs(r[0]!) > 1e-9 || Math.abs(r[n - 1]! - length) > 1e-9 * length) {
    throw new Error(`the initial profile's r must run from 0 to ${domain.kind === 'ball' ? '1' : 'π'} (found ${r[0]} to ${r[n - 1]})`);
  }
  if (Math.abs(h[0]!) > TABLE_BOUNDARY_TOLERANCE) throw new Error(`the initial profile must have h(0) = 0 (found ${h[0]})`);
  const end = domain.kind === 'ball' ? domain.boundaryAngle : Math.PI;
  if (Math.abs(h[n - 1]! - end) > TABLE_BOUNDARY_TOLERANCE * Math.max(1, Math.abs(end))) {
    throw new Error(
      domain.kind === 'ball'
        ? `the initial profile ends at h(1) = ${h[n - 1]}, but domain.boundaryAngle is ${end}: they must agree (within ${TABLE_BOUNDARY_TOLERANCE} relative)`
        : `the initial profile ends at h(π) = ${h[n - 1]}, but the sphere needs h(π) = π (degree one)`,
    );
  }
  r[0] = 0;
  r[n - 1] = length;
  h[0] = 0;
  h[n - 1] = end;
  return { r, h };
}

/** Whether h(π − r) = π − h(r) holds at the table's own abscissae (within {@link TABLE_SYMMETRY_TOLERANCE}). */
function isReflectionSymmetric(profile: { r: Float64Array; h: Float64Array }): boolean {
  const n = profile.r.length;
  const mirrored = new Float64Array(n);
  for (let i = 0; i < n; i++) mirrored[i] = Math.PI - profile.r[n - 1 - i]!;
  mirrored[0] = 0;
  mirrored[n - 1] = Math.PI;
  const values = new Float64Array(n);
  remapMonotone(profile.r, profile.h, mirrored, values);
  for (let i = 0; i < n; i++) {
    if (Math.abs(profile.h[n - 1 - i]! + values[i]! - Math.PI) > TABLE_SYMMETRY_TOLERANCE * Math.PI) return false;
  }
  return true;
}

/**
 * h on the grid r from a whole-domain profile: monotone piecewise-cubic (Steffen)
 * interpolation, which creates no new extrema and is exact for linear data (h ≈ c·r
 * at a pole). The grid may end before the profile (π/2 under reflection symmetry);
 * the caller imposes the end values.
 */
export function interpolateProfile(profile: { r: Float64Array; h: Float64Array }, r: Float64Array, h: Float64Array): void {
  remapMonotone(profile.r, profile.h, r, h);
}
