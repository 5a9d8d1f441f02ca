import { queryOptions, useQuery } from '@tanstack/react-query';
import { runSeriesSchema } from '../../../../shared/schemas/run-series';
import type { RunSeries } from '../../../../shared/schemas/run-series';
import { api } from '../../../lib/api-client';
import { runQueryKey } from './get-run';

/** The decimated min/max chart series of a finished run (the server answers 404 before that). */
export function getRunSeries(studioId: string, runId: string): Promise<RunSeries> {
  return api.get(
    `/api/studios/${encodeURIComponent(studioId)}/runs/${encodeURIComponent(runId)}/series`,
    runSeriesSchema,
  );
}

export function getRunSeriesQueryOptions(studioId: string, runId: string) {
  return queryOptions({
    queryKey: [...runQueryKey(studioId, runId), 'series'],
    queryFn: () => getRunSeries(studioId, runId),
    // A finished run's series never changes.
    staleTime: Infinity,
  });
}

export function useRunSeries(studioId: string, runId: string, enabled: boolean) {
  return useQuery({ ...getRunSeriesQueryOptions(studioId, runId), enabled });
}

/** Where the browser downloads one of the run's files (session cookie, same origin). */
export function runFileUrl(studioId: string, runId: string, name: string): string {
  return `/api/studios/${encodeURIComponent(studioId)}/runs/${encodeURIComponent(runId)}/files/${encodeURIComponent(name)}`;
}
