import { useQueries } from '@tanstack/react-query';
import { runDetailSchema } from '../../../../shared/schemas/pipeline';
import type { RunDetail } from '../../../../shared/schemas/pipeline';
import { runSeriesSchema } from '../../../../shared/schemas/run-series';
import type { RunSeries } from '../../../../shared/schemas/run-series';
import { api } from '../../../lib/api-client';

// The same keys as the run page's, so a review or release that invalidates a run refreshes it here too.
const runKey = (studioId: string, runId: string) => ['studios', studioId, 'runs', runId] as const;

/** One run's detail (take, venue, profile versions, result). */
export function getComparedRun(studioId: string, runId: string): Promise<RunDetail> {
  return api.get(
    `/api/studios/${encodeURIComponent(studioId)}/runs/${encodeURIComponent(runId)}`,
    runDetailSchema,
  );
}

/** One finished run's chart series. */
export function getComparedSeries(studioId: string, runId: string): Promise<RunSeries> {
  return api.get(
    `/api/studios/${encodeURIComponent(studioId)}/runs/${encodeURIComponent(runId)}/series`,
    runSeriesSchema,
  );
}

/** The details of every compared run, in the order given. */
export function useComparedRuns(studioId: string, runIds: readonly string[]) {
  return useQueries({
    queries: runIds.map((runId) => ({
      queryKey: runKey(studioId, runId),
      queryFn: () => getComparedRun(studioId, runId),
    })),
  });
}

/** The chart series of every compared run that has finished (`ready[k]` false: not asked for). */
export function useComparedSeries(studioId: string, runIds: readonly string[], ready: readonly boolean[]) {
  return useQueries({
    queries: runIds.map((runId, k) => ({
      queryKey: [...runKey(studioId, runId), 'series'],
      queryFn: () => getComparedSeries(studioId, runId),
      enabled: ready[k] ?? false,
      // A finished run's series never changes.
      staleTime: Infinity,
    })),
  });
}
