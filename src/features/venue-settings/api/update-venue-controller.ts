import type { VenueDetail } from '../../../../shared/schemas/pipeline';
import { putVenue, useVenueUpdate } from './put-venue';

export interface UpdateVenueControllerInput {
  studioId: string;
  venueId: string;
  /** The whole controller settings (ramp, optional encoder); the server validates each field. */
  controller: unknown;
}

/** Replaces the venue's controller settings; bad ones come back as ApiRequestError with one issue per field. */
export function updateVenueController({
  studioId,
  venueId,
  controller,
}: UpdateVenueControllerInput): Promise<VenueDetail> {
  return putVenue(studioId, venueId, 'controller', controller);
}

export function useUpdateVenueController(studioId: string, venueId: string) {
  return useVenueUpdate(studioId, venueId, updateVenueController);
}
