import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { runSummarySchema, venueDetailSchema } from '../../../../shared/schemas/pipeline';
import type { RunSummary } from '../../../../shared/schemas/pipeline';
import { api } from '../../../lib/api-client';
import { venueKeys } from '../../../lib/queries/venues';

export interface CueTakeInput {
  studioId: string;
  takeId: string;
  venueId: string;
  cueingVersionId: string;
  /** Why the venue changes cueing profile; the audit log keeps it. */
  reason: string;
}

/**
 * Cues a take again with a cueing profile version: makes the version the venue's cueing profile
 * (PUT .../venues/:venue/settings), then asks for the run (POST .../takes/:take/runs), which the
 * server makes with the venue's profile versions. Answers the queued (or already existing) run.
 */
export async function cueTake({
  studioId,
  takeId,
  venueId,
  cueingVersionId,
  reason,
}: CueTakeInput): Promise<RunSummary> {
  const studio = `/api/studios/${encodeURIComponent(studioId)}`;
  await api.put(
    `${studio}/venues/${encodeURIComponent(venueId)}/settings`,
    { cueingVersionId, reason },
    venueDetailSchema,
  );
  const runs = await api.post(
    `${studio}/takes/${encodeURIComponent(takeId)}/runs`,
    { venueIds: [venueId] },
    z.array(runSummarySchema),
  );
  const run = runs[0];
  if (!run) throw new Error('The server queued no run.');
  return run;
}

export function useCueTake(studioId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: cueTake,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: venueKeys.list(studioId) }),
  });
}
