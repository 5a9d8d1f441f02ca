import { useMutation, useQueryClient } from '@tanstack/react-query';
import { venueDetailSchema } from '../../../../shared/schemas/pipeline';
import type { VenueDetail } from '../../../../shared/schemas/pipeline';
import { api } from '../../../lib/api-client';
import { venueKeys } from '../../../lib/queries/venues';

export interface UpdateVenueSettingsInput {
  studioId: string;
  venueId: string;
  cueingVersionId?: string | null;
  budgetVersionId?: string | null;
}

/** Points the venue at other cueing and/or budget profile versions; the server decides who may change which. */
export async function updateVenueSettings({
  studioId,
  venueId,
  ...body
}: UpdateVenueSettingsInput): Promise<VenueDetail> {
  const path = `/api/studios/${encodeURIComponent(studioId)}/venues/${encodeURIComponent(venueId)}/settings`;
  return api.put(path, body, venueDetailSchema);
}

export function useUpdateVenueSettings(studioId: string, venueId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateVenueSettings,
    onSuccess: (venue) => queryClient.setQueryData(venueKeys.detail(studioId, venueId), venue),
  });
}
