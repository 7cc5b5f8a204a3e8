import type { NotificationSettings } from '@kiln/shared';
import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { apiRequest, api } from '@/lib/api-client';
import { accountKeys } from './account-keys';

/** `GET /api/me/notifications`: which e-mails the signed-in person wants. */
export const getNotificationSettings = (signal?: AbortSignal) => api.get<NotificationSettings>('/me/notifications', signal);

export const notificationSettingsQueryOptions = () =>
  queryOptions({ queryKey: accountKeys.notifications(), queryFn: ({ signal }) => getNotificationSettings(signal), staleTime: 60_000 });

export const useNotificationSettings = () => useQuery(notificationSettingsQueryOptions());

/** `PUT /api/me/notifications` with the switches that changed. */
export const updateNotificationSettings = (change: Partial<NotificationSettings>) =>
  apiRequest<NotificationSettings>('/me/notifications', { method: 'PUT', body: change });

export function useUpdateNotificationSettings() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateNotificationSettings,
    onSuccess: (settings) => queryClient.setQueryData(accountKeys.notifications(), settings),
  });
}
