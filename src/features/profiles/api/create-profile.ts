import { useMutation, useQueryClient } from '@tanstack/react-query';
import { profileSchema } from '../../../../shared/schemas/pipeline';
import type { Profile } from '../../../../shared/schemas/pipeline';
import { api } from '../../../lib/api-client';
import { profileKeys } from '../../../lib/queries/profiles';

export interface CreateProfileInput {
  studioId: string;
  kind: Profile['kind'];
  name: string;
  params: unknown;
  note: string;
}

/** Creates a profile with its first version (cueing: motion engineers; budget: safety reviewers). */
export function createProfile({ studioId, ...body }: CreateProfileInput): Promise<Profile> {
  return api.post(`/api/studios/${encodeURIComponent(studioId)}/profiles`, body, profileSchema);
}

export function useCreateProfile(studioId: string, kind: Profile['kind']) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createProfile,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: profileKeys.list(studioId, kind) }),
  });
}
