import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { trackPageSchema } from '../../../../shared/schemas/pipeline';
import type { RunStateName, TrackPage } from '../../../../shared/schemas/pipeline';
import { api } from '../../../lib/api-client';

export type TrackSort = 'updatedAt' | 'title' | 'createdAt';

export interface TracksParams {
  page: number;
  pageSize: number;
  sort: TrackSort;
  dir: 'asc' | 'desc';
  state?: RunStateName | undefined;
  venueId?: string | undefined;
  q?: string | undefined;
}

export const tracksQueryKey = (studioId: string) => ['studios', studioId, 'tracks'] as const;

/** One page of the studio's tracks, paged, sorted and filtered by the server. */
export function getTracks(studioId: string, params: TracksParams): Promise<TrackPage> {
  return api.get(`/api/studios/${encodeURIComponent(studioId)}/tracks`, trackPageSchema, {
    page: params.page,
    pageSize: params.pageSize,
    sort: params.sort,
    dir: params.dir,
    state: params.state,
    venueId: params.venueId,
    q: params.q?.trim() ? params.q.trim() : undefined,
  });
}

export function getTracksQueryOptions(studioId: string, params: TracksParams) {
  return queryOptions({
    queryKey: [...tracksQueryKey(studioId), 'list', params],
    queryFn: () => getTracks(studioId, params),
    // The table keeps the old page on screen while the next one loads, so it does not jump.
    placeholderData: keepPreviousData,
  });
}

export function useTracks(studioId: string, params: TracksParams) {
  return useQuery(getTracksQueryOptions(studioId, params));
}
