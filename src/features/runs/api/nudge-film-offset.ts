import { useMutation, useQueryClient } from '@tanstack/react-query';
import { runSummarySchema } from '../../../../shared/schemas/pipeline';
import type { RunSummary } from '../../../../shared/schemas/pipeline';
import { api } from '../../../lib/api-client';

export interface NudgeFilmOffsetInput {
  studioId: string;
  runId: string;
  /** The new offset of the motion against the picture, in frames (positive: the motion plays later). */
  offset_frames: number;
}

/** Asks for the run with another film offset: a new run (or the one that already has that offset). */
export function nudgeFilmOffset({
  studioId,
  runId,
  offset_frames,
}: NudgeFilmOffsetInput): Promise<RunSummary> {
  return api.post(
    `/api/studios/${encodeURIComponent(studioId)}/runs/${encodeURIComponent(runId)}/film-offset`,
    { offset_frames },
    runSummarySchema,
  );
}

export function useNudgeFilmOffset(studioId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: nudgeFilmOffset,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: ['studios', studioId] }),
  });
}
