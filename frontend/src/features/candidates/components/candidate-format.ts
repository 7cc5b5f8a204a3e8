import { formatNumber } from '@/lib/format';

/** "1.234 ± 0.005": the value to a precision its uncertainty justifies (at least 3 figures), the uncertainty to 2. */
export function formatEstimate(value: number | null, uncertainty: number | null): string {
  if (value === null) return '—';
  if (uncertainty === null || !Number.isFinite(uncertainty)) return formatNumber(value, 4);
  const digits =
    uncertainty > 0 && value !== 0
      ? Math.min(8, Math.max(3, Math.ceil(Math.log10(Math.abs(value))) - Math.floor(Math.log10(uncertainty)) + 1))
      : 4;
  return `${formatNumber(value, digits)} ± ${formatNumber(uncertainty, 2)}`;
}

/** Confidence 0…1 as a percentage. */
export const formatConfidence = (confidence: number) => `${Math.round(confidence * 100)} %`;
