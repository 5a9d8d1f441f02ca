// Resampling a track to a venue controller rate. Method: linear interpolation onto the uniform grid
// t_k = t_0 + k / rate_hz, k = 0 .. floor((t_end - t_0) * rate_hz), so the grid starts at the first
// sample and never runs past the last one. Linear interpolation adds no overshoot (a spline could push a
// leg past its stroke between samples), and its error is second order in the source spacing. Angle
// columns are interpolated componentwise: pose angles are small and change little per sample at
// controller rates, so this matches interpolating the rotation itself far below the tolerances used.

import type { Track } from './track-reader';
import { antiAliasTaps, decimateColumn, twoStageDecimation } from './band-limit';
import type { DecimatedColumn } from './band-limit';
import { derivativeInto } from './track-derivative';

// Grid points within this many periods of the end still count (absorbs floating-point round-off
// when the duration is an exact multiple of the period).
const GRID_SLACK = 1e-9;

/** Number of uniform grid points from t0_s to tEnd_s (inclusive start) at rate_hz. */
export function uniformGridLength(t0_s: number, tEnd_s: number, rate_hz: number): number {
  if (!(rate_hz > 0) || !Number.isFinite(rate_hz))
    throw new RangeError(`rate must be positive, got ${rate_hz} Hz`);
  if (!(tEnd_s >= t0_s)) throw new RangeError(`end time ${tEnd_s} s before start ${t0_s} s`);
  return Math.floor((tEnd_s - t0_s) * rate_hz + GRID_SLACK) + 1;
}

/**
 * Linearly interpolates columns sampled at strictly increasing `time_s` onto the uniform grid at
 * rate_hz (see the file comment); returns the new time and columns, units unchanged.
 */
export function resampleLinear(
  time_s: Float64Array,
  columns: readonly Float64Array[],
  rate_hz: number,
): { time_s: Float64Array; columns: Float64Array[] } {
  const n = time_s.length;
  if (n === 0) throw new RangeError('cannot resample an empty track');
  const t0 = time_s[0] as number;
  const tEnd = time_s[n - 1] as number;
  const m = uniformGridLength(t0, tEnd, rate_hz);
  const outT = new Float64Array(m);
  const outCols = columns.map(() => new Float64Array(m));
  const nc = columns.length;
  let j = 0;
  for (let k = 0; k < m; k++) {
    // Multiplying instead of accumulating keeps the grid free of drift over 600,000 steps.
    const t = Math.min(t0 + k / rate_hz, tEnd);
    outT[k] = t;
    while (j < n - 2 && (time_s[j + 1] as number) <= t) j++;
    if (n === 1) {
      for (let c = 0; c < nc; c++)
        (outCols[c] as Float64Array)[k] = (columns[c] as Float64Array)[0] as number;
      continue;
    }
    const ta = time_s[j] as number;
    const tb = time_s[j + 1] as number;
    const w = (t - ta) / (tb - ta);
    for (let c = 0; c < nc; c++) {
      const col = columns[c] as Float64Array;
      const a = col[j] as number;
      const b = col[j + 1] as number;
      (outCols[c] as Float64Array)[k] = a + (b - a) * w;
    }
  }
  return { time_s: outT, columns: outCols };
}

/** A track resampled to rate_hz by resampleLinear; kind, layout and SI names are kept. */
export function resampleTrack(track: Track, rate_hz: number): Track {
  const r = resampleLinear(track.time_s, track.columns, rate_hz);
  return {
    kind: track.kind,
    layout: track.layout,
    length: r.time_s.length,
    time_s: r.time_s,
    names: track.names,
    columns: r.columns,
  };
}

/**
 * Resamples a track onto the uniform grid of resampleLinear (same instants, units unchanged) by cubic
 * Hermite interpolation, with slopes from the three-point derivative on the track's own (uneven) grid.
 *
 * Why not linear here: a pose or legs track played at a higher controller rate through straight
 * segments changes velocity in a step at every input sample, so the commanded leg acceleration at
 * those samples is about (controller rate / input rate) times the smooth value (a 60 Hz pose at a
 * 1 kHz controller: over 16 times), and the checks would rightly flag it. The Hermite curve is C1, so
 * acceleration stays finite and close to the motion's own. It can overshoot between samples by a little
 * where the motion turns sharply; the stroke check reads the resampled legs, so that cannot hide.
 * The cubic reproduces every quadratic exactly (the three-point slopes are exact for quadratics).
 */
export function resampleHermite(track: Track, rate_hz: number): Track {
  const t = track.time_s;
  const n = t.length;
  if (n < 3) return resampleTrack(track, rate_hz);
  const t0 = t[0] as number;
  const tEnd = t[n - 1] as number;
  const m = uniformGridLength(t0, tEnd, rate_hz);
  const time_s = new Float64Array(m);
  for (let k = 0; k < m; k++) time_s[k] = Math.min(t0 + k / rate_hz, tEnd);
  const slope = new Float64Array(n);
  const columns = track.columns.map((col) => {
    const out = new Float64Array(m);
    hermiteColumnInto(t, col, slope, { t0, rate_hz, tEnd, length: m }, out);
    return out;
  });
  return { kind: track.kind, layout: track.layout, length: m, time_s, names: track.names, columns };
}

/** Median of the sample spacings of strictly increasing times (s); 0 for fewer than two samples. */
export function medianSpacing(time_s: Float64Array): number {
  const n = time_s.length;
  if (n < 2) return 0;
  const d = new Float64Array(n - 1);
  for (let i = 0; i < n - 1; i++) d[i] = (time_s[i + 1] as number) - (time_s[i] as number);
  return selectKth(d, (n - 2) >> 1);
}

/** The k-th smallest value of a (reordered in place): Hoare's selection, expected linear time. */
function selectKth(a: Float64Array, k: number): number {
  let lo = 0;
  let hi = a.length - 1;
  while (lo < hi) {
    const pivot = a[(lo + hi) >> 1] as number;
    let i = lo;
    let j = hi;
    while (i <= j) {
      while ((a[i] as number) < pivot) i++;
      while ((a[j] as number) > pivot) j--;
      if (i <= j) {
        const t = a[i] as number;
        a[i] = a[j] as number;
        a[j] = t;
        i++;
        j--;
      }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else break;
  }
  return a[k] as number;
}

/** Content the anti-alias low-pass removed from one column (units of the column). */
export interface RemovedContent {
  name: string;
  removedRms: number;
  totalRms: number;
}

/**
 * Resamples a track to rate_hz through the anti-alias low-pass of band-limit.ts: each column is
 * interpolated (linearly for a vehicle track, by the cubic Hermite of resampleHermite otherwise) onto
 * a fine grid of m x rate_hz with m the smallest whole number that makes the fine grid at least as
 * dense as the track's median spacing, low-passed there, and read at the controller instants (the
 * grid of resampleLinear). The band ends at 0.4 x the lower of the controller rate and the track's
 * own rate. Returns the track and, per column, the r.m.s. removed. `done` holds columns (by index)
 * already computed by resampleAntiAliasColumns, taken as they are.
 */
export function resampleAntiAlias(
  track: Track,
  rate_hz: number,
  done: ReadonlyMap<number, DecimatedColumn> = new Map(),
): { track: Track; removed: RemovedContent[]; fineFactor: number; bandScale: number } {
  const t = track.time_s;
  const n = t.length;
  if (n < 3) return { track: resampleTrack(track, rate_hz), removed: [], fineFactor: 1, bandScale: 1 };
  const grid = antiAliasGrid(track, rate_hz);
  const { t0, tEnd, count, m, scale } = grid;
  const time_s = new Float64Array(count);
  for (let k = 0; k < count; k++) time_s[k] = Math.min(t0 + k / rate_hz, tEnd);
  const scratch = columnScratch(track, grid);
  const removed: RemovedContent[] = [];
  const columns = track.columns.map((col, c) => {
    const d = done.get(c) ?? decimateTrackColumn(track, col, grid, scratch);
    removed.push({
      name: track.names[c] ?? `column${c + 1}`,
      removedRms: d.removedRms,
      totalRms: d.totalRms,
    });
    return d.values;
  });
  return {
    track: { kind: track.kind, layout: track.layout, length: count, time_s, names: track.names, columns },
    removed,
    fineFactor: m,
    bandScale: scale,
  };
}

/** The grids and filters resampleAntiAlias uses for a track (a function of its times and kind only). */
interface AntiAliasGrid {
  t0: number;
  tEnd: number;
  count: number;
  m: number;
  scale: number;
  fineT: FineGrid;
  taps: Float64Array;
  plan: ReturnType<typeof twoStageDecimation>;
}

function antiAliasGrid(track: Pick<Track, 'time_s'>, rate_hz: number): AntiAliasGrid {
  const t = track.time_s;
  const n = t.length;
  const t0 = t[0] as number;
  const tEnd = t[n - 1] as number;
  const count = uniformGridLength(t0, tEnd, rate_hz);
  const spacing = medianSpacing(t);
  const m = Math.max(1, Math.ceil(1 / (spacing * rate_hz) - 1e-9));
  const fineRate = m * rate_hz;
  const nf = uniformGridLength(t0, tEnd, fineRate);
  // The fine grid's instants are computed where they are used, not held (on a two-hour 1 kHz take
  // that array alone would be 58 MB).
  const fineT: FineGrid = { t0, rate_hz: fineRate, tEnd, length: nf };
  // A track coarser than the controller holds nothing above its own Nyquist frequency; what the
  // interpolant adds there (the Hermite curve's jumps in curvature at each sample) is not motion, so
  // the band then ends at 0.4 x the track's own rate.
  const scale = Math.min(1, 1 / (spacing * rate_hz));
  const taps = antiAliasTaps(m, scale);
  const plan = scale === 1 ? twoStageDecimation(m) : undefined;
  return { t0, tEnd, count, m, scale, fineT, taps, plan };
}

/** Scratch of decimateTrackColumn, reused column after column: the fine grid, and the slopes. */
interface ColumnScratch {
  fine: Float64Array;
  slope: Float64Array;
}

function columnScratch(track: Pick<Track, 'time_s' | 'kind'>, grid: AntiAliasGrid): ColumnScratch {
  return {
    fine: new Float64Array(grid.fineT.length),
    slope: new Float64Array(track.kind === 'vehicle' ? 0 : track.time_s.length),
  };
}

/** One column through the interpolation and the low-pass. */
function decimateTrackColumn(
  track: Pick<Track, 'time_s' | 'kind'>,
  col: Float64Array,
  grid: AntiAliasGrid,
  scratch: ColumnScratch,
): DecimatedColumn {
  const t = track.time_s;
  if (track.kind === 'vehicle') linearColumnInto(t, col, grid.fineT, scratch.fine);
  else hermiteColumnInto(t, col, scratch.slope, grid.fineT, scratch.fine);
  return decimateColumn(scratch.fine, grid.m, grid.count, grid.taps, grid.plan);
}

/**
 * The columns `which` of a track (at least 3 rows) as resampleAntiAlias computes them, the same
 * values to the bit: lets a caller compute some columns elsewhere (another thread) and pass them
 * to resampleAntiAlias as `done`.
 */
export function resampleAntiAliasColumns(
  track: Pick<Track, 'time_s' | 'kind'>,
  columns: ReadonlyMap<number, Float64Array>,
  rate_hz: number,
): Map<number, DecimatedColumn> {
  const grid = antiAliasGrid(track, rate_hz);
  const scratch = columnScratch(track, grid);
  const out = new Map<number, DecimatedColumn>();
  for (const [c, col] of columns) out.set(c, decimateTrackColumn(track, col, grid, scratch));
  return out;
}

/** A uniform grid: instant k is min(t0 + k / rate_hz, tEnd), for k < length. */
interface FineGrid {
  t0: number;
  rate_hz: number;
  tEnd: number;
  length: number;
}

function linearColumnInto(t: Float64Array, col: Float64Array, at: FineGrid, out: Float64Array): void {
  const n = t.length;
  let j = 0;
  for (let k = 0; k < at.length; k++) {
    const tk = Math.min(at.t0 + k / at.rate_hz, at.tEnd);
    while (j < n - 2 && (t[j + 1] as number) <= tk) j++;
    const ta = t[j] as number;
    const w = (tk - ta) / ((t[j + 1] as number) - ta);
    out[k] = (col[j] as number) + ((col[j + 1] as number) - (col[j] as number)) * w;
  }
}

function hermiteColumnInto(
  t: Float64Array,
  col: Float64Array,
  slope: Float64Array,
  at: FineGrid,
  out: Float64Array,
): void {
  const n = t.length;
  derivativeInto(t, col, slope);
  let j = 0;
  for (let k = 0; k < at.length; k++) {
    const tk = Math.min(at.t0 + k / at.rate_hz, at.tEnd);
    while (j < n - 2 && (t[j + 1] as number) <= tk) j++;
    const ta = t[j] as number;
    const h = (t[j + 1] as number) - ta;
    const s = (tk - ta) / h;
    const s2 = s * s;
    const s3 = s2 * s;
    out[k] =
      (2 * s3 - 3 * s2 + 1) * (col[j] as number) +
      (s3 - 2 * s2 + s) * h * (slope[j] as number) +
      (-2 * s3 + 3 * s2) * (col[j + 1] as number) +
      (s3 - s2) * h * (slope[j + 1] as number);
  }
}

/** A stretch of a track with no samples: between two rows further apart than GAP_FACTOR x the median spacing. */
export interface TrackGap {
  start_s: number;
  end_s: number;
  /** File lines (1-based) of the rows either side, when the track came from a file. */
  lineBefore?: number;
  lineAfter?: number;
}

/** A spacing more than this many times the median spacing is a gap, named in the notes and on the charts. */
export const GAP_FACTOR = 5;
/** A gap longer than this (s) is bad input: interpolation across it would invent motion. */
export const GAP_MAX_S = 1;

/** Gaps of a track (spacing over GAP_FACTOR x its median spacing), in time order. */
export function findGaps(
  track: Pick<Track, 'time_s' | 'lines'>,
  spacing_s = medianSpacing(track.time_s),
): TrackGap[] {
  const t = track.time_s;
  const gaps: TrackGap[] = [];
  if (!(spacing_s > 0)) return gaps;
  const limit = GAP_FACTOR * spacing_s;
  for (let i = 0; i + 1 < t.length; i++) {
    const a = t[i] as number;
    const b = t[i + 1] as number;
    if (b - a > limit) {
      const g: TrackGap = { start_s: a, end_s: b };
      const la = track.lines?.[i];
      const lb = track.lines?.[i + 1];
      if (la !== undefined) g.lineBefore = la;
      if (lb !== undefined) g.lineAfter = lb;
      gaps.push(g);
    }
  }
  return gaps;
}
