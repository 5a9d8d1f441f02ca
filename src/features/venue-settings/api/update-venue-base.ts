import { useMutation, useQueryClient } from '@tanstack/react-query';
import { venueDetailSchema } from '../../../../shared/schemas/pipeline';
import type { VenueDetail } from '../../../../shared/schemas/pipeline';
import { api } from '../../../lib/api-client';
import { venueKeys } from '../../../lib/queries/venues';

export interface UpdateVenueBaseInput {
  studioId: string;
  venueId: string;
  /** A motion base object (docs/motion-conventions.md section 7; lengths m, angles deg); the server validates it. */
  base: unknown;
}

/** Replaces the venue's motion base; a bad base comes back as ApiRequestError with one issue per JSON path. */
export async function updateVenueBase({
  studioId,
  venueId,
  base,
}: UpdateVenueBaseInput): Promise<VenueDetail> {
  const path = `/api/studios/${encodeURIComponent(studioId)}/venues/${encodeURIComponent(venueId)}/base`;
  return api.put(path, { base }, venueDetailSchema);
}

export function useUpdateVenueBase(studioId: string, venueId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateVenueBase,
    onSuccess: (venue) => {
      queryClient.setQueryData(venueKeys.detail(studioId, venueId), venue);
      // The venues table shows the base kind, rate and seats, so it is stale too.
      void queryClient.invalidateQueries({ queryKey: venueKeys.list(studioId), exact: true });
    },
  });
}
