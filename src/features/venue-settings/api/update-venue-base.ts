import { useMutation, useQueryClient } from '@tanstack/react-query';
import { venueDetailSchema } from '../../../../shared/schemas/pipeline';
import type { VenueDetail } from '../../../../shared/schemas/pipeline';
import { ApiRequestError } from '../../../lib/api-client';
import { venueDetailQueryKey } from './get-venue-detail';
import { putJson } from './put-json';

export interface UpdateVenueBaseInput {
  studioId: string;
  venueId: string;
  /** A motion base object (motion-spec section 7; lengths m, angles deg); the server validates it. */
  base: unknown;
}

/** Replaces the venue's motion base; a bad base comes back as ApiRequestError with one issue per JSON path. */
export async function updateVenueBase({
  studioId,
  venueId,
  base,
}: UpdateVenueBaseInput): Promise<VenueDetail> {
  const path = `/api/studios/${encodeURIComponent(studioId)}/venues/${encodeURIComponent(venueId)}/base`;
  const parsed = venueDetailSchema.safeParse(await putJson(path, { base }));
  if (!parsed.success)
    throw new ApiRequestError(200, `The server's answer to PUT ${path} was not understood.`);
  return parsed.data;
}

export function useUpdateVenueBase(studioId: string, venueId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateVenueBase,
    onSuccess: (venue) => {
      queryClient.setQueryData(venueDetailQueryKey(studioId, venueId), venue);
      // The venues table shows the base kind, rate and seats, so it is stale too.
      void queryClient.invalidateQueries({ queryKey: ['studios', studioId, 'venues'], exact: true });
    },
  });
}
