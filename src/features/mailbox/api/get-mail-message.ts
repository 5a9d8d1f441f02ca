import { queryOptions, useQuery } from '@tanstack/react-query';
import { mailMessageSchema } from '../../../../shared/schemas/api';
import { api } from '../../../lib/api-client';

/** One captured mail in full; the page shows its text part only, never its HTML (so no mail markup runs in the app). */
export function getMailMessage(id: string) {
  return api.get(`/api/dev/mailbox/${encodeURIComponent(id)}`, mailMessageSchema);
}

export function getMailMessageQueryOptions(id: string) {
  return queryOptions({ queryKey: ['dev', 'mailbox', id], queryFn: () => getMailMessage(id) });
}

export function useMailMessage(id: string | null) {
  return useQuery({ ...getMailMessageQueryOptions(id ?? ''), enabled: id !== null });
}
