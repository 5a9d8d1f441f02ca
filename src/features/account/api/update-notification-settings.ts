import { useMutation, useQueryClient } from '@tanstack/react-query';
import { notificationSettingsSchema } from '../../../../shared/schemas/notifications';
import type { MailKind, NotificationSettings } from '../../../../shared/schemas/notifications';
import { api } from '../../../lib/api-client';
import { notificationSettingsQueryKey } from './get-notification-settings';

/** Turns one kind of mail on or off; answers the whole settings as now stored. */
export function updateNotificationSetting({
  kind,
  enabled,
}: {
  kind: MailKind;
  enabled: boolean;
}): Promise<NotificationSettings> {
  return api.put('/api/me/notifications', { kinds: [{ kind, enabled }] }, notificationSettingsSchema);
}

export function useUpdateNotificationSetting() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateNotificationSetting,
    onSuccess: (settings) => queryClient.setQueryData(notificationSettingsQueryKey, settings),
  });
}
