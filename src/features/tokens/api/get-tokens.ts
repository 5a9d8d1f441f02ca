import { queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { apiTokenSchema } from '../../../../shared/schemas/pipeline';
import type { ApiToken } from '../../../../shared/schemas/pipeline';
import { api } from '../../../lib/api-client';

export const tokensQueryKey = (studioId: string) => ['studios', studioId, 'tokens'] as const;

/** The studio's API tokens (never the secrets), revoked ones included (studio admins only). */
export function getTokens(studioId: string): Promise<ApiToken[]> {
  return api.get(`/api/studios/${encodeURIComponent(studioId)}/tokens`, z.array(apiTokenSchema));
}

export function getTokensQueryOptions(studioId: string) {
  return queryOptions({ queryKey: tokensQueryKey(studioId), queryFn: () => getTokens(studioId) });
}

export function useTokens(studioId: string) {
  return useQuery(getTokensQueryOptions(studioId));
}
