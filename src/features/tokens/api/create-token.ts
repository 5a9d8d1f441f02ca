import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { apiTokenSchema } from '../../../../shared/schemas/pipeline';
import { api } from '../../../lib/api-client';
import { tokensQueryKey } from './get-tokens';

export const createdTokenSchema = apiTokenSchema.extend({ token: z.string().min(1) });
export type CreatedToken = z.infer<typeof createdTokenSchema>;

/** Creates an API token for pipelines; the answer carries the secret, which is never shown again. */
export function createToken({ studioId, name }: { studioId: string; name: string }): Promise<CreatedToken> {
  return api.post(`/api/studios/${encodeURIComponent(studioId)}/tokens`, { name }, createdTokenSchema);
}

export function useCreateToken(studioId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createToken,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: tokensQueryKey(studioId) }),
  });
}
