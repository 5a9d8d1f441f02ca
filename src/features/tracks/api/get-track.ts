import { queryOptions, useQuery } from '@tanstack/react-query';
import { trackDetailSchema } from '../../../../shared/schemas/pipeline';
import type { TrackDetail } from '../../../../shared/schemas/pipeline';
import { api } from '../../../lib/api-client';
import { tracksQueryKey } from './get-tracks';

export const trackQueryKey = (studioId: string, trackId: string) =>
  [...tracksQueryKey(studioId), 'detail', trackId] as const;

/** A track with its takes and every cue run of those takes, newest run first. */
export function getTrack(studioId: string, trackId: string): Promise<TrackDetail> {
  return api.get(
    `/api/studios/${encodeURIComponent(studioId)}/tracks/${encodeURIComponent(trackId)}`,
    trackDetailSchema,
  );
}

/** True while the worker still has a run of the track to finish, so the page keeps asking. */
export function hasActiveRun(track: TrackDetail | undefined): boolean {
  return !!track?.runs.some((run) => run.state === 'queued' || run.state === 'cueing');
}

export function getTrackQueryOptions(studioId: string, trackId: string) {
  return queryOptions({
    queryKey: trackQueryKey(studioId, trackId),
    queryFn: () => getTrack(studioId, trackId),
    refetchInterval: (query) => (hasActiveRun(query.state.data) ? 1000 : false),
  });
}

export function useTrack(studioId: string, trackId: string) {
  return useQuery(getTrackQueryOptions(studioId, trackId));
}
