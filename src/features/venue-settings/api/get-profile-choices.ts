import { queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { profileSchema } from '../../../../shared/schemas/pipeline';
import type { Profile } from '../../../../shared/schemas/pipeline';
import { api } from '../../../lib/api-client';

// Same call and cache key as the profiles page (features do not import each other).
/** The studio's profiles of one kind with every version, to choose a venue's version from. */
export function getProfileChoices(studioId: string, kind: Profile['kind']): Promise<Profile[]> {
  return api.get(`/api/studios/${encodeURIComponent(studioId)}/profiles`, z.array(profileSchema), { kind });
}

export function getProfileChoicesQueryOptions(studioId: string, kind: Profile['kind']) {
  return queryOptions({
    queryKey: ['studios', studioId, 'profiles', kind],
    queryFn: () => getProfileChoices(studioId, kind),
  });
}

export function useProfileChoices(studioId: string, kind: Profile['kind']) {
  return useQuery(getProfileChoicesQueryOptions(studioId, kind));
}
