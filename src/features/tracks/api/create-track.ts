import { useMutation, useQueryClient } from '@tanstack/react-query';
import { trackDetailSchema } from '../../../../shared/schemas/pipeline';
import type { TrackDetail } from '../../../../shared/schemas/pipeline';
import { api } from '../../../lib/api-client';
import { tracksQueryKey } from './get-tracks';

export interface CreateTrackInput {
  studioId: string;
  title: string;
  film: string;
}

/** Creates an empty track for a ride film (producers). */
export function createTrack({ studioId, ...body }: CreateTrackInput): Promise<TrackDetail> {
  return api.post(`/api/studios/${encodeURIComponent(studioId)}/tracks`, body, trackDetailSchema);
}

export function useCreateTrack(studioId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createTrack,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: tracksQueryKey(studioId) }),
  });
}
