import type { User } from '@kiln/shared';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { adminKeys } from './admin-keys';

/** `GET /api/users` (lab admins): everyone with an account. */
export const getPeople = (signal?: AbortSignal) => api.get<User[]>('/users', signal);

export const peopleQueryOptions = () =>
  queryOptions({
    queryKey: adminKeys.people(),
    queryFn: ({ signal }) => getPeople(signal),
    staleTime: 60_000,
  });

export const usePeople = (options: { enabled?: boolean } = {}) =>
  useQuery({ ...peopleQueryOptions(), enabled: options.enabled ?? true });
