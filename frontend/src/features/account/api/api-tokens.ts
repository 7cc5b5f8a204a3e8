import type { ApiTokenInfo } from '@kiln/shared';
import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api, apiRequest } from '@/lib/api-client';
import { accountKeys } from './account-keys';

/** A new token: the secret is in this answer only. */
export type CreatedApiToken = ApiTokenInfo & { token: string };

/** `GET /api/tokens`: the caller's tokens, never their secrets. */
export const getApiTokens = (signal?: AbortSignal) => api.get<ApiTokenInfo[]>('/tokens', signal);

export const apiTokensQueryOptions = () =>
  queryOptions({ queryKey: accountKeys.tokens(), queryFn: ({ signal }) => getApiTokens(signal), staleTime: 30_000 });

export const useApiTokens = () => useQuery(apiTokensQueryOptions());

/** `POST /api/tokens {name}`. */
export const createApiToken = (name: string) => api.post<CreatedApiToken>('/tokens', { name });

/** `DELETE /api/tokens/:id`: stops working at once. */
export const revokeApiToken = (tokenId: string) => apiRequest<void>(`/tokens/${tokenId}`, { method: 'DELETE' });

export function useCreateApiToken() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: createApiToken, onSuccess: () => void queryClient.invalidateQueries({ queryKey: accountKeys.tokens() }) });
}

export function useRevokeApiToken() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: revokeApiToken, onSuccess: () => void queryClient.invalidateQueries({ queryKey: accountKeys.tokens() }) });
}
