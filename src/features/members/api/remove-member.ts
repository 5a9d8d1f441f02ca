import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { membersQueryKey } from './get-members';

/** Removes a member from the studio (the account itself stays). */
export function removeMember(input: { studioId: string; userId: string }): Promise<void> {
  return api.delete(
    `/api/studios/${encodeURIComponent(input.studioId)}/members/${encodeURIComponent(input.userId)}`,
  );
}

export function useRemoveMember(studioId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: removeMember,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: membersQueryKey(studioId) }),
  });
}
