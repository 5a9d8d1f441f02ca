import type { RunSeries, SeriesBand } from '../schemas/run-series';
import type { MotionBase } from '../schemas/motion-base';
import { decimateMinMax } from './decimate';
import type { ProcessResult } from './process';
import { resampleTrack } from './resample';
import type { Track } from './track-reader';
import { trackColumn } from './track-reader';

// Six significant digits (0.01 mm on a 2 m leg) are far finer than a chart pixel and halve the JSON.
const round6 = (v: number): number => Number(v.toPrecision(6));
const toBand = (s: { min: Float64Array; max: Float64Array }): SeriesBand => ({
  min: Array.from(s.min, round6),
  max: Array.from(s.max, round6),
});

/** Buckets per series: about one per pixel of the widest chart, so min/max loses nothing visible. */
export const RUN_SERIES_BUCKETS = 1200;

/** Chart series of a pipeline result on `buckets` min/max buckets; `input` is the parsed take. */
export function buildRunSeries(
  result: ProcessResult,
  input: Track,
  base: MotionBase,
  buckets = 2000,
): RunSeries {
  const n = result.time_s.length;
  const t0 = result.time_s[0] as number;
  const rate = result.rate_hz;
  const dec = (a: Float64Array) => decimateMinMax(a, 0, 1, n, t0, rate, buckets);
  const first = dec(result.legs[0] as Float64Array);
  const vehicle = input.kind === 'vehicle' ? resampleTrack(input, rate) : null;
  const inputBand = (name: string) => (vehicle ? toBand(dec(trackColumn(vehicle, name))) : null);
  const cued = result.charts.seat1Force_mps2;
  const cuedBand = (i: number) => (cued[i] ? toBand(cued[i]) : toBand(dec(new Float64Array(n))));
  const poseNames =
    base.kind === 'hexapod'
      ? (['x_m', 'y_m', 'z_m', 'roll_rad', 'pitch_rad', 'yaw_rad'] as const)
      : (['x_m', 'y_m', 'yaw_rad'] as const);
  const pose: Record<string, SeriesBand> = {};
  for (const k of poseNames) pose[k] = toBand(dec(result.pose[k]));
  return {
    rate_hz: rate,
    samples: n,
    time_s: Array.from(first.time_s, round6),
    force: {
      x: { input: inputBand('fx_mps2'), cued: cuedBand(0) },
      y: { input: inputBand('fy_mps2'), cued: cuedBand(1) },
      z: { input: inputBand('fz_mps2'), cued: cuedBand(2) },
    },
    pose,
    legs: result.charts.legs_m.map(toBand),
    ...(result.charts.legForce_N.length > 0 ? { legForce: result.charts.legForce_N.map(toBand) } : {}),
    ...(base.leg.forceMax_N !== undefined ? { forceMax_N: base.leg.forceMax_N } : {}),
    stroke: { min_m: base.leg.min_m, max_m: base.leg.max_m, margin_m: result.budget.strokeMargin_m },
    gaps: result.gaps.map((g) => ({ start_s: round6(g.start_s), end_s: round6(g.end_s) })),
  };
}
