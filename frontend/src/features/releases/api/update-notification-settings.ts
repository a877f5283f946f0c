import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { NotificationSettings } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';
import { getNotificationSettingsQueryOptions } from './get-notification-settings';

export const updateNotificationSettings = (settings: NotificationSettings): Promise<NotificationSettings> =>
  api.put<NotificationSettings>('/users/me/notifications', settings);

export function useUpdateNotificationSettings({
  mutationConfig,
}: { mutationConfig?: MutationConfig<typeof updateNotificationSettings> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: updateNotificationSettings,
    onSuccess: (...args) => {
      // The server's answer is what is stored now.
      queryClient.setQueryData(getNotificationSettingsQueryOptions().queryKey, args[0]);
      return onSuccess?.(...args);
    },
  });
}
