import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiErrorSchema } from '../../../../shared/schemas/api';
import { venueDetailSchema } from '../../../../shared/schemas/pipeline';
import type { VenueDetail } from '../../../../shared/schemas/pipeline';
import { ApiRequestError, errorMessage, refreshCsrfToken } from '../../../lib/api-client';
import { venueDetailQueryKey } from './get-venue-detail';

export interface UpdateVenueSettingsInput {
  studioId: string;
  venueId: string;
  cueingVersionId?: string | null;
  budgetVersionId?: string | null;
}

// The shared API client has no PUT; this is the same contract (cookie, CSRF header, JSON both ways,
// `{ error, issues }` on failure) for the one call that needs it.
async function putJson(path: string, body: unknown): Promise<unknown> {
  const csrfToken = await refreshCsrfToken();
  let response: Response;
  try {
    response = await fetch(path, {
      method: 'PUT',
      credentials: 'same-origin',
      headers: { accept: 'application/json', 'content-type': 'application/json', 'x-csrf-token': csrfToken },
      body: JSON.stringify(body),
    });
  } catch (cause) {
    throw new ApiRequestError(0, `Could not reach the Legwork server (PUT ${path}): ${errorMessage(cause)}`);
  }
  let json: unknown = null;
  try {
    json = await response.json();
  } catch {
    // An empty or non-JSON body is reported from the status below.
  }
  if (!response.ok) {
    const parsed = apiErrorSchema.safeParse(json);
    if (parsed.success)
      throw new ApiRequestError(response.status, parsed.data.error, parsed.data.issues ?? []);
    throw new ApiRequestError(response.status, `The server answered ${response.status} to PUT ${path}.`);
  }
  return json;
}

/** Points the venue at other cueing and/or budget profile versions; the server decides who may change which. */
export async function updateVenueSettings({
  studioId,
  venueId,
  ...body
}: UpdateVenueSettingsInput): Promise<VenueDetail> {
  const path = `/api/studios/${encodeURIComponent(studioId)}/venues/${encodeURIComponent(venueId)}/settings`;
  const parsed = venueDetailSchema.safeParse(await putJson(path, body));
  if (!parsed.success)
    throw new ApiRequestError(200, `The server's answer to PUT ${path} was not understood.`);
  return parsed.data;
}

export function useUpdateVenueSettings(studioId: string, venueId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateVenueSettings,
    onSuccess: (venue) => queryClient.setQueryData(venueDetailQueryKey(studioId, venueId), venue),
  });
}
