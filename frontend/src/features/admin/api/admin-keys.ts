import type { AuditQuery } from '@kiln/shared';

/**
 * Query keys of the lab admin's pages. People share the `users` key with the
 * Lab page's list, and workers the `workers` key with the overview's pool, so a
 * change made here refreshes those views too.
 */
export const adminKeys = {
  all: ['admin'] as const,
  quotas: () => [...adminKeys.all, 'quotas'] as const,
  usage: (months: number) => [...adminKeys.all, 'usage', months] as const,
  auditAll: () => [...adminKeys.all, 'audit'] as const,
  audit: (query: Partial<AuditQuery>) => [...adminKeys.auditAll(), query] as const,
  people: () => ['users', 'list'] as const,
  workers: () => ['workers', 'list'] as const,
};

/** The signed-in person's own quota, shown on the Overview: refreshed when an admin changes their own. */
export const ownQuotaKeys = {
  quota: () => ['quota', 'mine'] as const,
};
