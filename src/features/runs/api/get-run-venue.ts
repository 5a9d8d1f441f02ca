import { queryOptions, useQuery } from '@tanstack/react-query';
import { venueDetailSchema } from '../../../../shared/schemas/pipeline';
import type { VenueDetail } from '../../../../shared/schemas/pipeline';
import { api } from '../../../lib/api-client';

// Same call and cache key as the venue settings page (features do not import each other).
/** The run's venue with its motion base JSON, for the 3-D preview. */
export function getRunVenue(studioId: string, venueId: string): Promise<VenueDetail> {
  return api.get(
    `/api/studios/${encodeURIComponent(studioId)}/venues/${encodeURIComponent(venueId)}`,
    venueDetailSchema,
  );
}

export function getRunVenueQueryOptions(studioId: string, venueId: string) {
  return queryOptions({
    queryKey: ['studios', studioId, 'venues', venueId],
    queryFn: () => getRunVenue(studioId, venueId),
  });
}

export function useRunVenue(studioId: string, venueId: string) {
  return useQuery(getRunVenueQueryOptions(studioId, venueId));
}
