// Min/max per bucket: a long track drawn as a chart keeps every peak (a plain stride would drop the
// spikes a reviewer most needs to see) with a fixed number of points.

/** Min and max of each bucket plus the time (s) where each bucket starts; same unit as the input. */
export interface MinMaxSeries {
  time_s: Float64Array;
  min: Float64Array;
  max: Float64Array;
}

/**
 * Splits signal[offset + i * stride], i < n, on a uniform grid (t0_s, rate_hz) into at most `buckets`
 * buckets of equal sample count and keeps each bucket's min and max. Short signals keep every sample.
 */
export function decimateMinMax(
  signal: Float64Array,
  offset: number,
  stride: number,
  n: number,
  t0_s: number,
  rate_hz: number,
  buckets: number,
): MinMaxSeries {
  const count = Math.max(0, Math.min(n, Math.floor(buckets)));
  const time_s = new Float64Array(count);
  const min = new Float64Array(count);
  const max = new Float64Array(count);
  for (let b = 0; b < count; b++) {
    // Integer bucket edges: every sample lands in exactly one bucket.
    const first = Math.floor((b * n) / count);
    const end = Math.floor(((b + 1) * n) / count);
    let lo = Infinity;
    let hi = -Infinity;
    for (let i = first; i < end; i++) {
      const v = signal[offset + i * stride] as number;
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
    time_s[b] = t0_s + first / rate_hz;
    min[b] = lo;
    max[b] = hi;
  }
  return { time_s, min, max };
}
