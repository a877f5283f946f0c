import { queryOptions, useQuery } from '@tanstack/react-query';
import type { NotificationSettings } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { QueryConfig } from '@/lib/query-client';

export const getNotificationSettings = (): Promise<NotificationSettings> => api.get<NotificationSettings>('/users/me/notifications');

export const getNotificationSettingsQueryOptions = () =>
  queryOptions({ queryKey: ['users', 'me', 'notifications'], queryFn: getNotificationSettings });

export function useNotificationSettings({ queryConfig }: { queryConfig?: QueryConfig<typeof getNotificationSettingsQueryOptions> } = {}) {
  return useQuery({ ...getNotificationSettingsQueryOptions(), ...queryConfig });
}
