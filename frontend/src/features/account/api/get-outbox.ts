import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { accountKeys } from './account-keys';

/** One message as the local SMTP sink received it. */
export interface OutboxMessage {
  id: string;
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  raw: string;
}

/** `GET /api/admin/mail` (lab admins, local mode only; 404 when Kiln sends real mail). */
export const getOutbox = (signal?: AbortSignal) => api.get<OutboxMessage[]>('/admin/mail', signal);

export const outboxQueryOptions = () =>
  queryOptions({
    queryKey: [...accountKeys.all, 'outbox'] as const,
    queryFn: ({ signal }) => getOutbox(signal),
    staleTime: 2_000,
    refetchInterval: 5_000,
    retry: false,
  });

export const useOutbox = (enabled: boolean) => useQuery({ ...outboxQueryOptions(), enabled });
