import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { runSummarySchema } from '../../../../shared/schemas/pipeline';
import type { RunSummary } from '../../../../shared/schemas/pipeline';
import type { Touchup } from '../../../../shared/schemas/touchup';
import { api } from '../../../lib/api-client';
import { tracksQueryKey } from './get-tracks';

export interface RequestRunsInput {
  studioId: string;
  takeId: string;
  venueIds: string[];
  /** Applied to the take before cueing, for these runs only. */
  touchup?: Touchup;
}

/** Queues one cue run of the take per venue, each with the venue's current profile versions. */
export function requestRuns({
  studioId,
  takeId,
  venueIds,
  touchup,
}: RequestRunsInput): Promise<RunSummary[]> {
  return api.post(
    `/api/studios/${encodeURIComponent(studioId)}/takes/${encodeURIComponent(takeId)}/runs`,
    { venueIds, ...(touchup ? { touchup } : {}) },
    z.array(runSummarySchema),
  );
}

export function useRequestRuns(studioId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: requestRuns,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: tracksQueryKey(studioId) }),
  });
}
