// The chart series of a run (series.json): every signal reduced to min/max per bucket on ONE set of
// bucket edges over the result's time grid, so every band has exactly the time axis' length and the
// last bucket is the last sample (the trace ends at the take's end time, not a bucket early).
import type { RunSeries, SeriesBand } from '../schemas/run-series';
import { runSeriesSchema } from '../schemas/run-series';
import type { MotionBase } from '../schemas/motion-base';
import { strokeBand } from './checks';
import type { ProcessResult } from './process';
import type { Track } from './track-reader';
import { trackColumn } from './track-reader';
import { applyTouchup } from './touchup';

/** Buckets per series: about one per pixel of the widest chart, so min/max loses nothing visible. */
export const RUN_SERIES_BUCKETS = 2000;

// Six significant digits (0.01 mm on a 2 m leg) are far finer than a chart pixel and halve the JSON.
const round6 = (v: number): number => Number(v.toPrecision(6));

/**
 * Bucket start indices for n samples in at most `buckets` buckets: the first bucket is sample 0 alone,
 * the last is sample n - 1 alone, and the samples between are split into equal-count buckets. Bucket b
 * covers [edges[b], edges[b + 1]); edges has one entry more than there are buckets.
 */
export function seriesBucketEdges(n: number, buckets: number = RUN_SERIES_BUCKETS): Int32Array {
  const count = Math.max(0, Math.min(n, Math.floor(buckets)));
  const edges = new Int32Array(count + 1);
  if (count === 0) return edges;
  if (count === n || count < 3) {
    for (let b = 0; b <= count; b++) edges[b] = Math.floor((b * n) / count);
    return edges;
  }
  // Interior: samples 1 .. n-2 in count - 2 buckets with integer edges.
  const inner = n - 2;
  const m = count - 2;
  edges[0] = 0;
  for (let b = 0; b <= m; b++) edges[b + 1] = 1 + Math.floor((b * inner) / m);
  edges[count] = n;
  return edges;
}

/** Min and max of signal over each bucket of `edges` (the signal must have edges' last entry samples). */
export function minMaxOnEdges(signal: Float64Array, edges: Int32Array): SeriesBand {
  const count = edges.length - 1;
  const n = edges[count] as number;
  if (signal.length !== n) {
    throw new RangeError(`a chart signal of ${signal.length} samples on a time axis of ${n}`);
  }
  const min = new Array<number>(count);
  const max = new Array<number>(count);
  for (let b = 0; b < count; b++) {
    let lo = Infinity;
    let hi = -Infinity;
    for (let i = edges[b] as number; i < (edges[b + 1] as number); i++) {
      const v = signal[i] as number;
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
    min[b] = round6(lo);
    max[b] = round6(hi);
  }
  return { min, max };
}

/**
 * A column of the take on the result's time grid: linear interpolation at each grid instant, held
 * at the input's first or last value outside its span (m/s^2 or rad/s, as the column).
 */
function onGrid(input: Track, name: string, grid: Float64Array): Float64Array {
  const t = input.time_s;
  const v = trackColumn(input, name);
  const n = t.length;
  const out = new Float64Array(grid.length);
  let j = 0;
  for (let k = 0; k < grid.length; k++) {
    const tk = grid[k] as number;
    if (n === 1 || tk <= (t[0] as number)) {
      out[k] = v[0] as number;
      continue;
    }
    if (tk >= (t[n - 1] as number)) {
      out[k] = v[n - 1] as number;
      continue;
    }
    while (j < n - 2 && (t[j + 1] as number) <= tk) j++;
    const ta = t[j] as number;
    const tb = t[j + 1] as number;
    const a = v[j] as number;
    out[k] = a + (((v[j + 1] as number) - a) * (tk - ta)) / (tb - ta);
  }
  return out;
}

/**
 * Chart series of a pipeline result; `input` is the parsed take as uploaded. With a touch-up, the take
 * after it (what the pipeline cued: applyTouchup is pure, so this is the same track) is the vehicle
 * input of the force charts, and every column of the take is given before and after it, both on the
 * run's time grid. Validated against the series schema.
 */
export function buildRunSeries(result: ProcessResult, input: Track, base: MotionBase): RunSeries {
  const time = result.time_s;
  const n = time.length;
  const edges = seriesBucketEdges(n);
  const band = (a: Float64Array) => minMaxOnEdges(a, edges);
  const cuedTake = result.touchup ? applyTouchup(input, result.touchup) : input;
  const inputBand = (name: string) =>
    cuedTake.kind === 'vehicle' ? band(onGrid(cuedTake, name, time)) : null;
  const touchup = result.touchup
    ? {
        columns: input.names.map((name) => ({
          name,
          before: band(onGrid(input, name, time)),
          after: band(onGrid(cuedTake, name, time)),
        })),
      }
    : undefined;
  const seat1 = result.check.rider.seatForceLp_mps2[0];
  const cuedBand = (i: 0 | 1 | 2) => band(seat1 ? seat1[i] : new Float64Array(n));
  const poseNames =
    base.kind === 'hexapod'
      ? (['x_m', 'y_m', 'z_m', 'roll_rad', 'pitch_rad', 'yaw_rad'] as const)
      : (['x_m', 'y_m', 'yaw_rad'] as const);
  const pose: Record<string, SeriesBand> = {};
  for (const k of poseNames) pose[k] = band(result.pose[k]);
  const stroke = strokeBand(base.leg, result.budget.strokeMargin_m);
  const time_s: number[] = [];
  // Times to the microsecond: six significant digits would move the last sample of a long take.
  for (let b = 0; b + 1 < edges.length; b++) {
    time_s.push(Math.round((time[edges[b] as number] as number) * 1e6) / 1e6);
  }
  return runSeriesSchema.parse({
    rate_hz: result.rate_hz,
    samples: n,
    time_s,
    force: {
      x: { input: inputBand('fx_mps2'), cued: cuedBand(0) },
      y: { input: inputBand('fy_mps2'), cued: cuedBand(1) },
      z: { input: inputBand('fz_mps2'), cued: cuedBand(2) },
    },
    pose,
    legs: result.legs.map(band),
    ...(result.legForce_N ? { legForce: result.legForce_N.map(band) } : {}),
    ...(base.leg.forceMax_N !== undefined ? { forceMax_N: base.leg.forceMax_N } : {}),
    stroke: {
      min_m: base.leg.min_m,
      max_m: base.leg.max_m,
      margin_m: result.budget.strokeMargin_m,
      mid_m: stroke.mid_m,
    },
    gaps: result.gaps.map((g) => ({ start_s: g.start_s, end_s: g.end_s })),
    ...(touchup ? { touchup } : {}),
  });
}
