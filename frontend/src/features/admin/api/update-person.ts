import type { UpdatePersonRequest, User } from '@kiln/shared';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiRequest } from '@/lib/api-client';
import { adminKeys } from './admin-keys';

/** `PATCH /api/admin/users/:id`: role, name or disabled (audited on the server). */
export const updatePerson = (id: string, change: UpdatePersonRequest) =>
  apiRequest<User>(`/admin/users/${id}`, { method: 'PATCH', body: change });

export function useUpdatePerson() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, change }: { id: string; change: UpdatePersonRequest }) => updatePerson(id, change),
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: adminKeys.people() }),
        // A role change moves a person onto another role's default quota.
        queryClient.invalidateQueries({ queryKey: adminKeys.quotas() }),
        queryClient.invalidateQueries({ queryKey: adminKeys.auditAll() }),
      ]),
  });
}
