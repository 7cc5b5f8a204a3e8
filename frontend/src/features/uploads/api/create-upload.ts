import type { ErrorCode, ErrorDetail, UploadInfo, UploadKind } from '@kiln/shared';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { ApiRequestError } from '@/lib/api-client';
import { endSession, getToken } from '@/lib/session';
import { uploadKeys } from './upload-keys';

/**
 * `POST /api/uploads` as multipart (`kind`, `file`). Sent with XMLHttpRequest
 * rather than fetch because only it reports upload progress, and a checkpoint can
 * be tens of megabytes.
 */
export function createUpload(kind: UploadKind, file: File, onProgress?: (fraction: number) => void): Promise<UploadInfo> {
  return new Promise((resolve, reject) => {
    const token = getToken();
    const body = new FormData();
    body.append('kind', kind);
    body.append('file', file, file.name);
    const request = new XMLHttpRequest();
    request.open('POST', '/api/uploads');
    request.setRequestHeader('Accept', 'application/json');
    if (token) request.setRequestHeader('Authorization', `Bearer ${token}`);
    request.upload.onprogress = (event) => {
      if (event.lengthComputable) onProgress?.(event.loaded / event.total);
    };
    request.onerror = () => reject(new ApiRequestError(0, 'network', "Kiln's server could not be reached."));
    request.onload = () => {
      let parsed: unknown;
      try {
        parsed = request.responseText ? JSON.parse(request.responseText) : undefined;
      } catch {
        parsed = undefined;
      }
      if (request.status >= 200 && request.status < 300) return resolve(parsed as UploadInfo);
      if (request.status === 401 && token) endSession('expired');
      const error = parsed as { error?: ErrorCode; message?: string; details?: ErrorDetail[] } | undefined;
      if (error?.error && error.message) return reject(new ApiRequestError(request.status, error.error, error.message, error.details ?? [], parsed));
      reject(new ApiRequestError(request.status, 'bad_response', `The server answered ${request.status}.`));
    };
    request.send(body);
  });
}

export function useCreateUpload() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ kind, file, onProgress }: { kind: UploadKind; file: File; onProgress?: (fraction: number) => void }) => createUpload(kind, file, onProgress),
    onSuccess: () => void queryClient.invalidateQueries({ queryKey: uploadKeys.all }),
  });
}
