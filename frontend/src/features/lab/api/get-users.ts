import type { User } from '@kiln/shared';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';

export const userKeys = {
  all: ['users'] as const,
  list: () => [...userKeys.all, 'list'] as const,
};

/** `GET /api/users` (lab admins only): everyone with an account. */
export const getUsers = (signal?: AbortSignal) => api.get<User[]>('/users', signal);

export const usersQueryOptions = () =>
  queryOptions({
    queryKey: userKeys.list(),
    queryFn: ({ signal }) => getUsers(signal),
    staleTime: 60_000,
  });

export const useUsers = (options: { enabled?: boolean } = {}) =>
  useQuery({ ...usersQueryOptions(), enabled: options.enabled ?? true });
