import type { User } from '@kiln/shared';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';

export const authKeys = {
  all: ['auth'] as const,
  me: () => [...authKeys.all, 'me'] as const,
};

/** `GET /api/auth/me`: the signed-in user with their role. */
export const getMe = (signal?: AbortSignal) => api.get<User>('/auth/me', signal);

export const meQueryOptions = () =>
  queryOptions({
    queryKey: authKeys.me(),
    queryFn: ({ signal }) => getMe(signal),
    // Name and role change rarely; a 401 on any request ends the session anyway.
    staleTime: 5 * 60_000,
  });

export const useMe = (options: { enabled?: boolean } = {}) =>
  useQuery({ ...meQueryOptions(), enabled: options.enabled ?? true });
