import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { tokensQueryKey } from './get-tokens';

/** Revokes an API token: calls with it are refused from then on. */
export function revokeToken({ studioId, tokenId }: { studioId: string; tokenId: string }): Promise<void> {
  return api.delete(`/api/studios/${encodeURIComponent(studioId)}/tokens/${encodeURIComponent(tokenId)}`);
}

export function useRevokeToken(studioId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: revokeToken,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: tokensQueryKey(studioId) }),
  });
}
