// Resampling a track to a venue controller rate. Method: linear interpolation onto the uniform grid
// t_k = t_0 + k / rate_hz, k = 0 .. floor((t_end - t_0) * rate_hz), so the grid starts at the first
// sample and never runs past the last one. Linear interpolation adds no overshoot (a spline could push a
// leg past its stroke between samples), and its error is second order in the source spacing. Angle
// columns are interpolated componentwise: pose angles are small and change little per sample at
// controller rates, so this matches interpolating the rotation itself far below the tolerances used.

import type { Track } from './track-reader';

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
