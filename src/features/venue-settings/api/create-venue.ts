import { useMutation, useQueryClient } from '@tanstack/react-query';
import { venueDetailSchema } from '../../../../shared/schemas/pipeline';
import type { VenueDetail } from '../../../../shared/schemas/pipeline';
import { api } from '../../../lib/api-client';
import { venueKeys } from '../../../lib/queries/venues';

export interface CreateVenueInput {
  studioId: string;
  name: string;
  site: string;
  /** IANA time zone name, e.g. "Europe/Lisbon". */
  timeZone: string;
  /** A motion base object (docs/motion-conventions.md section 7; lengths m, angles deg); the server validates it. */
  base: unknown;
}

/** Creates a venue with its motion base (studio admins only); a bad base comes back with one issue per JSON path. */
export function createVenue({ studioId, ...body }: CreateVenueInput): Promise<VenueDetail> {
  return api.post(`/api/studios/${encodeURIComponent(studioId)}/venues`, body, venueDetailSchema);
}

export function useCreateVenue(studioId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createVenue,
    // Same key as the venues list (features do not import each other), so the table refetches.
    onSuccess: () => queryClient.invalidateQueries({ queryKey: venueKeys.list(studioId), exact: true }),
  });
}
