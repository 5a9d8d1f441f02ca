import { useMutation, useQueryClient } from '@tanstack/react-query';
import { memberSchema } from '../../../../shared/schemas/api';
import type { Member } from '../../../../shared/schemas/api';
import type { Role } from '../../../../shared/schemas/roles';
import { api } from '../../../lib/api-client';
import { membersQueryKey } from './get-members';

export interface UpdateMemberInput {
  studioId: string;
  userId: string;
  roles: Role[];
  venueIds: string[];
}

/** Replaces a member's roles and venue scope in the studio. */
export function updateMember({ studioId, userId, ...body }: UpdateMemberInput): Promise<Member> {
  return api.patch(
    `/api/studios/${encodeURIComponent(studioId)}/members/${encodeURIComponent(userId)}`,
    body,
    memberSchema,
  );
}

export function useUpdateMember(studioId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateMember,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: membersQueryKey(studioId) }),
  });
}
