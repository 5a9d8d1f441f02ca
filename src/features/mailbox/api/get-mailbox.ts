import { queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { mailMessageSchema } from '../../../../shared/schemas/api';
import { ApiRequestError, api } from '../../../lib/api-client';

export const mailboxSchema = z.object({ enabled: z.boolean(), messages: z.array(mailMessageSchema) });
export type Mailbox = z.infer<typeof mailboxSchema>;

/** The mails captured by the local mail fake; `enabled: false` when real mail is in use (the route answers 404). */
export async function getMailbox(): Promise<Mailbox> {
  try {
    return await api.get('/api/dev/mailbox', mailboxSchema);
  } catch (error) {
    if (error instanceof ApiRequestError && error.status === 404) return { enabled: false, messages: [] };
    throw error;
  }
}

export function getMailboxQueryOptions() {
  return queryOptions({ queryKey: ['dev', 'mailbox'], queryFn: getMailbox });
}

export function useMailbox(options: { refetchInterval_ms?: number } = {}) {
  return useQuery({ ...getMailboxQueryOptions(), refetchInterval: options.refetchInterval_ms ?? false });
}
