import { queryOptions, useQuery } from '@tanstack/react-query';
import { notificationSettingsSchema } from '../../../../shared/schemas/notifications';
import type { NotificationSettings } from '../../../../shared/schemas/notifications';
import { api } from '../../../lib/api-client';

export const notificationSettingsQueryKey = ['me', 'notifications'] as const;

/** Which kinds of mail the signed-in user receives (every kind, on unless turned off). */
export function getNotificationSettings(): Promise<NotificationSettings> {
  return api.get('/api/me/notifications', notificationSettingsSchema);
}

export function getNotificationSettingsQueryOptions() {
  return queryOptions({ queryKey: notificationSettingsQueryKey, queryFn: getNotificationSettings });
}

export function useNotificationSettings() {
  return useQuery(getNotificationSettingsQueryOptions());
}
