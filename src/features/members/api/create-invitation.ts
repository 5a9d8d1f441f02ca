import { useMutation, useQueryClient } from '@tanstack/react-query';
import { invitationSchema } from '../../../../shared/schemas/api';
import type { Invitation } from '../../../../shared/schemas/api';
import type { Role } from '../../../../shared/schemas/roles';
import { api } from '../../../lib/api-client';
import { invitationsQueryKey } from './get-invitations';

export interface CreateInvitationInput {
  studioId: string;
  email: string;
  roles: Role[];
  venueIds: string[];
}

/** Invites an e-mail address into the studio with the given roles; the server sends the link. */
export function createInvitation({ studioId, ...body }: CreateInvitationInput): Promise<Invitation> {
  return api.post(`/api/studios/${encodeURIComponent(studioId)}/invitations`, body, invitationSchema);
}

export function useCreateInvitation(studioId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createInvitation,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: invitationsQueryKey(studioId) }),
  });
}
