import { useMutation, useQueryClient } from '@tanstack/react-query';
import { meResponse } from '../../../../shared/schemas/api';
import type { Me } from '../../../../shared/schemas/api';
import { api, refreshCsrfToken } from '../../../lib/api-client';
import { replaceSession } from './session-cache';

export interface AcceptInvitationInput {
  token: string;
  name?: string;
  password?: string;
}

/** Accepts an invitation; the server signs the person in, so the CSRF token is fetched again. */
export async function acceptInvitation({ token, ...body }: AcceptInvitationInput): Promise<Me> {
  const me = await api.post(`/api/invitations/${encodeURIComponent(token)}/accept`, body, meResponse);
  await refreshCsrfToken();
  return me;
}

export function useAcceptInvitation() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationKey: ['auth', 'accept-invitation'],
    mutationFn: acceptInvitation,
    onSuccess: (me) => {
      // The accepted invitation stays cached while its page is still mounted: fetching it again
      // would only answer 410 Gone.
      replaceSession(queryClient, me, ['dev', 'invitation']);
    },
  });
}
