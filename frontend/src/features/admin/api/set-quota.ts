import type { Quota, QuotaView } from '@kiln/shared';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiRequest } from '@/lib/api-client';
import { adminKeys, ownQuotaKeys } from './admin-keys';

/** `PUT /api/admin/quotas/:userId`: sets one person's quota (audited on the server). */
export const setQuota = (userId: string, quota: Quota) =>
  apiRequest<QuotaView>(`/admin/quotas/${userId}`, { method: 'PUT', body: quota });

export function useSetQuota() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ userId, quota }: { userId: string; quota: Quota }) => setQuota(userId, quota),
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: adminKeys.quotas() }),
        queryClient.invalidateQueries({ queryKey: adminKeys.auditAll() }),
        queryClient.invalidateQueries({ queryKey: ownQuotaKeys.quota() }),
      ]),
  });
}
