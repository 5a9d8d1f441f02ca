import { useMutation, useQueryClient } from '@tanstack/react-query';
import { profileSchema } from '../../../../shared/schemas/pipeline';
import type { Profile } from '../../../../shared/schemas/pipeline';
import { api } from '../../../lib/api-client';
import { profileKeys } from '../../../lib/queries/profiles';

export interface CreateProfileVersionInput {
  studioId: string;
  profileId: string;
  params: unknown;
  note: string;
}

/** Adds a version to a profile; earlier versions are never edited, so runs that used them stay reproducible. */
export function createProfileVersion({
  studioId,
  profileId,
  ...body
}: CreateProfileVersionInput): Promise<Profile> {
  return api.post(
    `/api/studios/${encodeURIComponent(studioId)}/profiles/${encodeURIComponent(profileId)}/versions`,
    body,
    profileSchema,
  );
}

export function useCreateProfileVersion(studioId: string, kind: Profile['kind']) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createProfileVersion,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: profileKeys.list(studioId, kind) }),
  });
}
