import { useMutation, useQueryClient } from '@tanstack/react-query';
import { runSummarySchema } from '../../../../shared/schemas/pipeline';
import type { RunSummary } from '../../../../shared/schemas/pipeline';
import { api } from '../../../lib/api-client';

/** Asks again for a run that failed or whose worker stopped answering: the same run, queued anew. */
export function requeueRun({ studioId, runId }: { studioId: string; runId: string }): Promise<RunSummary> {
  return api.post(
    `/api/studios/${encodeURIComponent(studioId)}/runs/${encodeURIComponent(runId)}/requeue`,
    {},
    runSummarySchema,
  );
}

export function useRequeueRun(studioId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: requeueRun,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: ['studios', studioId] }),
  });
}
