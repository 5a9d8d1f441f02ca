import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { invitationsQueryKey } from './get-invitations';

/** Revokes a pending invitation, so its link stops working. */
export function revokeInvitation(input: { studioId: string; invitationId: string }): Promise<void> {
  return api.delete(
    `/api/studios/${encodeURIComponent(input.studioId)}/invitations/${encodeURIComponent(input.invitationId)}`,
  );
}

export function useRevokeInvitation(studioId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: revokeInvitation,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: invitationsQueryKey(studioId) }),
  });
}
