import type { VenueDetail } from '../../../../shared/schemas/pipeline';
import { putVenue, useVenueUpdate } from './put-venue';

export interface UpdateVenueSettingsInput {
  studioId: string;
  venueId: string;
  cueingVersionId?: string | null;
  budgetVersionId?: string | null;
  /** Why the venue changes what it uses; required, kept in the audit log. */
  reason: string;
}

/** Points the venue at other cueing and/or budget profile versions; the server decides who may change which. */
export function updateVenueSettings({
  studioId,
  venueId,
  ...body
}: UpdateVenueSettingsInput): Promise<VenueDetail> {
  return putVenue(studioId, venueId, 'settings', body);
}

export function useUpdateVenueSettings(studioId: string, venueId: string) {
  return useVenueUpdate(studioId, venueId, updateVenueSettings);
}
