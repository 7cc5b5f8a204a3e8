import type { AuditEntry, AuditQuery, Page } from '@kiln/shared';
import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api, toQueryString } from '@/lib/api-client';
import { adminKeys } from './admin-keys';

export type AuditSearch = Partial<AuditQuery>;

/** `GET /api/admin/audit` (lab admins): the audit log, newest first. */
export const getAuditLog = (query: AuditSearch, signal?: AbortSignal) =>
  api.get<Page<AuditEntry>>(`/admin/audit${toQueryString(query)}`, signal);

export const auditLogQueryOptions = (query: AuditSearch) =>
  queryOptions({
    queryKey: adminKeys.audit(query),
    queryFn: ({ signal }) => getAuditLog(query, signal),
    staleTime: 15_000,
    // Keep the current page on screen while the next one loads.
    placeholderData: keepPreviousData,
  });

export const useAuditLog = (query: AuditSearch) => useQuery(auditLogQueryOptions(query));
