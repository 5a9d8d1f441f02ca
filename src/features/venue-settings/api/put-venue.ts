import { useMutation, useQueryClient } from '@tanstack/react-query';
import { venueDetailSchema } from '../../../../shared/schemas/pipeline';
import type { VenueDetail } from '../../../../shared/schemas/pipeline';
import { api } from '../../../lib/api-client';
import { venueKeys } from '../../../lib/queries/venues';

/** PUTs one part of a venue (its base, profile settings or controller settings); answers the whole venue. */
export function putVenue(
  studioId: string,
  venueId: string,
  part: 'base' | 'settings' | 'controller',
  body: unknown,
): Promise<VenueDetail> {
  const path = `/api/studios/${encodeURIComponent(studioId)}/venues/${encodeURIComponent(venueId)}/${part}`;
  return api.put(path, body, venueDetailSchema);
}

/**
 * A mutation that changes a venue and puts the answer in the venue's cache entry; `listShowsIt`
 * also marks the studio's venues table stale (it shows the base kind, rate and seats).
 */
export function useVenueUpdate<I>(
  studioId: string,
  venueId: string,
  send: (input: I) => Promise<VenueDetail>,
  listShowsIt = false,
) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: send,
    onSuccess: (venue) => {
      queryClient.setQueryData(venueKeys.detail(studioId, venueId), venue);
      if (listShowsIt)
        void queryClient.invalidateQueries({ queryKey: venueKeys.list(studioId), exact: true });
    },
  });
}
