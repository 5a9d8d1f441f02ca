import { queryOptions, useQuery } from '@tanstack/react-query';
import { runDecisionSchema } from '../../../../shared/schemas/review';
import type { RunDecision } from '../../../../shared/schemas/review';
import { api } from '../../../lib/api-client';
import { runKeysPrefix } from '../../../lib/queries/releases';

export const runDecisionKey = (studioId: string, runId: string) =>
  [...runKeysPrefix(studioId, runId), 'decision'] as const;

/** The reviews of a run, its releases and what the viewer may do next. */
export function getRunDecision(studioId: string, runId: string): Promise<RunDecision> {
  return api.get(
    `/api/studios/${encodeURIComponent(studioId)}/runs/${encodeURIComponent(runId)}/decision`,
    runDecisionSchema,
  );
}

export function getRunDecisionQueryOptions(studioId: string, runId: string) {
  return queryOptions({
    queryKey: runDecisionKey(studioId, runId),
    queryFn: () => getRunDecision(studioId, runId),
    // A run still being cued moves on to a state that can be reviewed.
    refetchInterval: (query) =>
      query.state.data && ['queued', 'cueing'].includes(query.state.data.state) ? 3000 : false,
  });
}

export function useRunDecision(studioId: string, runId: string) {
  return useQuery(getRunDecisionQueryOptions(studioId, runId));
}
