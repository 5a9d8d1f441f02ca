// What the profile preview reads from the server: the studio's tracks, a track's takes and runs, and a
// run's detail and chart series (the only form in which the browser can read a take's motion today).
import { queryOptions, useQuery } from '@tanstack/react-query';
import { runDetailSchema, trackDetailSchema, trackPageSchema } from '../../../../shared/schemas/pipeline';
import type { RunDetail, TrackDetail, TrackPage } from '../../../../shared/schemas/pipeline';
import { runSeriesSchema } from '../../../../shared/schemas/run-series';
import type { RunSeries } from '../../../../shared/schemas/run-series';
import { api } from '../../../lib/api-client';

const studio = (studioId: string) => `/api/studios/${encodeURIComponent(studioId)}`;
const previewKey = (studioId: string) => ['studios', studioId, 'profiles', 'preview'] as const;

/** The studio's most recently changed tracks (the first hundred), for the preview's take picker. */
export function getPreviewTracks(studioId: string): Promise<TrackPage> {
  return api.get(`${studio(studioId)}/tracks`, trackPageSchema, {
    page: 1,
    pageSize: 100,
    sort: 'updatedAt',
    dir: 'desc',
  });
}

export function usePreviewTracks(studioId: string) {
  return useQuery(
    queryOptions({
      queryKey: [...previewKey(studioId), 'tracks'],
      queryFn: () => getPreviewTracks(studioId),
    }),
  );
}

/** A track with its takes and runs. */
export function getPreviewTrack(studioId: string, trackId: string): Promise<TrackDetail> {
  return api.get(`${studio(studioId)}/tracks/${encodeURIComponent(trackId)}`, trackDetailSchema);
}

export function usePreviewTrack(studioId: string, trackId: string | null) {
  return useQuery(
    queryOptions({
      queryKey: [...previewKey(studioId), 'track', trackId],
      queryFn: () => getPreviewTrack(studioId, trackId ?? ''),
      enabled: trackId !== null,
    }),
  );
}

/** A finished run's detail (its ramps and touch-up) and its chart series. */
export async function getPreviewRun(
  studioId: string,
  runId: string,
): Promise<{ detail: RunDetail; series: RunSeries }> {
  const base = `${studio(studioId)}/runs/${encodeURIComponent(runId)}`;
  const [detail, series] = await Promise.all([
    api.get(base, runDetailSchema),
    api.get(`${base}/series`, runSeriesSchema),
  ]);
  return { detail, series };
}

export function usePreviewRun(studioId: string, runId: string | null) {
  return useQuery(
    queryOptions({
      queryKey: [...previewKey(studioId), 'run', runId],
      queryFn: () => getPreviewRun(studioId, runId ?? ''),
      enabled: runId !== null,
      staleTime: Infinity,
    }),
  );
}
