import type { SweepPreviewRequest, SweepPreviewResponse } from '@kiln/shared';
import { keepPreviousData, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { sweepKeys } from './sweep-keys';

/** `POST /api/sweeps/preview`: run count and estimated CPU-hours against the quota; writes nothing. */
export const previewSweep = (body: SweepPreviewRequest, signal?: AbortSignal) =>
  api.post<SweepPreviewResponse>('/sweeps/preview', body, signal);

/** The preview of a (debounced, locally valid) sweep; null while the form has errors. */
export const useSweepPreview = (body: SweepPreviewRequest | null) =>
  useQuery({
    queryKey: sweepKeys.preview(body),
    queryFn: ({ signal }) => previewSweep(body!, signal),
    enabled: body !== null,
    staleTime: 30_000,
    placeholderData: keepPreviousData,
  });
