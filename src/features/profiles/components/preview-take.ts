// Where the preview gets a take's motion. The server has no route for a take's file, so the browser
// reads either a finished run's chart series (series.json: min/max per bucket, about 2,000 points,
// vehicle specific force only) or the take's own file, opened from the person's disk and read by the
// same track reader the server uses (shared/motion/track-reader.ts), with its SHA-256 compared to the
// take's.
import type { RunDetail, Take } from '../../../../shared/schemas/pipeline';
import type { RunSeries, SeriesBand } from '../../../../shared/schemas/run-series';
import { parseTrackText } from '../../../../shared/motion/track-reader';
import type { Track } from '../../../../shared/motion/track-reader';

export const VEHICLE_COLUMNS = ['fx_mps2', 'fy_mps2', 'fz_mps2', 'wx_radps', 'wy_radps', 'wz_radps'] as const;

export interface PreviewTakeData {
  track: Track;
  /** Says where the samples came from and what they lack, shown beside the preview. */
  source: string;
  /** True when the samples are the take's own (its file), false when they are a run's reduced series. */
  fullRate: boolean;
}

const mid = (b: SeriesBand, i: number) => ((b.min[i] as number) + (b.max[i] as number)) / 2;

/**
 * A vehicle track from a run's chart series: each bucket's mid-range at the bucket's start time, the
 * ramps the run added trimmed off. The columns of the take as uploaded when the run had a touch-up
 * (the series then holds all six); otherwise the specific force, with the angular rates, which the
 * series does not hold, at zero. Null when the run's take is not a vehicle take.
 */
export function trackFromRunSeries(
  series: RunSeries,
  detail: Pick<RunDetail, 'venueName' | 'ramp'> & { take: Pick<Take, 'kind' | 'number' | 'samples'> },
): PreviewTakeData | null {
  if (detail.take.kind !== 'vehicle') return null;
  const t = series.time_s;
  const n = t.length;
  if (n === 0) return null;
  const from = (t[0] as number) + (detail.ramp?.in_s ?? 0) - 1e-9;
  const to = (t[n - 1] as number) - (detail.ramp?.out_s ?? 0) + 1e-9;
  const touchup = series.touchup?.columns;
  const bandOf = (name: (typeof VEHICLE_COLUMNS)[number]): SeriesBand | null => {
    if (touchup) return touchup.find((c) => c.name === name)?.before ?? null;
    if (name === 'fx_mps2') return series.force.x.input;
    if (name === 'fy_mps2') return series.force.y.input;
    if (name === 'fz_mps2') return series.force.z.input;
    return null;
  };
  const bands = VEHICLE_COLUMNS.map(bandOf);
  if (!bands[0] || !bands[1] || !bands[2]) return null;
  const keep: number[] = [];
  let last = -Infinity;
  for (let i = 0; i < n; i++) {
    const ti = t[i] as number;
    if (ti < from || ti > to || ti <= last) continue;
    keep.push(i);
    last = ti;
  }
  const time_s = Float64Array.from(keep, (i) => t[i] as number);
  const columns = bands.map((b) => Float64Array.from(keep, (i) => (b ? mid(b, i) : 0)));
  const anglesMissing = bands.slice(3).some((b) => b === null);
  return {
    track: {
      kind: 'vehicle',
      layout: 'vehicle',
      length: time_s.length,
      time_s,
      names: [...VEHICLE_COLUMNS],
      columns,
    },
    source:
      `Run of take ${detail.take.number} at ${detail.venueName}: its chart series, ${time_s.length} points ` +
      `(mid-range of each bucket) instead of ${detail.take.samples} samples` +
      (anglesMissing
        ? '; the series holds no angular rates, so the rotational channel sees none. Open the take file for the full take.'
        : '.'),
    fullRate: false,
  };
}

/** SHA-256 of bytes as lower-case hex (Web Crypto). */
export async function sha256Hex(bytes: ArrayBuffer): Promise<string> {
  const digest = await crypto.subtle.digest('SHA-256', bytes);
  return Array.from(new Uint8Array(digest), (b) => b.toString(16).padStart(2, '0')).join('');
}

/** Reads a take file from disk (gunzipping a .gz) with the shared track reader. */
export async function readTakeFile(file: File): Promise<{ track: Track; sha256: string }> {
  const bytes = await file.arrayBuffer();
  const sha256 = await sha256Hex(bytes);
  let text: string;
  if (/\.gz$/i.test(file.name)) {
    const stream = new Blob([bytes]).stream().pipeThrough(new DecompressionStream('gzip'));
    text = await new Response(stream).text();
  } else {
    text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  }
  return { track: parseTrackText(text, { file: file.name }), sha256 };
}
