import { queryOptions, useQuery } from '@tanstack/react-query';
import { runDetailSchema } from '../../../../shared/schemas/pipeline';
import type { RunDetail, RunStateName } from '../../../../shared/schemas/pipeline';
import { api } from '../../../lib/api-client';

export const runQueryKey = (studioId: string, runId: string) => ['studios', studioId, 'runs', runId] as const;

/** True while the worker has not finished the run (no result, no series yet). */
export function isRunActive(state: RunStateName | undefined): boolean {
  return state === 'queued' || state === 'cueing';
}

/** A cue run with its take, profile versions, findings JSON and stored files. */
export function getRun(studioId: string, runId: string): Promise<RunDetail> {
  return api.get(
    `/api/studios/${encodeURIComponent(studioId)}/runs/${encodeURIComponent(runId)}`,
    runDetailSchema,
  );
}

export function getRunQueryOptions(studioId: string, runId: string) {
  return queryOptions({
    queryKey: runQueryKey(studioId, runId),
    queryFn: () => getRun(studioId, runId),
    refetchInterval: (query) => (isRunActive(query.state.data?.state) ? 1000 : false),
  });
}

export function useRun(studioId: string, runId: string) {
  return useQuery(getRunQueryOptions(studioId, runId));
}
