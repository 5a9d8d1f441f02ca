import { useMutation, useQueryClient } from '@tanstack/react-query';
import { venueDetailSchema } from '../../../../shared/schemas/pipeline';
import type { VenueDetail } from '../../../../shared/schemas/pipeline';
import { api } from '../../../lib/api-client';
import { venueKeys } from '../../../lib/queries/venues';

export interface UpdateVenueControllerInput {
  studioId: string;
  venueId: string;
  /** The whole controller settings (ramp, optional encoder); the server validates each field. */
  controller: unknown;
}

/** Replaces the venue's controller settings; bad ones come back as ApiRequestError with one issue per field. */
export async function updateVenueController({
  studioId,
  venueId,
  controller,
}: UpdateVenueControllerInput): Promise<VenueDetail> {
  const path = `/api/studios/${encodeURIComponent(studioId)}/venues/${encodeURIComponent(venueId)}/controller`;
  return api.put(path, controller, venueDetailSchema);
}

export function useUpdateVenueController(studioId: string, venueId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateVenueController,
    onSuccess: (venue) => {
      queryClient.setQueryData(venueKeys.detail(studioId, venueId), venue);
    },
  });
}
