import { queryOptions, useQuery } from '@tanstack/react-query';
import { meResponse } from '../../../../shared/schemas/api';
import type { Me } from '../../../../shared/schemas/api';
import { api, isUnauthorized } from '../../../lib/api-client';

export const meQueryKey = ['auth', 'me'] as const;

/** The signed-in user and their studio memberships, or null when nobody is signed in. */
export async function getMe(): Promise<Me | null> {
  try {
    return await api.get('/api/auth/me', meResponse);
  } catch (error) {
    if (isUnauthorized(error)) return null;
    throw error;
  }
}

export function getMeQueryOptions() {
  return queryOptions({ queryKey: meQueryKey, queryFn: getMe, staleTime: 60_000 });
}

export function useMe() {
  return useQuery(getMeQueryOptions());
}
