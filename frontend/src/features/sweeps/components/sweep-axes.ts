import { axisValues, sweepAxesSchema, type SweepAxis } from '@kiln/shared';
import { FIELD_INFO } from './spec-draft';

/** The axes stored with a sweep, read back through the shared schema (unknown shapes give none). */
export function sweepAxesOf(axes: unknown): SweepAxis[] {
  const parsed = sweepAxesSchema.safeParse(axes);
  return parsed.success ? parsed.data : [];
}

export const axisLabel = (path: string) => FIELD_INFO[path as keyof typeof FIELD_INFO]?.label ?? path;

export const axisValuesOf = (axis: SweepAxis) => axisValues(axis);
