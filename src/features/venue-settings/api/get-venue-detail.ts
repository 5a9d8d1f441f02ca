import { queryOptions, useQuery } from '@tanstack/react-query';
import { venueDetailSchema } from '../../../../shared/schemas/pipeline';
import type { VenueDetail } from '../../../../shared/schemas/pipeline';
import { api } from '../../../lib/api-client';

export const venueDetailQueryKey = (studioId: string, venueId: string) =>
  ['studios', studioId, 'venues', venueId] as const;

/** A venue with its motion base JSON and the cueing and budget profile versions it runs with. */
export function getVenueDetail(studioId: string, venueId: string): Promise<VenueDetail> {
  return api.get(
    `/api/studios/${encodeURIComponent(studioId)}/venues/${encodeURIComponent(venueId)}`,
    venueDetailSchema,
  );
}

export function getVenueDetailQueryOptions(studioId: string, venueId: string) {
  return queryOptions({
    queryKey: venueDetailQueryKey(studioId, venueId),
    queryFn: () => getVenueDetail(studioId, venueId),
  });
}

export function useVenueDetail(studioId: string, venueId: string) {
  return useQuery(getVenueDetailQueryOptions(studioId, venueId));
}
