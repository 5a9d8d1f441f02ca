import { useMutation, useQueryClient } from '@tanstack/react-query';
import { reviewedRunSchema } from '../../../../shared/schemas/review';
import type { ReviewBody, ReviewedRun } from '../../../../shared/schemas/review';
import { api } from '../../../lib/api-client';
import { homeKeysPrefix, runKeysPrefix } from '../../../lib/queries/releases';

/** POST .../runs/:run/review: a safety reviewer clears or holds a run with a written reason. */
export function submitReview(studioId: string, runId: string, body: ReviewBody): Promise<ReviewedRun> {
  return api.post(
    `/api/studios/${encodeURIComponent(studioId)}/runs/${encodeURIComponent(runId)}/review`,
    body,
    reviewedRunSchema,
  );
}

/** Submits a review, then asks again for the run (its state and decision) and the role homes. */
export function useSubmitReview(studioId: string, runId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: ReviewBody) => submitReview(studioId, runId, body),
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: runKeysPrefix(studioId, runId) }),
        queryClient.invalidateQueries({ queryKey: homeKeysPrefix(studioId) }),
      ]),
  });
}
