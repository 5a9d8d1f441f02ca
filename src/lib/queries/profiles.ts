// The studio's cueing and budget profiles, needed by the profiles pages and the venue settings:
// the call, its query options and its query keys are written here once.
import { queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { profileSchema } from '../../../shared/schemas/pipeline';
import type { Profile } from '../../../shared/schemas/pipeline';
import { api } from '../api-client';

export const profileKeys = {
  all: (studioId: string) => ['studios', studioId, 'profiles'] as const,
  list: (studioId: string, kind: Profile['kind']) => ['studios', studioId, 'profiles', kind] as const,
};

/** The studio's cueing or budget profiles, each with every version. */
export function getProfiles(studioId: string, kind: Profile['kind']): Promise<Profile[]> {
  return api.get(`/api/studios/${encodeURIComponent(studioId)}/profiles`, z.array(profileSchema), { kind });
}

export function getProfilesQueryOptions(studioId: string, kind: Profile['kind']) {
  return queryOptions({
    queryKey: profileKeys.list(studioId, kind),
    queryFn: () => getProfiles(studioId, kind),
  });
}

export function useProfiles(studioId: string, kind: Profile['kind']) {
  return useQuery(getProfilesQueryOptions(studioId, kind));
}
