import { queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { venueSchema } from '../../../../shared/schemas/api';
import type { Venue } from '../../../../shared/schemas/api';
import { api } from '../../../lib/api-client';

/** The studio's venues with their motion bases; a venue operator gets only the venues in scope. */
export function getVenues(studioId: string): Promise<Venue[]> {
  return api.get(`/api/studios/${encodeURIComponent(studioId)}/venues`, z.array(venueSchema));
}

export function getVenuesQueryOptions(studioId: string) {
  return queryOptions({ queryKey: ['studios', studioId, 'venues'], queryFn: () => getVenues(studioId) });
}

export function useVenues(studioId: string) {
  return useQuery(getVenuesQueryOptions(studioId));
}
