import { queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { memberSchema } from '../../../../shared/schemas/api';
import type { Member } from '../../../../shared/schemas/api';
import { api } from '../../../lib/api-client';

export const membersQueryKey = (studioId: string) => ['studios', studioId, 'members'] as const;

/** Every member of the studio with roles and venue scope (studio admins only). */
export function getMembers(studioId: string): Promise<Member[]> {
  return api.get(`/api/studios/${encodeURIComponent(studioId)}/members`, z.array(memberSchema));
}

export function getMembersQueryOptions(studioId: string) {
  return queryOptions({ queryKey: membersQueryKey(studioId), queryFn: () => getMembers(studioId) });
}

export function useMembers(studioId: string) {
  return useQuery(getMembersQueryOptions(studioId));
}
