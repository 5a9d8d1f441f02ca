import { queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { roleSchema } from '../../../../shared/schemas/roles';
import { api } from '../../../lib/api-client';

export const invitationPreviewSchema = z.object({
  studioName: z.string(),
  email: z.string(),
  roles: z.array(roleSchema),
  existingUser: z.boolean(),
});
export type InvitationPreview = z.infer<typeof invitationPreviewSchema>;

/** What an invitation link offers: the studio, the invited e-mail, the roles, and whether the account exists. */
export function getInvitation(token: string): Promise<InvitationPreview> {
  return api.get(`/api/invitations/${encodeURIComponent(token)}`, invitationPreviewSchema);
}

export function getInvitationQueryOptions(token: string) {
  return queryOptions({ queryKey: ['invitation', token], queryFn: () => getInvitation(token) });
}

export function useInvitation(token: string) {
  return useQuery(getInvitationQueryOptions(token));
}
