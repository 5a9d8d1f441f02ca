import { queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { invitationSchema } from '../../../../shared/schemas/api';
import type { Invitation } from '../../../../shared/schemas/api';
import { api } from '../../../lib/api-client';

export const invitationsQueryKey = (studioId: string) => ['studios', studioId, 'invitations'] as const;

/** The studio's invitations, accepted or not (studio admins only). */
export function getInvitations(studioId: string): Promise<Invitation[]> {
  return api.get(`/api/studios/${encodeURIComponent(studioId)}/invitations`, z.array(invitationSchema));
}

export function getInvitationsQueryOptions(studioId: string) {
  return queryOptions({ queryKey: invitationsQueryKey(studioId), queryFn: () => getInvitations(studioId) });
}

export function useInvitations(studioId: string) {
  return useQuery(getInvitationsQueryOptions(studioId));
}
