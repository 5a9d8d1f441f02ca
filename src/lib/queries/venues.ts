// The studio's venues, needed by several features (venues, tracks, runs, venue settings, members):
// the calls, their query options and their query keys are written here once.
import { queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { venueSchema } from '../../../shared/schemas/api';
import type { Venue } from '../../../shared/schemas/api';
import { venueDetailSchema } from '../../../shared/schemas/pipeline';
import type { VenueDetail } from '../../../shared/schemas/pipeline';
import { api } from '../api-client';

export const venueKeys = {
  /** The list, and the prefix of every venue query of the studio. */
  list: (studioId: string) => ['studios', studioId, 'venues'] as const,
  detail: (studioId: string, venueId: string) => ['studios', studioId, 'venues', venueId] as const,
};

/** The studio's venues with a summary of their motion bases; a venue operator gets only theirs. */
export function getVenues(studioId: string): Promise<Venue[]> {
  return api.get(`/api/studios/${encodeURIComponent(studioId)}/venues`, z.array(venueSchema));
}

export function getVenuesQueryOptions(studioId: string) {
  return queryOptions({ queryKey: venueKeys.list(studioId), queryFn: () => getVenues(studioId) });
}

export function useVenues(studioId: string) {
  return useQuery(getVenuesQueryOptions(studioId));
}

/** A venue with its motion base JSON and the cueing and budget profile versions it runs with. */
export function getVenue(studioId: string, venueId: string): Promise<VenueDetail> {
  return api.get(
    `/api/studios/${encodeURIComponent(studioId)}/venues/${encodeURIComponent(venueId)}`,
    venueDetailSchema,
  );
}

export function getVenueQueryOptions(studioId: string, venueId: string) {
  return queryOptions({
    queryKey: venueKeys.detail(studioId, venueId),
    queryFn: () => getVenue(studioId, venueId),
  });
}

export function useVenue(studioId: string, venueId: string) {
  return useQuery(getVenueQueryOptions(studioId, venueId));
}
