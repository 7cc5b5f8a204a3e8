import type { UploadInfo } from '@kiln/shared';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { uploadKeys } from './upload-keys';

/** `GET /api/uploads`: the caller's uploads, newest first. */
export const getUploads = (signal?: AbortSignal) => api.get<UploadInfo[]>('/uploads', signal);

export const uploadsQueryOptions = () => queryOptions({ queryKey: uploadKeys.list(), queryFn: ({ signal }) => getUploads(signal), staleTime: 30_000 });

export const useUploads = () => useQuery(uploadsQueryOptions());
