// A take's proxy video: the raw file in one PUT, typed by its container (video/mp4 or video/webm).
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { takeSchema } from '../../../../shared/schemas/pipeline';
import type { Take } from '../../../../shared/schemas/pipeline';
import { refreshCsrfToken } from '../../../lib/api-client';
import { tracksQueryKey } from './get-tracks';

export async function setProxyVideo({
  studioId,
  takeId,
  file,
}: {
  studioId: string;
  takeId: string;
  file: File;
}): Promise<Take> {
  const type = file.type || (/\.webm$/i.test(file.name) ? 'video/webm' : 'video/mp4');
  const answer = await fetch(
    `/api/studios/${encodeURIComponent(studioId)}/takes/${encodeURIComponent(takeId)}/proxy-video`,
    {
      method: 'PUT',
      credentials: 'same-origin',
      headers: { 'content-type': type, 'x-csrf-token': await refreshCsrfToken() },
      body: file,
    },
  );
  const body = (await answer.json().catch(() => ({}))) as { error?: string };
  if (!answer.ok) throw new Error(body.error ?? `The proxy video was not stored (HTTP ${answer.status}).`);
  return takeSchema.parse(body);
}

export function useSetProxyVideo(studioId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: setProxyVideo,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: tracksQueryKey(studioId) }),
  });
}
