import { axisValues, sweepAxesSchema, type SweepAxis } from '@kiln/shared';
import { formatNumber } from '@/lib/format';
import { FIELD_INFO } from './spec-draft';

/** The axes stored with a sweep, read back through the shared schema (unknown shapes give none). */
export function sweepAxesOf(axes: unknown): SweepAxis[] {
  const parsed = sweepAxesSchema.safeParse(axes);
  return parsed.success ? parsed.data : [];
}

export const axisLabel = (path: string) => FIELD_INFO[path as keyof typeof FIELD_INFO]?.label ?? path;

export const axisValuesOf = (axis: SweepAxis) => axisValues(axis);

/** An axis value as a person reads it: angles as multiples of π. */
export const formatAxisValue = (path: string, value: number | undefined) =>
  value === undefined ? '—' : path === 'domain.boundaryAngle' ? `${formatNumber(value / Math.PI, 4)}π` : formatNumber(value, 4);
