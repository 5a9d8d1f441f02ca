import { queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { venueSchema } from '../../../../shared/schemas/api';
import type { Venue } from '../../../../shared/schemas/api';
import { api } from '../../../lib/api-client';

// Same call and cache key as the venues list elsewhere in the app (features do not import each
// other), so the venues are fetched once per studio whichever screen asks first.
/** The studio's venues, for the venue filter and the "Cue for venues" checkboxes. */
export function getVenueChoices(studioId: string): Promise<Venue[]> {
  return api.get(`/api/studios/${encodeURIComponent(studioId)}/venues`, z.array(venueSchema));
}

export function getVenueChoicesQueryOptions(studioId: string) {
  return queryOptions({
    queryKey: ['studios', studioId, 'venues'],
    queryFn: () => getVenueChoices(studioId),
  });
}

export function useVenueChoices(studioId: string) {
  return useQuery(getVenueChoicesQueryOptions(studioId));
}
