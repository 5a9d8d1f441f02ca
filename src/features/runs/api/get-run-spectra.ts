import { queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../../lib/api-client';
import { runQueryKey } from './get-run';
import { runFileUrl } from './get-run-series';

const axisSpectrum = z.object({
  seat: z.string(),
  totalPower_mps2sq: z.number(),
  bandPower_mps2sq: z.number(),
  bandShare: z.number(),
  psd: z.array(z.number()),
});

/** spectra.json of a run: one-sided Welch PSD of the rider's specific force per axis ((m/s²)²/Hz). */
export const runSpectraSchema = z.object({
  method: z.string(),
  unit: z.string(),
  rate_hz: z.number(),
  segment_n: z.number(),
  segments: z.number(),
  df_hz: z.number().positive(),
  band: z.object({ low_hz: z.number(), high_hz: z.number(), note: z.string() }),
  axes: z.object({ x: axisSpectrum, y: axisSpectrum, z: axisSpectrum }),
});
export type RunSpectra = z.infer<typeof runSpectraSchema>;

/** The run's spectra file (present once the run finished, when the track was long enough). */
export function getRunSpectra(studioId: string, runId: string): Promise<RunSpectra> {
  return api.get(runFileUrl(studioId, runId, 'spectra.json'), runSpectraSchema);
}

export function getRunSpectraQueryOptions(studioId: string, runId: string) {
  return queryOptions({
    queryKey: [...runQueryKey(studioId, runId), 'spectra'],
    queryFn: () => getRunSpectra(studioId, runId),
    staleTime: Infinity,
  });
}

export function useRunSpectra(studioId: string, runId: string, enabled: boolean) {
  return useQuery({ ...getRunSpectraQueryOptions(studioId, runId), enabled });
}
