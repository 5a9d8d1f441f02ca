import type { VenueDetail } from '../../../../shared/schemas/pipeline';
import { putVenue, useVenueUpdate } from './put-venue';

export interface UpdateVenueBaseInput {
  studioId: string;
  venueId: string;
  /** A motion base object (docs/motion-conventions.md section 7; lengths m, angles deg); the server validates it. */
  base: unknown;
}

/** Replaces the venue's motion base; a bad base comes back as ApiRequestError with one issue per JSON path. */
export function updateVenueBase({ studioId, venueId, base }: UpdateVenueBaseInput): Promise<VenueDetail> {
  return putVenue(studioId, venueId, 'base', { base });
}

export function useUpdateVenueBase(studioId: string, venueId: string) {
  // The venues table shows the base kind, rate and seats, so it is stale too.
  return useVenueUpdate(studioId, venueId, updateVenueBase, true);
}
